/**
 * Multiplicative-error ETS members (Hyndman, Koehler, Snyder & Grose 2002; Hyndman et al. 2008)
 * against R's forecast::ets, run in the test.
 *
 * 1. Recursions and likelihood: with R's estimated parameters and initial states (fit$par,
 *    fit$states[1, ]), our fitted values, log-likelihood, AICc and σ² equal R's fit$fitted,
 *    fit$loglik, fit$aicc and fit$sigma2 (relative 1e-8: the same arithmetic in another order).
 * 2. Class 2 (M,N,N, M,A,N, M,Ad,N): our point forecasts and normal bounds from R's values equal
 *    forecast(fit, h) (R's class2 variances), relative 1e-8.
 * 3. Class 3 (M,N,M, M,A,M, M,Ad,M): our means equal the point forecasts of table 2.1
 *    computed in R from R's final states, and our simulated bounds R's simulated quantiles within
 *    Monte Carlo error (mcQuantileTolerance in tests/helpers/r.ts; sd read from R's own 80% interval).
 * 4. Estimation: maximising the likelihood ourselves gives a log-likelihood no lower than R's
 *    minus 0.5 (half a unit of log-likelihood = an AICc difference of 1, below the difference of
 *    2 usually read as support for one model over another: Burnham & Anderson 2002, common
 *    practice). R's Nelder–Mead may stop before the optimum, so ours is often higher. For the
 *    M-season members also on the automatic choice's own route (chooseMember: the joint search
 *    started from the fitted A-season member), compared by AICc.
 */
import { describe, expect, it } from "vitest";
import { evaluate, fitStateSpace } from "../../lib/forecast/ets/estimate";
import { chooseMember, fitMember, memberToFit } from "../../lib/forecast/ets/family";
import { memberForecast } from "../../lib/forecast/ets/distribution";
import type { EtsSpec } from "../../lib/forecast/ets/state-space";
import { normalQuantile } from "../../lib/stats/normal";
import { maxRelDiff, mcQuantileTolerance, preloadSeries, relDiff, rEvalBatch, rSeries } from "../helpers/r";

const TOL = 1e-8;
const H = 12;
preloadSeries(["AirPassengers", "UKgas"]);

/** R code fitting a member: values, fitted, loglik, aicc, sigma2 and its forecasts. */
function rFit(series: string, model: string, damped: boolean, simulate: boolean, npaths = 20000) {
  return `f <- ets(${series}, model = "${model}", damped = ${damped ? "TRUE" : "FALSE"})
    out("par", f$par[c("alpha", "beta", "gamma", "phi")]); out("states", f$states[1, ]); out("k", length(f$par))
    out("fitted", fitted(f)); out("loglik", f$loglik); out("aicc", f$aicc); out("sigma2", f$sigma2)
    set.seed(1)
    fc <- forecast(f, h = ${H}, level = c(80, 95)${simulate ? `, simulate = TRUE, npaths = ${npaths}` : ""})
    x <- f$states[length(f$x) + 1, ]; ph <- if (${damped ? "TRUE" : "FALSE"}) f$par["phi"] else 1
    tr <- if ("b" %in% names(x)) x["b"] else 0; sv <- x[grepl("^s", names(x))]; m <- length(sv)
    out("table21", if (m > 0) (x["l"] + cumsum(ph^(1:${H})) * tr) * sv[((m - (1:${H})) %% m) + 1] else NA)
    out("mean", fc$mean); out("lo80", fc$lower[, 1]); out("hi80", fc$upper[, 1]); out("lo95", fc$lower[, 2]); out("hi95", fc$upper[, 2])`;
}

/** Our member with R's values, and the number of values R estimated. */
function withRValues(spec: EtsSpec, y: number[], r: Record<string, number[]>) {
  const [alpha, beta, gamma, phi] = r.par.map((v) => (Number.isNaN(v) ? undefined : v));
  const trendOn = spec.trend !== "N";
  const st = r.states;
  const s = spec.season === "N" ? [] : st.slice(trendOn ? 2 : 1).reverse(); // R: newest first; ours: time order
  return evaluate(
    spec,
    y,
    { alpha: alpha!, beta: trendOn ? beta! : 0, gamma: spec.season === "N" ? 0 : gamma!, phi: spec.trend === "Ad" ? phi! : 1 },
    { l0: st[0], b0: trendOn ? st[1] : 0, s },
    r.k[0],
  );
}

const members: { label: string; spec: EtsSpec; series: string; model: string; damped: boolean }[] = [
  { label: "M,N,N", spec: { error: "M", trend: "N", season: "N", m: 1 }, series: "AirPassengers", model: "MNN", damped: false },
  { label: "M,A,N", spec: { error: "M", trend: "A", season: "N", m: 1 }, series: "AirPassengers", model: "MAN", damped: false },
  { label: "M,Ad,N", spec: { error: "M", trend: "Ad", season: "N", m: 1 }, series: "AirPassengers", model: "MAN", damped: true },
  { label: "M,N,M", spec: { error: "M", trend: "N", season: "M", m: 12 }, series: "AirPassengers", model: "MNM", damped: false },
  { label: "M,A,M", spec: { error: "M", trend: "A", season: "M", m: 12 }, series: "AirPassengers", model: "MAM", damped: false },
  { label: "M,Ad,M", spec: { error: "M", trend: "Ad", season: "M", m: 4 }, series: "UKgas", model: "MAM", damped: true },
];

