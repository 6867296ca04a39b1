/**
 * Worked examples of the NIST/SEMATECH e-Handbook of Statistical Methods, §6.4.3
 * (https://www.itl.nist.gov/div898/handbook/pmc/section4/), as compiled in the project's
 * docs/methods.md §2, and the damped-trend check values of docs/methods.md §2d.
 *
 * Mapping the handbook's initialisation onto our error-correction recursions:
 * - Single smoothing (§6.4.3.1): the handbook has no S1, sets S2 = y1 and S_t is the one-step
 *   forecast of y_t. With l0 = y1 our first fitted value is y1 (error 0, adds nothing to the
 *   SSE), and our fitted value for y_t (t ≥ 2) is S_t; our next forecast is S13.
 * - Double smoothing (§6.4.3.4): S1 = y1, b1 = 0.8 are states at t = 1. Choosing l0 = 5.6,
 *   b0 = 0.8 makes our first one-step forecast l0 + b0 = y1, so the first error is 0 and our
 *   states after y1 are exactly (S1, b1); then F_t = S_{t−1} + b_{t−1} is our fitted value for
 *   t ≥ 2. The handbook's trend constant γ is the component-form β*, so our β = α·γ = α.
 */
import { describe, expect, it } from "vitest";
import ses from "../../lib/forecast/methods/ses";
import holt from "../../lib/forecast/methods/holt";
import dampedHolt from "../../lib/forecast/methods/damped-holt";
import { maxRelDiff, rEval } from "../helpers/r";

// NIST e-Handbook §6.4.3.1 data (docs/methods.md §2a; reference-data/nist_handbook_6431_ses12.csv).
const SES12 = Object.freeze([71, 70, 69, 68, 64, 65, 72, 78, 75, 75, 75, 70]);
// NIST e-Handbook §6.4.3.2/§6.4.3.4 data (docs/methods.md §2a/2b; reference-data/nist_handbook_643x_trend10.csv).
const TREND10 = Object.freeze([6.4, 5.6, 7.8, 8.8, 11.0, 11.6, 16.7, 15.3, 21.6, 22.4]);

describe("NIST e-Handbook §6.4.3.1: single exponential smoothing, α = 0.1", () => {
  const fit = ses.fit({ y: SES12, season: 1, fixed: { alpha: 0.1, l0: SES12[0] } });

  it("smoothed values S2..S12 as printed (2 dp) and exactly", () => {
    // NIST e-Handbook §6.4.3.1 table, printed to 2 dp (docs/methods.md §2a [SOURCE via test]).
    const printed = [71, 70.9, 70.71, 70.44, 69.8, 69.32, 69.58, 70.43, 70.88, 71.29, 71.67];
    fit.fitted.slice(1).forEach((v, i) => expect(Math.abs(v - printed[i])).toBeLessThanOrEqual(0.005 + 1e-12));
    // Exact values of the same recursion (docs/methods.md §2a [RECOMPUTED]).
    const exact = [71, 70.9, 70.71, 70.439, 69.7951, 69.31559, 69.584031, 70.4256279, 70.88306511, 71.294758599, 71.6652827391];
    expect(maxRelDiff(fit.fitted.slice(1), exact)).toBeLessThan(1e-12);
    expect(fit.fitted[0]).toBe(71); // l0 = y1: the handbook scores no error at t = 1
  });

  it("SSE, MSE (11 scored errors) and the next forecast", () => {
    // SSE 208.818409705647 (docs/methods.md §2a; R HoltWinters(alpha = 0.1)$SSE gives the same).
    expect(fit.sse).toBeCloseTo(208.818409705647, 9);
    // MSE printed 19.0 by the handbook (docs/methods.md §2a [SOURCE via course page]).
    expect(Math.abs(fit.sse / 11 - 19.0)).toBeLessThanOrEqual(0.05);
    // S13 = 71.49875446519, printed 71.50 (docs/methods.md §2a).
    const fc = ses.forecast(fit, 3, [95]);
    expect(fc.mean[0]).toBeCloseTo(71.49875446519, 10);
    expect(fc.mean).toEqual([fc.mean[0], fc.mean[0], fc.mean[0]]); // SES forecasts are flat
  });
});

describe("NIST e-Handbook §6.4.3.4: double exponential smoothing, α = 0.3623, γ = 1", () => {
  const alpha = 0.3623;
  const fit = holt.fit({ y: TREND10, season: 1, fixed: { alpha, beta: alpha * 1.0, l0: 6.4 - 0.8, b0: 0.8 } });

  it("one-step forecasts F2..F10 as printed (1 dp) and to 5 decimals", () => {
    // Printed by the handbook to 1 dp (docs/methods.md §2b [SOURCE via test]).
    const printed = [7.2, 6.8, 7.8, 9.1, 11.4, 13.2, 17.4, 18.9, 23.1];
    fit.fitted.slice(1).forEach((v, i) => expect(Math.abs(v - printed[i])).toBeLessThanOrEqual(0.05 + 1e-12));
    // Recomputed to 5 decimals (docs/methods.md §2b [RECOMPUTED]).
    const five = [7.2, 6.84064, 7.75611, 9.08041, 11.41744, 13.19129, 17.44141, 18.86865, 23.05087];
    fit.fitted.slice(1).forEach((v, i) => expect(Math.abs(v - five[i])).toBeLessThanOrEqual(5e-6));
    expect(fit.fitted[0]).toBeCloseTo(6.4, 12);
  });

  it("final smoothed level S10 and trend b10, MSE over 9 errors and forecasts from t = 10", () => {
    // S10 = 22.81506, b10 = 2.95684 (docs/methods.md §2b [SOURCE via test] [RECOMPUTED]).
    expect(Math.abs((fit.state.level as number) - 22.81506)).toBeLessThanOrEqual(5e-6);
    expect(Math.abs((fit.state.trend as number) - 2.95684)).toBeLessThanOrEqual(5e-6);
    // MSE 3.674309454 over 9 errors (docs/methods.md §2b [COMPUTED-ONLY]).
    expect(fit.sse / 9).toBeCloseTo(3.674309454, 8);
    // Forecasts 25.77190, 28.72873, 31.68557 (docs/methods.md §2b [COMPUTED-ONLY]).
    const fc = holt.forecast(fit, 3, [95]);
    [25.7719, 28.72873, 31.68557].forEach((v, i) => expect(Math.abs(fc.mean[i] - v)).toBeLessThanOrEqual(5e-6));
  });
});

