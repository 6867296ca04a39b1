import { describe, expect, it } from "vitest";
import { normalCdf, normalSurvival, normalQuantile, normalDensity } from "../../lib/stats";
import { expectClose, runR, rVector } from "./rscript";

// Probabilities spanning the three ranges of AS 241 (|q| ≤ 0.425, r ≤ 5, r > 5).
const P = Object.freeze([
  1e-300, 1e-100, 1e-30, 1e-16, 1e-10, 1e-6, 1e-4, 0.001, 0.01, 0.025, 0.05, 0.074, 0.075, 0.1, 0.2, 0.25, 0.3, 0.4,
  0.45, 0.49, 0.4999999, 0.5, 0.5000001, 0.51, 0.6, 0.7, 0.75, 0.8, 0.9, 0.925, 0.95, 0.975, 0.99, 0.999, 0.9999,
  1 - 1e-6, 1 - 1e-10, 1 - 1e-15,
]);
// x values spanning Cody's three ranges (|x| ≤ 0.674, ≤ √32, beyond) and both tails.
const X = Object.freeze([
  -37, -30, -20, -10, -8, -6, -5.7, -5.65, -4, -3, -2.5, -1.96, -1.2, -0.68, -0.67, -0.5, -0.1, -1e-10, 0, 1e-10,
  0.1, 0.5, 0.67, 0.68, 1, 1.2815515655446004, 1.6448536269514722, 1.959963984540054, 2.5, 3, 4, 5.65, 5.7, 6, 8,
  8.3, 10, 20,
]);

describe("normalQuantile (Wichura 1988, AS 241) against R qnorm()", () => {
  it("agrees with R 4.2.2 qnorm at 38 probabilities to 4e-16 relative (same algorithm in R)", () => {
    const [r] = runR(`out(qnorm(${rVector(P)}))`);
    expectClose(P.map(normalQuantile), r, 4e-16, "qnorm");
  });
  it("textbook values: z(0.975) = 1.959963984540054, z(0.9) = 1.2815515655446004", () => {
    // Values as R prints qnorm(0.975), qnorm(0.9) to 17 significant digits (R 4.2.2)
    expect(normalQuantile(0.975)).toBeCloseTo(1.959963984540054, 15);
    expect(normalQuantile(0.9)).toBeCloseTo(1.2815515655446004, 15);
  });
  it("p = 0 and p = 1 give ∓Infinity (as R); symmetry q(p) = −q(1 − p) up to the rounding of 1 − p", () => {
    expect(normalQuantile(0)).toBe(-Infinity);
    expect(normalQuantile(1)).toBe(Infinity);
    expect(normalQuantile(0.5)).toBe(0);
    for (const p of [0.01, 0.2, 0.3]) expect(Math.abs(normalQuantile(p) + normalQuantile(1 - p))).toBeLessThan(1e-14);
  });
  it("NaN or p outside [0, 1] throws RangeError (policy in lib/stats/index.ts)", () => {
    expect(() => normalQuantile(NaN)).toThrow(RangeError);
    expect(() => normalQuantile(-1e-9)).toThrow(RangeError);
    expect(() => normalQuantile(1.5)).toThrow(RangeError);
  });
});

describe("normalCdf / normalSurvival (Cody 1969) against R pnorm()", () => {
  it("lower and upper tails agree with R 4.2.2 pnorm at 38 points to 1e-15 relative", () => {
    const [lo, up] = runR(`x <- ${rVector(X)}\nout(pnorm(x))\nout(pnorm(x, lower.tail = FALSE))`);
    expectClose(X.map(normalCdf), lo, 1e-15, "pnorm");
    expectClose(X.map(normalSurvival), up, 1e-15, "pnorm upper");
  });
  it("density agrees with R dnorm", () => {
    const [d] = runR(`out(dnorm(${rVector(X)}))`);
    expectClose(X.map(normalDensity), d, 1e-13, "dnorm");
  });
  it("round trip: normalCdf(normalQuantile(p)) ≈ p", () => {
    for (const p of [1e-12, 0.001, 0.1, 0.5, 0.8, 0.975]) expect(Math.abs(normalCdf(normalQuantile(p)) - p) / p).toBeLessThan(1e-14);
  });
  it("±Infinity give 0 and 1; NaN throws RangeError", () => {
    expect(normalCdf(-Infinity)).toBe(0);
    expect(normalCdf(Infinity)).toBe(1);
    expect(normalSurvival(Infinity)).toBe(0);
    expect(() => normalCdf(NaN)).toThrow(RangeError);
    expect(() => normalSurvival(NaN)).toThrow(RangeError);
  });
});
