/**
 * The Akaike-weighted ETS method (lib/forecast/methods/ets-weighted.ts; Kolassa 2011, weights of
 * Burnham & Anderson 2002) against R's forecast::ets, run in the test: every member of our family
 * (A errors: trend N/A/Ad, season N/A; M errors when y > 0: trend N/A/Ad, season N/M) fitted by
 * `ets(y, model = …, damped = …)`, R's AICc, the weights exp(−Δ/2)/Σ computed in R and R's
 * forecasts weighted by them.
 *
 * 1. With R's estimates (parameters and initial states of each member given as `fixed`, no
 *    weights): our AICc of every member, hence the weights, and the weighted mean equal R's to
 *    1e-8 (the same arithmetic in another order), and the in-sample forecasts from an origin t
 *    equal R's forecasts of `ets(y[1:t], model = fit, use.initial.values = TRUE)` weighted the same.
 *    R's forecasts: forecast(f, h)$mean, except for members with an M season, whose forecast()
 *    mean without simulation is R's class-3 expected value, not the point forecast that our
 *    members (and R's simulated forecasts) take as the mean: for them, the point forecasts of
 *    Hyndman et al. 2008 table 2.1 computed in R from R's final states (as
 *    tests/forecast/ets-multiplicative.test.ts does).
 * 2. Estimated by us: our optimiser is not R's, so a member's AICc may differ (ours is lower where
 *    R's Nelder–Mead stops early, tests/forecast/ets-multiplicative.test.ts), and Akaike weights
 *    magnify AICc differences (a difference of 2 changes a weight by a factor e). Where every
 *    member's AICc agrees with R's to 0.2 (LakeHuron) the weights agree to 0.005; elsewhere our
 *    AICc is at most R's + 1 for every member (a log-likelihood no lower than R's − 0.5) and the
 *    weighted mean is within 1% of R's (the combination test's tolerance, for the same reason).
 */
import { describe, expect, it } from "vitest";
import etsWeighted, { weightedMembers } from "../../lib/forecast/methods/ets-weighted";
import ets from "../../lib/forecast/methods/ets";
import { akaikeWeights } from "../../lib/stats/akaike";
import { frozenParameters } from "../../lib/forecast/select";
import { forecastTotal } from "../../lib/forecast/total";
import { maxRelDiff, preloadSeries, rEvalBatch, rSeries } from "../helpers/r";
import { R_MEMBERS, memberNames } from "../helpers/ets-members";

const TOL = 1e-8;

/** `fixed` holding R's estimates of every member (R orders seasonal states newest first; ours in time order). */
function fixedFromR(r: Record<string, number[]>, names: readonly string[]): Record<string, number> {
  const fixed: Record<string, number> = {};
  for (const name of names) {
    const [alpha, beta, gamma, phi] = r[`par.${name}`];
    const trend = name.slice(1, -1);
    const seasonal = !name.endsWith("N");
    const st = r[`states.${name}`];
    fixed[`${name}.alpha`] = alpha;
    fixed[`${name}.l0`] = st[0];
    if (trend !== "N") {
      fixed[`${name}.beta`] = beta;
      fixed[`${name}.b0`] = st[1];
    }
    if (trend === "Ad") fixed[`${name}.phi`] = phi;
    if (seasonal) {
      fixed[`${name}.gamma`] = gamma;
      st.slice(trend !== "N" ? 2 : 1).reverse().forEach((v, i) => (fixed[`${name}.s${i + 1}`] = v));
    }
  }
  return fixed;
}

const CASES = [
  { series: "Nile", origins: [40, 99] },
  { series: "USAccDeaths", origins: [36, 71] },
  { series: "UKgas", origins: [60] },
  { series: "LakeHuron", origins: [] },
  { series: "WWWusage", origins: [] },
  { series: "AirPassengers", origins: [] },
];
preloadSeries(CASES.map((c) => c.series));
const R = rEvalBatch(
  Object.fromEntries(
    CASES.map((c) => [c.series, `${R_MEMBERS}y <- ${c.series}; members(y, if (frequency(y) > 1) 2 * frequency(y) else 10, c(${c.origins.join(", ")}))`]),
  ),
);

