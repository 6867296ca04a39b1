/**
 * Prediction intervals.
 *
 * Additive models (class 1 of Hyndman et al. 2008 ch. 6): var_h = σ²[1 + Σ_{j<h} c_j²].
 * Two checks against R 4.x forecast, computed in the test:
 * 1. R's own fit: take forecast::ets's estimated parameters, initial states (fit$states[1, ])
 *    and σ²; our recursions with those fixed reproduce R's fitted values, and our intervals
 *    with R's σ² reproduce forecast(fit, h, level = c(80, 95)) bound for bound.
 * 2. Our own fit: our final state, parameters and σ² passed to forecast:::class1 (the
 *    routine forecast.ets uses) give the same means and variances, and the bounds
 *    mean ± qnorm(0.5 + level/200)·√var computed in R.
 * Multiplicative seasonality (A,A,M): simulated intervals against R's simulated intervals
 * (forecast(ets fit, simulate = TRUE, npaths = 5000)) within Monte Carlo error.
 */
import { describe, expect, it } from "vitest";
import ses from "../../lib/forecast/methods/ses";
import holt from "../../lib/forecast/methods/holt";
import dampedHolt from "../../lib/forecast/methods/damped-holt";
import hwAdditive from "../../lib/forecast/methods/holt-winters-additive";
import hwMultiplicative from "../../lib/forecast/methods/holt-winters-multiplicative";
import type { Fit, Method } from "../../lib/forecast/types";
import { normalQuantile } from "../../lib/stats/normal";
import { maxRelDiff, mcQuantileTolerance, preloadSeries, rEval, rEvalBatch, rSeries, rVector } from "../helpers/r";

const TOL = 1e-8;
const LEVELS = [80, 95];

preloadSeries(["Nile", "WWWusage", "UKgas", "lynx", "co2", "JohnsonJohnson", "AirPassengers"]);

/** Fixed parameters and states for our method from an R ets fit. */
function fixedFromR(r: Record<string, number[]>, trend: boolean, seasonal: boolean, damped: boolean, m: number): Record<string, number> {
  const [alpha, beta, gamma, phi] = r.par;
  const st = r.states;
  const fixed: Record<string, number> = { alpha, l0: st[0] };
  if (trend) {
    fixed.beta = beta;
    fixed.b0 = st[1];
  }
  if (damped) fixed.phi = phi;
  if (seasonal) {
    fixed.gamma = gamma;
    const s = st.slice(trend ? 2 : 1).reverse(); // R: newest first; ours: time order
    for (let i = 0; i < m; i++) fixed[`s${i + 1}`] = s[i];
  }
  return fixed;
}

const rFits: { name: string; method: Method; series: string; model: string; damped: boolean; h: number }[] = [
  { name: "SES (ANN) on Nile", method: ses, series: "Nile", model: "ANN", damped: false, h: 10 },
  { name: "Holt (AAN) on JohnsonJohnson", method: holt, series: "JohnsonJohnson", model: "AAN", damped: false, h: 12 },
  { name: "damped Holt (AAdN) on WWWusage", method: dampedHolt, series: "WWWusage", model: "AAN", damped: true, h: 20 },
  { name: "Holt-Winters additive (AAA) on UKgas", method: hwAdditive, series: "UKgas", model: "AAA", damped: false, h: 12 },
];

const AAM_H = 24;

/** R's fits of this file (one R session): R 4.x forecast::ets and forecast(), as named in each test. */
const R = rEvalBatch<string>({
  ...Object.fromEntries(
    rFits.map((c, i) => [
      `fit${i}`,
      `f <- ets(${c.series}, model = "${c.model}", damped = ${c.damped ? "TRUE" : "FALSE"})
        fc <- forecast(f, h = ${c.h}, level = c(80, 95))
        out("par", f$par[c("alpha", "beta", "gamma", "phi")]); out("states", f$states[1, ]); out("sigma2", f$sigma2)
        out("fitted", fitted(f)); out("mean", fc$mean); out("lower", fc$lower); out("upper", fc$upper)`,
    ]),
  ),
  aam: `f <- ets(AirPassengers, model = "AAM", damped = FALSE, restrict = FALSE)
      set.seed(1); fc <- forecast(f, h = ${AAM_H}, level = c(80, 95), simulate = TRUE, npaths = 5000)
      out("par", f$par[c("alpha", "beta", "gamma", "phi")]); out("states", f$states[1, ]); out("sigma2", f$sigma2)
      out("fitted", fitted(f)); out("mean", fc$mean); out("lower", fc$lower); out("upper", fc$upper)`,
});

describe("additive intervals equal forecast::forecast(ets fit) with R's parameters, states and σ²", () => {
  for (const [i, c] of rFits.entries()) {
    it(c.name, () => {
      const { y, m } = rSeries(c.series);
      const r = R[`fit${i}`];
      const trend = c.model[1] === "A";
      const seasonal = c.model[2] === "A";
      const fit = c.method.fit({ y, season: m, fixed: fixedFromR(r, trend, seasonal, c.damped, m) });
      // R 4.x forecast::ets fitted values, computed in the test.
      expect(maxRelDiff(fit.fitted, r.fitted)).toBeLessThan(TOL);
      const withRSigma: Fit = { ...fit, sigma2: r.sigma2[0] };
      const fc = c.method.forecast(withRSigma, c.h, LEVELS);
      // R 4.x forecast::forecast.ets means and bounds (lower/upper are h × 2 matrices, column-major).
      expect(maxRelDiff(fc.mean, r.mean)).toBeLessThan(TOL);
      expect(maxRelDiff(fc.lower["80"], r.lower.slice(0, c.h))).toBeLessThan(TOL);
      expect(maxRelDiff(fc.lower["95"], r.lower.slice(c.h))).toBeLessThan(TOL);
      expect(maxRelDiff(fc.upper["80"], r.upper.slice(0, c.h))).toBeLessThan(TOL);
      expect(maxRelDiff(fc.upper["95"], r.upper.slice(c.h))).toBeLessThan(TOL);
    });
  }
});

