/**
 * Input policies of the exponential-smoothing methods: constant series, too-short series,
 * non-positive data for the multiplicative method, bad fixed values, bad horizons and levels,
 * bound notes. The rules are the project's own (stated in lib/forecast/ets.ts); where a value
 * comes from outside, its source is named.
 */
import { describe, expect, it } from "vitest";
import ses from "../../lib/forecast/methods/ses";
import holt from "../../lib/forecast/methods/holt";
import dampedHolt from "../../lib/forecast/methods/damped-holt";
import hwAdditive from "../../lib/forecast/methods/holt-winters-additive";
import hwMultiplicative from "../../lib/forecast/methods/holt-winters-multiplicative";
import { ForecastInputError, type Method } from "../../lib/forecast/types";
import { rEval, rSeries } from "../helpers/r";

const all: Method[] = [ses, holt, dampedHolt, hwAdditive, hwMultiplicative];

describe("constant series", () => {
  for (const method of all) {
    it(`${method.id}: fits exactly, forecasts the constant, zero-width intervals, no NaN`, () => {
      const y = Object.freeze(new Array(30).fill(42));
      const fit = method.fit({ y, season: 4 });
      const fc = method.forecast(fit, 9, [80, 95]);
      const numbers = [...fit.fitted, ...fit.residuals, ...Object.values(fit.parameters), fit.sse, fit.sigma2, ...fc.mean, ...fc.sd];
      expect(numbers.every(Number.isFinite)).toBe(true);
      expect(fit.sse).toBeLessThan(1e-12);
      for (const v of fc.mean) expect(v).toBeCloseTo(42, 8);
      for (const lv of ["80", "95"]) {
        fc.lower[lv].forEach((v, i) => expect(v).toBeCloseTo(fc.mean[i], 8));
        fc.upper[lv].forEach((v, i) => expect(v).toBeCloseTo(fc.mean[i], 8));
      }
    });
  }

  it("a constant series of zeros works for the additive methods", () => {
    const fit = hwAdditive.fit({ y: new Array(16).fill(0), season: 4 });
    expect(hwAdditive.forecast(fit, 4, [95]).mean.every((v) => Math.abs(v) < 1e-9)).toBe(true);
  });
});

describe("series too short", () => {
  it("seasonal methods need two full seasons, and say so", () => {
    const y = Array.from({ length: 20 }, (_, i) => 10 + (i % 12));
    expect(() => hwAdditive.fit({ y, season: 12 })).toThrow(ForecastInputError);
    expect(() => hwAdditive.fit({ y, season: 12 })).toThrow("season length 12 needs at least 24 observations");
    expect(() => hwMultiplicative.fit({ y, season: 12 })).toThrow("season length 12 needs at least 24 observations");
    expect(hwAdditive.minLength(12)).toBe(24);
    expect(hwAdditive.applicable(y, 12, false)).toBe(false);
  });

  it("with a short season the number of estimated parameters decides (m = 4: 3 smoothing + l0, b0 + 3 seasonal = 8, so 9)", () => {
    expect(hwAdditive.minLength(4)).toBe(9);
    const y = [1, 3, 5, 2, 2, 4, 6, 3];
    expect(() => hwAdditive.fit({ y, season: 4 })).toThrow(/at least 9 observations to estimate 8 parameters/);
    // With the parameters fixed, two seasons suffice.
    const fit = hwAdditive.fit({ y, season: 4, fixed: { alpha: 0.3, beta: 0.1, gamma: 0.2 } });
    expect(fit.fitted).toHaveLength(8);
  });

  it("non-seasonal minimum lengths: one more observation than estimated parameters", () => {
    expect(ses.minLength(1)).toBe(3);
    expect(holt.minLength(1)).toBe(5);
    expect(dampedHolt.minLength(1)).toBe(6);
    expect(() => holt.fit({ y: [1, 2, 3, 4], season: 1 })).toThrow(/at least 5 observations/);
    expect(ses.applicable([1, 2], 1, false)).toBe(false);
  });

  it("seasonal methods need a season length of at least 2", () => {
    const y = Array.from({ length: 30 }, (_, i) => 10 + i);
    expect(() => hwAdditive.fit({ y, season: 1 })).toThrow(/season length of at least 2/);
    expect(hwAdditive.applicable(y, 1, false)).toBe(false);
    expect(hwAdditive.minLength(1)).toBe(Number.POSITIVE_INFINITY);
  });
});

