/**
 * The bounded Nelder–Mead minimiser and the one-variable Brent search.
 * Expected optima are analytic (stated beside each) or computed by R 4.x stats::optimize.
 */
import { describe, expect, it } from "vitest";
import { minimise, minimiseScalar } from "../../lib/forecast/optimise";
import { rEval } from "../helpers/r";

describe("minimise (bounded Nelder–Mead)", () => {
  it("finds the minimum of Rosenbrock's function from the standard start (−1.2, 1)", () => {
    // Rosenbrock (1960), start point from Moré, Garbow & Hillstrom (1981): minimum 0 at (1, 1), analytic.
    const r = minimise((x) => 100 * (x[1] - x[0] * x[0]) ** 2 + (1 - x[0]) ** 2, [-1.2, 1], { tol: 1e-14, maxIter: 20000 });
    expect(Math.abs(r.x[0] - 1)).toBeLessThan(1e-4);
    expect(Math.abs(r.x[1] - 1)).toBeLessThan(1e-4);
    expect(r.value).toBeLessThan(1e-8);
  });

  it("stops on the box when the unconstrained minimum lies outside it", () => {
    // min (x − 2)² + (y + 1)² over [0, 1]² is at the corner (1, 0), analytic.
    const r = minimise((x) => (x[0] - 2) ** 2 + (x[1] + 1) ** 2, [0.5, 0.5], { lower: [0, 0], upper: [1, 1] });
    expect(r.x[0]).toBeCloseTo(1, 6);
    expect(r.x[1]).toBeCloseTo(0, 6);
    expect(r.x[0]).toBeLessThanOrEqual(1);
    expect(r.x[1]).toBeGreaterThanOrEqual(0);
  });

  it("respects a constraint expressed by returning Infinity", () => {
    // min (x − 1)² + (y − 1)² subject to x + y ≤ 1 is at (½, ½), analytic.
    const r = minimise((x) => (x[0] + x[1] > 1 ? Infinity : (x[0] - 1) ** 2 + (x[1] - 1) ** 2), [0, 0], { tol: 1e-14, maxIter: 20000 });
    expect(r.x[0] + r.x[1]).toBeLessThanOrEqual(1);
    expect(Math.abs(r.x[0] - 0.5)).toBeLessThan(1e-3);
    expect(Math.abs(r.x[1] - 0.5)).toBeLessThan(1e-3);
  });

  it("treats NaN as +Infinity and refuses bad input", () => {
    const r = minimise((x) => (x[0] < 0 ? NaN : (x[0] - 3) ** 2), [1]);
    expect(r.x[0]).toBeCloseTo(3, 4);
    expect(() => minimise((x) => x[0], [0], { lower: [1], upper: [0] })).toThrow(/lower bound must be below the upper bound/);
    expect(() => minimise((x) => x[0], [NaN])).toThrow(/not a finite number/);
    expect(() => minimise((x) => x[0], [0, 0], { lower: [0], upper: [1] })).toThrow(/bounds must have 2 entries/);
  });
});

describe("minimiseScalar (grid + Brent)", () => {
  it("agrees with R's optimize on a smooth function", () => {
    // f(x) = eˣ − 2x on [0, 3]: minimum at ln 2 (analytic); R 4.x stats::optimize computed in the test.
    const r = minimiseScalar((x) => Math.exp(x) - 2 * x, 0, 3, { tol: 1e-12 });
    const ref = rEval(`o <- optimize(function(x) exp(x) - 2 * x, c(0, 3), tol = 1e-12); out("x", o$minimum)`, { withForecast: false });
    expect(Math.abs(r.x - Math.LN2)).toBeLessThan(1e-8);
    expect(Math.abs(r.x - ref.x[0])).toBeLessThan(1e-8);
  });

  it("finds the global minimum of a two-well function where a local search from one end would not", () => {
    // f(x) = (x² − 1)² + 0.3x on [−2, 2]: two wells; the global one is near x = −1.036 (derivative
    // 4x³ − 4x + 0.3 = 0, root computed by R 4.x uniroot in the test).
    const f = (x: number) => (x * x - 1) ** 2 + 0.3 * x;
    const ref = rEval(`out("x", uniroot(function(x) 4 * x^3 - 4 * x + 0.3, c(-2, -0.5), tol = 1e-14)$root)`, { withForecast: false });
    const r = minimiseScalar(f, -2, 2);
    expect(Math.abs(r.x - ref.x[0])).toBeLessThan(1e-7);
  });

  it("returns the bound when the minimum is on it, and refuses reversed bounds", () => {
    expect(minimiseScalar((x) => x, 0.25, 0.75).x).toBeCloseTo(0.25, 8);
    expect(() => minimiseScalar((x) => x, 1, 0)).toThrow(/lower bound must be below the upper bound/);
  });
});
