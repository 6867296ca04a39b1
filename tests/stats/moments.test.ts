import { describe, expect, it } from "vitest";
import { mean, variance, standardDeviation } from "../../lib/stats";
import { expectClose, runR, rVector } from "./rscript";

const INPUTS: readonly (readonly number[])[] = Object.freeze([
  [2, 4, 4, 4, 5, 5, 7, 9],
  [95.1772, 95.1567, 95.1937, 95.1959, 95.1442, 95.061, 95.1591, 95.1195, 95.1065, 95.0925, 95.199, 95.1682],
  [-3.5, 0, 12.25, 1e-4, -1e3, 77],
  Array.from({ length: 200 }, (_, i) => 1e6 + Math.sin(i) * 1e-2),
]);

describe("mean, variance, standardDeviation against R mean(), var(), sd()", () => {
  it("agree with R 4.2.2 to 1e-13 relative on four inputs", () => {
    const rows = runR(INPUTS.map((x) => `x <- ${rVector(x)}; out(c(mean(x), var(x), sd(x)))`).join("\n"));
    INPUTS.forEach((x, i) => expectClose([mean(x), variance(x), standardDeviation(x)], rows[i], 1e-13, `input ${i}`));
  });
});

describe("extreme magnitudes (Welford 1962 vs the textbook formula)", () => {
  it("1e9 + (4, 7, 13, 16): variance exactly 30, as for (4, 7, 13, 16) (exact arithmetic)", () => {
    const x = [4, 7, 13, 16].map((v) => 1e9 + v);
    expect(variance(x)).toBe(30);
    expect(mean(x)).toBe(1e9 + 10);
    // the one-pass Σx² − n·x̄² formula loses everything here
    const n = x.length;
    const naive = (x.reduce((a, v) => a + v * v, 0) - n * mean(x) ** 2) / (n - 1);
    expect(Math.abs(naive - 30)).toBeGreaterThan(1);
  });
  it("1e15 + small values: variance to 1e-9 relative of the exact 30 (values exactly representable)", () => {
    const x = [4, 7, 13, 16].map((v) => 1e15 + v);
    expect(Math.abs(variance(x) - 30) / 30).toBeLessThan(1e-9);
  });
  it("agrees with R var() on 1e9-offset data", () => {
    const x = Array.from({ length: 50 }, (_, i) => 1e9 + ((i * 37) % 11) + 0.25 * (i % 3));
    const [[r]] = runR(`out(var(${rVector(x)}))`);
    expect(Math.abs(variance(x) - r) / r).toBeLessThan(1e-12);
  });
});

describe("policy (lib/stats/index.ts)", () => {
  it("n = 1: mean is the value, variance and sd are NaN (R gives NA)", () => {
    expect(mean([3])).toBe(3);
    expect(variance([3])).toBeNaN();
    expect(standardDeviation([3])).toBeNaN();
  });
  it("empty and NaN throw RangeError", () => {
    for (const f of [mean, variance, standardDeviation]) {
      expect(() => f([])).toThrow(RangeError);
      expect(() => f([1, 2, NaN])).toThrow(/values\[2\]/);
    }
  });
});
