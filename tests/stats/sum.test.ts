import { describe, expect, it } from "vitest";
import { sum } from "../../lib/stats";
import { runR, rVector } from "./rscript";

/**
 * Independent oracle: the exact sum of doubles in BigInt arithmetic, rounded once to the
 * nearest double (BigInt → Number conversion rounds to nearest, ties to even, ECMA-262
 * §21.1.1.1). Each double is an integer multiple of 2^e for e = its exponent − 52.
 */
function exactSum(values: readonly number[]): number {
  const parts = values.map((v) => {
    if (v === 0) return { m: 0n, e: 0 };
    const buf = new DataView(new ArrayBuffer(8));
    buf.setFloat64(0, v);
    const bits = buf.getBigUint64(0);
    const sign = bits >> 63n ? -1n : 1n;
    const expBits = Number((bits >> 52n) & 0x7ffn);
    const frac = bits & ((1n << 52n) - 1n);
    const m = expBits === 0 ? frac : frac | (1n << 52n);
    const e = (expBits === 0 ? 1 : expBits) - 1075;
    return { m: sign * m, e };
  });
  const eMin = Math.min(...parts.filter((p) => p.m !== 0n).map((p) => p.e));
  let total = 0n;
  for (const p of parts) total += p.m << BigInt(p.e - eMin);
  return Number(total) * 2 ** eMin;
}

describe("sum (Neumaier compensated summation)", () => {
  it("1e100 + 1 − 1e100 = 1, where naive summation gives 0 (exact arithmetic)", () => {
    expect(sum([1e100, 1, -1e100])).toBe(1);
    expect([1e100, 1, -1e100].reduce((a, b) => a + b, 0)).toBe(0); // the failure it avoids
  });
  it("ten times 0.1 is 1 (the exact sum of the ten doubles rounds to 1)", () => {
    const x = Array(10).fill(0.1);
    expect(sum(x)).toBe(exactSum(x));
    expect(sum(x)).toBe(1);
  });
  it("equals the correctly rounded exact sum on ill-conditioned inputs (BigInt oracle)", () => {
    const inputs: number[][] = [
      [1e16, 1, 1, -1e16, 3.5],
      [1, 1e-16, 1e-16, 1e-16, 1e-16, -1],
      [1e9 + 0.1, 1e9 + 0.2, -2e9, 0.3, 1e-7],
      Array.from({ length: 1000 }, (_, i) => (i % 2 ? -1 : 1) * (1e12 + i * 0.001) + 1e-3),
    ];
    for (const x of inputs) expect(sum(x)).toBe(exactSum(x));
  });
  it("agrees with R sum() (long-double accumulator) on a 1000-value sample to 1e-15 relative", () => {
    const x = Array.from({ length: 1000 }, (_, i) => Math.cos(i * 1.618) * 10 ** ((i % 7) - 3));
    const [[r]] = runR(`out(sum(${rVector(x)}))`);
    expect(Math.abs(sum(x) - r) / Math.abs(r)).toBeLessThan(1e-15);
  });
  it("empty input and NaN / Infinity throw RangeError (policy in lib/stats/index.ts)", () => {
    expect(() => sum([])).toThrow(RangeError);
    expect(() => sum([1, NaN])).toThrow(/values\[1\]/);
    expect(() => sum([-Infinity])).toThrow(RangeError);
  });
});