describe("akaikeWeights", () => {
  it("equals the weights computed in R from R's AICc of every member (USAccDeaths, 12 members)", () => {
    const r = R.USAccDeaths;
    const names = memberNames(12, true);
    // Expected: w <- exp(-(aicc - min(aicc)) / 2); w / sum(w) in R 4.x on forecast::ets's f$aicc.
    expect(maxRelDiff(akaikeWeights(names.map((k) => r[`aicc.${k}`][0])), r.w, 1e-300)).toBeLessThan(1e-12);
  });

  it("policy: empty or non-finite criteria are refused; equal criteria share equally", () => {
    expect(() => akaikeWeights([])).toThrow(RangeError);
    expect(() => akaikeWeights([1, Infinity])).toThrow(RangeError);
    expect(akaikeWeights([5, 5, 5, 5])).toEqual([0.25, 0.25, 0.25, 0.25]);
  });
});

describe("ets-weighted with R's estimates of every member", () => {
  for (const c of CASES.filter((x) => x.origins.length > 0)) {
    it(`${c.series}: AICc, weights, weighted mean and origin forecasts equal R's`, () => {
      const { y, m } = rSeries(c.series);
      const r = R[c.series];
      const names = memberNames(m, y.every((v) => v > 0));
      const h = r.h[0];
      const fit = etsWeighted.fit({ y, season: m, fixed: fixedFromR(r, names) });
      // Our AICc of each member at R's values is R's f$aicc.
      for (const k of names) expect(Math.abs((fit.state[`${k}.aicc`] as number) - r[`aicc.${k}`][0]) / r[`aicc.${k}`][0]).toBeLessThan(TOL);
      // Weights: R's exp(−Δ/2)/Σ (absolute: tiny weights have no relative precision to speak of).
      names.forEach((k, i) => expect(Math.abs(fit.parameters[`${k}.weight`] - r.w[i])).toBeLessThan(TOL));
      const fc = etsWeighted.forecast(fit, h, [80, 95]);
      // R: colSums(w * forecast(f_i, h)$mean).
      expect(maxRelDiff(fc.mean as number[], r.mean)).toBeLessThan(TOL);
      // R: Σ w_i forecast(ets(y[1:t], model = f_i, use.initial.values = TRUE), h)$mean.
      const rows = etsWeighted.originForecasts!(fit, y, h);
      for (const t of c.origins) expect(maxRelDiff(rows[t], r[`origin.${t}`])).toBeLessThan(TOL);
    });
  }
});

describe("ets-weighted estimated by us", () => {
  it("LakeHuron (every member's AICc within 0.2 of R's): weights within 0.005 of R's, mean within 1e-4", () => {
    const { y, m } = rSeries("LakeHuron");
    const r = R.LakeHuron;
    const names = memberNames(m, true);
    const fit = etsWeighted.fit({ y, season: m });
    names.forEach((k, i) => {
      expect(Math.abs((fit.state[`${k}.aicc`] as number) - r[`aicc.${k}`][0])).toBeLessThan(0.2);
      expect(Math.abs(fit.parameters[`${k}.weight`] - r.w[i])).toBeLessThan(0.005);
    });
    expect(maxRelDiff(etsWeighted.forecast(fit, 10, []).mean as number[], r.mean)).toBeLessThan(1e-4);
  });

  // AirPassengers: every member's AICc at most R's + 1 (R's ets(model = "MNM") stops about 63
  // above ours), so the weights and the mean differ from R's by more than 1% there: AICc only.
  for (const series of ["Nile", "USAccDeaths", "UKgas", "WWWusage", "AirPassengers"]) {
    const meanToo = series !== "AirPassengers";
    it(`${series}: every member's AICc at most R's + 1${meanToo ? ", weighted mean within 1% of R's" : ""}`, () => {
      const { y, m } = rSeries(series);
      const r = R[series];
      const names = memberNames(m, y.every((v) => v > 0));
      const fit = etsWeighted.fit({ y, season: m });
      expect(Object.keys(fit.parameters).filter((k) => k.endsWith(".weight"))).toEqual(names.map((k) => `${k}.weight`));
      for (const k of names) expect(fit.state[`${k}.aicc`] as number).toBeLessThanOrEqual(r[`aicc.${k}`][0] + 1);
      if (meanToo) expect(maxRelDiff(etsWeighted.forecast(fit, r.h[0], []).mean as number[], r.mean)).toBeLessThan(0.01);
    });
  }
});