describe("NIST e-Handbook §6.4.3.4: single smoothing on the trend series, α estimated", () => {
  it("the optimiser finds the MSE-minimising α = 0.9772756 (the handbook prints α = 0.977)", () => {
    // With l0 = y1 only α is free; docs/methods.md §2b [RECOMPUTED]: α = 0.9772756, MSE 8.8768134,
    // next forecast 22.378582 (printed 22.4).
    const fit = ses.fit({ y: TREND10, season: 1, fixed: { l0: TREND10[0] } });
    expect(Math.abs(fit.parameters.alpha - 0.9772756)).toBeLessThan(5e-7);
    expect(Math.abs(fit.sse / 9 - 8.8768134)).toBeLessThan(5e-8);
    expect(Math.abs(ses.forecast(fit, 1, [95]).mean[0] - 22.378582)).toBeLessThan(5e-7);
  });
});

describe("Holt and damped trend on the 10-point series (docs/methods.md §2d)", () => {
  // ℓ0 = y1 = 6.4, b0 = y2 − y1 = −0.8, α = 0.5, β* = 0.3 (so β = 0.15).
  it("φ = 1 equals forecast::holt(initial = 'simple') (computed in the test) and the listed values", () => {
    const fit = holt.fit({ y: TREND10, season: 1, fixed: { alpha: 0.5, beta: 0.15, l0: 6.4, b0: -0.8 } });
    const fc = holt.forecast(fit, 3, [95]);
    const r = rEval(`f <- holt(${"c(6.4, 5.6, 7.8, 8.8, 11.0, 11.6, 16.7, 15.3, 21.6, 22.4)"}, alpha = 0.5, beta = 0.3, initial = "simple", h = 3)
      out("fitted", fitted(f)); out("mean", f$mean)`);
    expect(maxRelDiff(fit.fitted, r.fitted)).toBeLessThan(1e-10); // R 4.x forecast::holt, computed in the test
    expect(maxRelDiff(fc.mean, r.mean)).toBeLessThan(1e-10);
    // docs/methods.md §2d [COMPUTED-ONLY, 2 implementations].
    const listed = [5.6, 5.32, 4.822, 6.1197, 7.670595, 10.04545325, 11.7660643875, 15.9164602981, 17.1991892087, 21.6506752827];
    expect(maxRelDiff(fit.fitted, listed)).toBeLessThan(1e-10);
    expect(fit.state.level as number).toBeCloseTo(22.0253376414, 9);
    expect(fit.state.trend as number).toBeCloseTo(2.3634793859, 9);
    expect(maxRelDiff(fc.mean, [24.3888170273, 26.7522964132, 29.1157757992])).toBeLessThan(1e-10);
  });

  it("φ = 0.9 equals R's etscalc (forecast:::pegelsresid.C, computed in the test) and the listed values", () => {
    const fit = dampedHolt.fit({ y: TREND10, season: 1, fixed: { alpha: 0.5, beta: 0.15, phi: 0.9, l0: 6.4, b0: -0.8 } });
    const fc = dampedHolt.forecast(fit, 3, [95]);
    const r = rEval(`y <- c(6.4, 5.6, 7.8, 8.8, 11.0, 11.6, 16.7, 15.3, 21.6, 22.4)
      p <- forecast:::pegelsresid.C(y, 1, c(6.4, -0.8), "A", "A", "N", TRUE, 0.5, 0.15, 0, 0.9, 2)
      out("fitted", y - p$e); out("last", p$states[11, ])`);
    expect(maxRelDiff(fit.fitted, r.fitted)).toBeLessThan(1e-10);
    expect(fit.state.level as number).toBeCloseTo(r.last[0], 10);
    expect(fit.state.trend as number).toBeCloseTo(r.last[1], 10);
    // docs/methods.md §2d [COMPUTED-ONLY]: final ℓ = 21.6520581826, b = 1.9944805179, forecasts below.
    expect(fit.state.level as number).toBeCloseTo(21.6520581826, 9);
    expect(fit.state.trend as number).toBeCloseTo(1.9944805179, 9);
    expect(maxRelDiff(fc.mean, [23.4470906488, 25.0626198683, 26.5165961659])).toBeLessThan(1e-10);
  });
});