describe("additive forecast variances of our own fits equal forecast:::class1", () => {
  const ours: { name: string; method: Method; series: string; trend: string; season: string; damped: boolean; h: number }[] = [
    { name: "damped Holt on lynx", method: dampedHolt, series: "lynx", trend: "A", season: "N", damped: true, h: 15 },
    { name: "Holt-Winters additive on co2 (h = 30 crosses two seasons)", method: hwAdditive, series: "co2", trend: "A", season: "A", damped: false, h: 30 },
  ];
  for (const c of ours) {
    it(c.name, () => {
      const { y, m } = rSeries(c.series);
      const fit = c.method.fit({ y, season: m });
      const fc = c.method.forecast(fit, c.h, [50, 80, 95, 99]);
      const season = c.season === "A" ? [...(fit.state.season as number[])].reverse() : [];
      const last = [fit.state.level as number, ...(c.trend === "A" ? [fit.state.trend as number] : []), ...season];
      const p = fit.parameters;
      const r = rEval(`par <- c(alpha = ${p.alpha}, beta = ${p.beta ?? 0}, gamma = ${p.gamma ?? 0}, phi = ${p.phi ?? 1})
        k <- forecast:::class1(${c.h}, ${rVector(last)}, "${c.trend}", "${c.season}", ${c.damped ? "TRUE" : "FALSE"}, ${c.season === "N" ? 1 : m}, ${fit.sigma2.toPrecision(17)}, par)
        out("mu", k$mu); out("var", k$var)
        for (lv in c(50, 80, 95, 99)) { z <- qnorm(0.5 + lv / 200); out(paste0("lo", lv), k$mu - z * sqrt(k$var)); out(paste0("hi", lv), k$mu + z * sqrt(k$var)) }`);
      // R 4.x forecast:::class1 and qnorm, computed in the test.
      expect(maxRelDiff(fc.mean, r.mu)).toBeLessThan(TOL);
      expect(maxRelDiff(fc.sd.map((s) => s * s), r.var)).toBeLessThan(TOL);
      for (const lv of [50, 80, 95, 99]) {
        expect(maxRelDiff(fc.lower[String(lv)], r[`lo${lv}`])).toBeLessThan(TOL);
        expect(maxRelDiff(fc.upper[String(lv)], r[`hi${lv}`])).toBeLessThan(TOL);
      }
    });
  }
});

describe("Holt-Winters multiplicative (A,A,M): simulated intervals", () => {
  it("match R's simulated intervals for the same parameters, states and σ² within Monte Carlo error; are deterministic", () => {
    const { y, m } = rSeries("AirPassengers");
    const h = AAM_H;
    const r = R.aam;
    const fit = hwMultiplicative.fit({ y, season: m, fixed: fixedFromR(r, true, true, false, m) });
    expect(maxRelDiff(fit.fitted, r.fitted)).toBeLessThan(TOL); // R 4.x forecast::ets (A,A,M) fitted values
    const withRSigma: Fit = { ...fit, sigma2: r.sigma2[0] };
    const fc = hwMultiplicative.forecast(withRSigma, h, LEVELS);
    // Point forecasts are the model's conditional means, as R's: exact.
    expect(maxRelDiff(fc.mean, r.mean)).toBeLessThan(TOL);
    // Bounds: both are quantiles of 5000 simulated paths from different generators, so they
    // differ by Monte Carlo error only: each pair within 4 standard errors of the difference of
    // two sample quantiles at its own probability (mcQuantileTolerance in tests/helpers/r.ts;
    // σ_h read from R's own 80% interval). This replaces a common 15% of the half-width, which
    // was about 5 standard errors at the 95% bounds and 7 at the 80% bounds.
    const paths = 5000; // ours (PATHS, lib/forecast/ets/state-space.ts) and R's npaths above
    for (let i = 0; i < h; i++) {
      const sd = (r.upper[i] - r.lower[i]) / (2 * normalQuantile(0.9));
      const pairs: [number, number, number][] = [
        [fc.lower["80"][i], r.lower[i], 0.1],
        [fc.upper["80"][i], r.upper[i], 0.9],
        [fc.lower["95"][i], r.lower[h + i], 0.025],
        [fc.upper["95"][i], r.upper[h + i], 0.975],
      ];
      for (const [ours, theirs, p] of pairs) expect(Math.abs(ours - theirs), `step ${i + 1}, p = ${p}`).toBeLessThan(mcQuantileTolerance(p, sd, paths, paths));
    }
    // Step 1 has exactly variance σ² (one error term): the simulated s.d. is within 5% (≈5 s.e.).
    expect(Math.abs(fc.sd[0] / Math.sqrt(r.sigma2[0]) - 1)).toBeLessThan(0.05);
    // Deterministic: a fixed rng start gives the same bounds every time.
    const again = hwMultiplicative.forecast(withRSigma, h, LEVELS);
    expect(again.lower["95"]).toEqual(fc.lower["95"]);
    expect(again.upper["80"]).toEqual(fc.upper["80"]);
  });
});