describe("ets-weighted: its fit given back, its intervals and its policy", () => {
  const { y, m } = rSeries("UKgas");

  it("reproduces itself from its parameters (as `fixed`, with or without the weights), also through frozenParameters", () => {
    const fit = etsWeighted.fit({ y, season: m });
    expect(frozenParameters(fit)).toEqual(fit.parameters);
    const again = etsWeighted.fit({ y, season: m, fixed: fit.parameters });
    expect(again.parameters).toEqual(fit.parameters);
    expect(etsWeighted.forecast(again, 8, [80, 95])).toEqual(etsWeighted.forecast(fit, 8, [80, 95]));
    const unweighted = Object.fromEntries(Object.entries(fit.parameters).filter(([k]) => !k.endsWith(".weight")));
    const recomputed = etsWeighted.fit({ y, season: m, fixed: unweighted });
    for (const [k, v] of Object.entries(fit.parameters)) expect(recomputed.parameters[k]).toBeCloseTo(v, 12);
  });

  it("its bounds are the largest-weight member's (the member ets chooses) moved to the weighted mean, which lies inside them", () => {
    const fit = etsWeighted.fit({ y, season: m });
    const fc = etsWeighted.forecast(fit, 8, [80, 95]);
    const chosen = ets.fit({ y, season: m });
    const single = ets.forecast(chosen, 8, [80, 95]);
    const { members, top } = weightedMembers(fit);
    expect(members[top].spec).toMatchObject({ error: "M", trend: "A", season: "M" }); // R ets(UKgas)'s choice, ETS(M,A,M)
    for (const lv of ["80", "95"]) {
      fc.mean.forEach((mu, j) => {
        expect(fc.lower[lv][j]).toBeCloseTo(single.lower[lv][j] + mu - single.mean[j], 6);
        expect(fc.upper[lv][j]).toBeCloseTo(single.upper[lv][j] + mu - single.mean[j], 6);
        expect(fc.lower[lv][j]).toBeLessThan(mu);
        expect(fc.upper[lv][j]).toBeGreaterThan(mu);
      });
    }
    // The total: its mean is the sum of the step means; its bounds hold it.
    const total = forecastTotal(fit, etsWeighted, 8, [80, 95]);
    expect(total.mean).toBeCloseTo(fc.mean.reduce((a, v) => a + v, 0), 6);
    expect(total.lower["80"]).toBeLessThan(total.mean);
    expect(total.upper["80"]).toBeGreaterThan(total.mean);
  });

  it("refuses bad fixed values with a clear error", () => {
    const fit = etsWeighted.fit({ y, season: m });
    const p = fit.parameters;
    expect(() => etsWeighted.fit({ y, season: m, fixed: { alpha: 0.3 } })).toThrow(/must name its member/);
    expect(() => etsWeighted.fit({ y, season: m, fixed: { "XYZ.alpha": 0.3 } })).toThrow(/not a member/);
    expect(() => etsWeighted.fit({ y, season: m, fixed: { "ANN.alpha": 0.3 } })).toThrow(/needs every value; missing ANN.l0/);
    expect(() => etsWeighted.fit({ y, season: m, fixed: { "ANN.alpha": 0.3, "ANN.l0": 100, "ANN.beta": 0.1 } })).toThrow(/unknown fixed value 'ANN.beta'/);
    expect(() => etsWeighted.fit({ y, season: m, fixed: { ...p, "ANN.weight": -1 } })).toThrow(/at least 0/);
    expect(() => etsWeighted.fit({ y, season: m, fixed: { "ANN.alpha": 1.5, "ANN.l0": 100 } })).toThrow(/alpha/);
    const { ["ANN.weight"]: _, ...someWeights } = p;
    expect(() => etsWeighted.fit({ y, season: m, fixed: someWeights })).toThrow(/every member's weight or none/);
    expect(() => etsWeighted.fit({ y: [1, 2, 3, 4, 5, 6, 7, 8, 9, 10], season: 1, fixed: { "ANA.alpha": 0.3, "ANA.l0": 1 } })).toThrow(/season length of at least 2/);
  });

  it("leaves out the multiplicative members when a value is not above zero", () => {
    const z = y.map((v, i) => v - (i === 5 ? 200 : 0));
    expect(z.some((v) => v <= 0)).toBe(true);
    const fit = etsWeighted.fit({ y: z, season: m });
    expect(Object.keys(fit.parameters).filter((k) => k.endsWith(".weight")).map((k) => k[0])).not.toContain("M");
  });

  it("on a series too short for any member's AICc, uses the member ets chooses alone", () => {
    const short = [3, 5, 4];
    const fit = etsWeighted.fit({ y: short, season: 1 });
    const { members } = weightedMembers(fit);
    expect(members.map((x) => x.weight)).toEqual([1]);
    expect(etsWeighted.forecast(fit, 3, [80]).mean).toEqual(ets.forecast(ets.fit({ y: short, season: 1 }), 3, [80]).mean);
  });
});