describe("multiplicative seasonality refuses zeros and negatives", () => {
  const base = Array.from({ length: 24 }, (_, i) => 100 + 10 * Math.sin((2 * Math.PI * i) / 4) + i);
  it("a zero", () => {
    const y = [...base];
    y[5] = 0;
    expect(() => hwMultiplicative.fit({ y, season: 4 })).toThrow(/every observation above zero \(observation 6 is 0\)/);
    expect(hwMultiplicative.applicable(y, 4, false)).toBe(false);
    expect(hwAdditive.applicable(y, 4, false)).toBe(true);
  });
  it("a negative value", () => {
    const y = [...base];
    y[10] = -3;
    expect(() => hwMultiplicative.fit({ y, season: 4 })).toThrow(/observation 11 is -3/);
    expect(hwMultiplicative.applicable(y, 4, false)).toBe(false);
  });
  it("accepts the same series when positive", () => {
    expect(hwMultiplicative.applicable(base, 4, false)).toBe(true);
    const fit = hwMultiplicative.fit({ y: base, season: 4 });
    // A fit, not only no error: a fitted value for each of the 24 observations, and the SSE is
    // Σ(y − ŷ)² over them (definition).
    expect(fit.fitted).toHaveLength(24);
    expect(fit.fitted.every(Number.isFinite)).toBe(true);
    expect(fit.sse).toBeCloseTo(base.reduce((a, v, i) => a + (v - fit.fitted[i]) ** 2, 0), 6);
  });
});

describe("input checks", () => {
  it("empty series and non-finite values name the problem", () => {
    expect(() => ses.fit({ y: [], season: 1 })).toThrow(/empty/);
    expect(() => ses.fit({ y: [1, 2, NaN, 4], season: 1 })).toThrow(/observation 3 is not a finite number/);
    expect(() => holt.fit({ y: [1, 2, Infinity, 4, 5, 6], season: 1 })).toThrow(/observation 3/);
  });

  it("fixed values: range, unknown names, all-or-none seasonal states", () => {
    const y = Array.from({ length: 30 }, (_, i) => 10 + i + (i % 4));
    expect(() => ses.fit({ y, season: 1, fixed: { alpha: 1.5 } })).toThrow(/alpha must be between 0 and 1/);
    expect(() => dampedHolt.fit({ y, season: 1, fixed: { phi: 0 } })).toThrow(/phi must be in \(0, 1\]/);
    expect(() => ses.fit({ y, season: 1, fixed: { beta: 0.1 } })).toThrow(/unknown fixed parameter "beta"/);
    expect(() => hwAdditive.fit({ y, season: 4, fixed: { s1: 1, s2: 2 } })).toThrow(/give all 4 initial seasonal states s1…s4 or none/);
  });

  it("fixed values are held exactly; the others are estimated", () => {
    const { y } = rSeries("Nile");
    const fit = dampedHolt.fit({ y, season: 1, fixed: { alpha: 0.2, phi: 0.9 } });
    expect(fit.parameters.alpha).toBe(0.2);
    expect(fit.parameters.phi).toBe(0.9);
    expect(fit.parameters.beta).toBeGreaterThan(0);
    expect(fit.parameters.beta).toBeLessThanOrEqual(0.2);
  });

  it("horizons and levels", () => {
    const fit = ses.fit({ y: [3, 4, 5, 4, 3, 4], season: 1 });
    expect(() => ses.forecast(fit, 0, [95])).toThrow(/at least 1/);
    expect(() => ses.forecast(fit, 2.5, [95])).toThrow(/whole number/);
    expect(() => ses.forecast(fit, 1e7, [95])).toThrow(/beyond the 10000 steps/);
    expect(() => ses.forecast(fit, 3, [100])).toThrow(/between 0 and 100/);
    expect(() => ses.forecast(fit, 3, [0])).toThrow(/between 0 and 100/);
  });
});

describe("bound notes", () => {
  it("Holt on WWWusage: alpha ends at its upper bound 0.9999, as R's ets (computed in the test) — and the fit says so", () => {
    const { y } = rSeries("WWWusage");
    const fit = holt.fit({ y, season: 1 });
    const r = rEval(`f <- ets(WWWusage, model = "AAN", damped = FALSE); out("alpha", f$par[["alpha"]])`);
    expect(r.alpha[0]).toBeGreaterThan(0.999); // R 4.x forecast::ets also stops at its upper bound
    expect(fit.parameters.alpha).toBeCloseTo(0.9999, 6);
    expect(fit.notes).toContain("alpha at its upper bound 0.9999");
  });
});