// One R session for every member's reference fit.
const reference = rEvalBatch(Object.fromEntries(members.map((c, i) => [`m${i}`, rFit(c.series, c.model, c.damped, c.spec.season === "M")])));

describe("multiplicative-error ETS members reproduce R's forecast::ets", () => {
  for (const [i, c] of members.entries()) {
    it(`${c.label} on ${c.series}: recursions, likelihood, AICc, σ² and forecasts from R's estimates`, () => {
      const { y } = rSeries(c.series);
      const classThree = c.spec.season === "M";
      const r = reference[`m${i}`];
      const ours = withRValues(c.spec, y, r);
      expect(maxRelDiff(Array.from(ours.filtered.fitted!), r.fitted)).toBeLessThan(TOL); // R fitted(f)
      expect(relDiff(ours.loglik, r.loglik[0])).toBeLessThan(TOL); // R f$loglik
      expect(relDiff(ours.aicc, r.aicc[0])).toBeLessThan(TOL); // R f$aicc
      expect(relDiff(ours.sigma2, r.sigma2[0])).toBeLessThan(TOL); // R f$sigma2
      const fit = memberToFit(ours, y, []);
      const { ring, k } = ours.filtered.final;
      const origin = { level: ours.filtered.final.level, trend: ours.filtered.final.trend, ring: Float64Array.from(ring), k };
      const fc = memberForecast(c.spec, ours.par, origin, fit.sigma2, H, [80, 95]);
      if (!classThree) {
        expect(maxRelDiff(fc.mean, r.mean)).toBeLessThan(TOL); // R forecast(f)$mean
        // R forecast(f, h) bounds (class 2 variances, normal bounds)
        expect(maxRelDiff(fc.lower[0], r.lo80)).toBeLessThan(TOL);
        expect(maxRelDiff(fc.upper[0], r.hi80)).toBeLessThan(TOL);
        expect(maxRelDiff(fc.lower[1], r.lo95)).toBeLessThan(TOL);
        expect(maxRelDiff(fc.upper[1], r.hi95)).toBeLessThan(TOL);
      } else {
        // Point forecasts (ℓ_n + φ_h b_n)·s_{n+h−m}, φ_h = φ + … + φ^h (Hyndman et al. 2008 table 2.1),
        // computed in R from R's final states. (R's own simulate = TRUE point forecast uses
        // φ_h = φ + φ + … + φ^(h−1) for damped members, so it is not the reference here.)
        expect(maxRelDiff(fc.mean, r.table21)).toBeLessThan(TOL);
        // R forecast(f, simulate = TRUE, npaths = 20000) quantiles, within Monte Carlo error.
        for (let i = 0; i < H; i++) {
          const sd = (r.hi80[i] - r.lo80[i]) / (2 * normalQuantile(0.9));
          const pairs: [number, number, number][] = [
            [fc.lower[0][i], r.lo80[i], 0.1],
            [fc.upper[0][i], r.hi80[i], 0.9],
            [fc.lower[1][i], r.lo95[i], 0.025],
            [fc.upper[1][i], r.hi95[i], 0.975],
          ];
          for (const [a, b, p] of pairs) expect(Math.abs(a - b)).toBeLessThan(mcQuantileTolerance(p, sd, 5000, 20000));
        }
        // Ranges widen with the level: the 80% width over the mean grows with the seasonal peak.
        const rel = fc.mean.map((m, i) => (fc.upper[0][i] - fc.lower[0][i]) / m);
        expect(rel[H - 1]).toBeGreaterThan(rel[0]);
      }
    });

    it(`${c.label} on ${c.series}: our maximum-likelihood fit is at least as likely as R's (within 0.5)`, () => {
      const { y } = rSeries(c.series);
      const r = reference[`m${i}`]; // the same ets() call as the test above
      const ours = fitMember(c.spec, y);
      expect(ours.loglik).toBeGreaterThan(r.loglik[0] - 0.5); // R f$loglik, tolerance in the file comment
    });

    if (c.spec.season === "M") {
      it(`${c.label} on ${c.series}: the automatic choice's own search (from the fitted A-season member) is at least as good as R's (AICc within 1)`, () => {
        const { y } = rSeries(c.series);
        const r = reference[`m${i}`];
        const row = chooseMember(y, c.spec.m).table.find((t) => t.model === c.label);
        // R f$aicc; an AICc 1 higher is a log-likelihood 0.5 lower (tolerance in the file comment)
        expect(row!.aicc).toBeLessThan(r.aicc[0] + 1);
      });
    }
  }

  it("refuses non-positive data for a multiplicative member", () => {
    expect(() => fitStateSpace({ error: "M", trend: "N", season: "N", m: 1 }, [3, 0, 2, 4], { alpha: 0.5, l0: 3 })).toThrow(/above zero/);
  });
});
