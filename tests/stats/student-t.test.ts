import { describe, expect, it } from "vitest";
import { studentTCdf, studentTQuantile } from "../../lib/stats";
import { expectClose, runR, rVector } from "./rscript";

const DF = Object.freeze([1, 2, 2.5, 3, 4, 5, 7.3, 10, 20, 30, 34, 60, 100, 1000, 1e5]);
const P = Object.freeze([1e-12, 1e-8, 1e-5, 0.001, 0.005, 0.01, 0.025, 0.05, 0.1, 0.2, 0.3, 0.45, 0.5, 0.55, 0.7, 0.8, 0.9, 0.95, 0.975, 0.99, 0.995, 0.999, 1 - 1e-6]);
const T = Object.freeze([-1e6, -300, -40, -10, -4, -2.5, -1, -0.3, -1e-8, 0, 1e-8, 0.3, 1, 2, 3.5, 6, 12, 50, 1e4]);

describe("studentTQuantile against R qt() (R 4.2.2; Hill 1970 with corrections)", () => {
  it("15 degrees of freedom × 23 probabilities agree to 1e-12 relative", () => {
    const rows = runR(DF.map((df) => `out(qt(${rVector(P)}, ${df}))`).join("\n"));
    DF.forEach((df, i) => expectClose(P.map((p) => studentTQuantile(p, df)), rows[i], 1e-12, `qt df=${df}`));
  });
  it("table value t(0.975, 10) = 2.228139 (printed to 6 dp in standard t tables; R qt gives 2.2281388519862739)", () => {
    expect(studentTQuantile(0.975, 10)).toBeCloseTo(2.2281388519862739, 13);
  });
  it("df = Infinity is the normal quantile; p = 0, 1 give ∓Infinity", () => {
    const [r] = runR(`out(qnorm(c(0.1, 0.975)))`);
    expectClose([studentTQuantile(0.1, Infinity), studentTQuantile(0.975, Infinity)], r, 1e-15, "normal limit");
    expect(studentTQuantile(0, 5)).toBe(-Infinity);
    expect(studentTQuantile(1, 5)).toBe(Infinity);
  });
  it("bad arguments throw RangeError (policy in lib/stats/index.ts)", () => {
    expect(() => studentTQuantile(NaN, 3)).toThrow(RangeError);
    expect(() => studentTQuantile(1.2, 3)).toThrow(RangeError);
    expect(() => studentTQuantile(0.5, 0)).toThrow(RangeError);
    expect(() => studentTQuantile(0.5, -1)).toThrow(RangeError);
    expect(() => studentTQuantile(0.5, NaN)).toThrow(RangeError);
  });
});

describe("studentTCdf against R pt()", () => {
  it("15 degrees of freedom × 19 points agree to 1e-12 relative (5e-11 at df = 1e5)", () => {
    // At df = 1e5 the continued fraction runs with a = 5e4 and accumulates ~1e-12 of rounding;
    // R uses TOMS 708 there. Both are far below what any interval needs.
    const rows = runR(DF.map((df) => `out(pt(${rVector(T)}, ${df}))`).join("\n"));
    DF.forEach((df, i) =>
      expectClose(T.map((t) => studentTCdf(t, df)), rows[i], df > 1000 ? 5e-11 : 1e-12, `pt df=${df}`),
    );
  });
  it("NaN t throws RangeError", () => {
    expect(() => studentTCdf(NaN, 3)).toThrow(RangeError);
  });
});
