/**
 * Optimised fits: our least-squares estimates reach an in-sample SSE no worse than R's
 * forecast::ets() for the same model (additive errors; ets maximises the Gaussian
 * likelihood, which for additive errors is minimising the SSE). R is run with its default
 * bounds ("both": usual ∩ admissible) and with bounds = "usual" (our region); the smaller R
 * SSE is the reference. Tolerance 1e-6 relative, as the project lead set.
 * Since a lower SSE than R's alone cannot see an estimate stuck at a bound, each fit is also
 * checked to be a minimum of R's own SSE recursions (localCheck below), and where R reaches the
 * same minimum its parameters are compared with ours.
 * Reference values: R 4.x forecast::ets, computed in the test.
 */
import { describe, expect, it } from "vitest";
import ses from "../../lib/forecast/methods/ses";
import holt from "../../lib/forecast/methods/holt";
import dampedHolt from "../../lib/forecast/methods/damped-holt";
import hwAdditive from "../../lib/forecast/methods/holt-winters-additive";
import hwMultiplicative from "../../lib/forecast/methods/holt-winters-multiplicative";
import {
  ALPHA_LOWER,
  ALPHA_UPPER,
  BETA_LOWER,
  GAMMA_LOWER,
  PHI_LOWER,
  PHI_UPPER,
} from "../../lib/forecast/ets";
import type { Method } from "../../lib/forecast/types";
import { preloadSeries, rEvalBatch, rSeries, rVector } from "../helpers/r";

interface Case {
  method: Method;
  series: string;
  model: string;
  damped: boolean;
  /** R's fit reaches the same optimum as ours (its SSE within 0.1% of ours): parameters compared. */
  sameOptimum?: boolean;
}

const cases: Case[] = [
  { method: ses, series: "Nile", model: "ANN", damped: false, sameOptimum: true },
  { method: ses, series: "lynx", model: "ANN", damped: false, sameOptimum: true },
  { method: ses, series: "WWWusage", model: "ANN", damped: false, sameOptimum: true },
  { method: holt, series: "WWWusage", model: "AAN", damped: false },
  { method: holt, series: "Nile", model: "AAN", damped: false, sameOptimum: true },
  { method: holt, series: "JohnsonJohnson", model: "AAN", damped: false, sameOptimum: true },
  { method: dampedHolt, series: "WWWusage", model: "AAN", damped: true },
  { method: dampedHolt, series: "Nile", model: "AAN", damped: true },
  { method: dampedHolt, series: "lynx", model: "AAN", damped: true },
  { method: hwAdditive, series: "UKgas", model: "AAA", damped: false },
  { method: hwAdditive, series: "co2", model: "AAA", damped: false },
  { method: hwAdditive, series: "AirPassengers", model: "AAA", damped: false },
  { method: hwAdditive, series: "JohnsonJohnson", model: "AAA", damped: false },
  { method: hwMultiplicative, series: "AirPassengers", model: "AAM", damped: false },
  { method: hwMultiplicative, series: "UKgas", model: "AAM", damped: false, sameOptimum: true },
  { method: hwMultiplicative, series: "JohnsonJohnson", model: "AAM", damped: false },
];

preloadSeries([...new Set(cases.map((c) => c.series))]);
const fits = cases.map((c) => {
  const { y, m } = rSeries(c.series);
  return c.method.fit({ y, season: m });
});

const TRUE_FALSE = (b: boolean) => (b ? "TRUE" : "FALSE");

/**
 * R code: the SSE of our estimates by R's own recursions (forecast:::pegelsresid.C, the routine
 * ets() optimises, with our initial states), and the smallest relative change of that SSE over
 * moves of 0.001 in each smoothing parameter, both ways, and along the edges β = α and
 * γ = 1 − α, that stay inside the "usual" region. At a (local) minimum no such move lowers the
 * SSE; a parameter stuck at a bound while the optimum lies inside would show as a lower SSE one
 * step inward.
 */
function localCheck(c: Case, fit: (typeof fits)[number]): string {
  const p = fit.parameters as Record<string, number>;
  const st = fit.state as { l0: number; b0?: number; initialSeason?: number[] };
  const trend = c.model[1] === "A";
  const season = c.model[2] !== "N";
  const x0 = [st.l0, ...(trend ? [st.b0!] : []), ...(season ? [...st.initialSeason!].reverse() : [])]; // R: newest season first
  return `y <- as.numeric(${c.series}); m <- frequency(${c.series}); x0 <- ${rVector(x0)}
    free <- c(TRUE, ${TRUE_FALSE(trend)}, ${TRUE_FALSE(season)}, ${TRUE_FALSE(c.damped)})
    th <- c(${p.alpha}, ${p.beta ?? 0}, ${p.gamma ?? 0}, ${p.phi ?? 1})
    sse <- function(t) sum(forecast:::pegelsresid.C(y, m, x0, "A", "${c.model[1]}", "${c.model[2]}", ${TRUE_FALSE(c.damped)}, t[1], t[2], t[3], t[4], 1)$e^2)
    inside <- function(t) t[1] >= ${ALPHA_LOWER} && t[1] <= ${ALPHA_UPPER} &&
      (!free[2] || (t[2] >= ${BETA_LOWER} * (1 - 1e-9) && t[2] <= t[1] * (1 + 1e-9))) &&
      (!free[3] || (t[3] >= ${GAMMA_LOWER} * (1 - 1e-9) && t[3] <= (1 - t[1]) * (1 + 1e-9))) &&
      (!free[4] || (t[4] >= ${PHI_LOWER} && t[4] <= ${PHI_UPPER}))
    dirs <- list()
    for (k in which(free)) { e <- rep(0, 4); e[k] <- 1; dirs <- c(dirs, list(e, -e)) }
    if (free[2]) dirs <- c(dirs, list(c(1, 1, 0, 0), c(-1, -1, 0, 0)))
    if (free[3]) dirs <- c(dirs, list(c(1, 0, -1, 0), c(-1, 0, 1, 0)))
    s0 <- sse(th); change <- c()
    for (e in dirs) { t <- th + 0.001 * e; if (inside(t)) change <- c(change, (sse(t) - s0) / s0) }
    out("sse", s0); out("moves", length(change)); out("change", min(change))`;
}

// One R session for every reference fit and every check of our estimates.
const reference = rEvalBatch(
  Object.fromEntries(
    cases.flatMap((c, i) => {
      const args = `model = "${c.model}", damped = ${TRUE_FALSE(c.damped)}, restrict = FALSE`;
      return [
        [
          `fit${i}`,
          `f1 <- ets(${c.series}, ${args}); f2 <- ets(${c.series}, ${args}, bounds = "usual")
        out("sse", c(sum(residuals(f1)^2), sum(residuals(f2)^2)))
        f <- if (sum(residuals(f1)^2) <= sum(residuals(f2)^2)) f1 else f2; out("par", f$par[c("alpha", "beta", "gamma", "phi")])
        out("k", length(f1$par)); out("sigma2", f1$sigma2)`,
        ],
        [`local${i}`, localCheck(c, fits[i])],
      ];
    }),
  ),
);

describe("optimised SSE is no worse than R forecast::ets for the same model, at a minimum of R's own SSE", () => {
  cases.forEach((c, i) => {
    it(`${c.method.id} on ${c.series} (ets model ${c.model}${c.damped ? ", damped" : ""})`, () => {
      const { y } = rSeries(c.series);
      const fit = fits[i];
      const r = reference[`fit${i}`];
      const rSse = Math.min(...r.sse);
      expect(fit.sse).toBeLessThanOrEqual(rSse * (1 + 1e-6)); // R 4.x forecast::ets, computed in the test

      // Our SSE is R's recursions' SSE at our estimates, and no move of 0.001 in a smoothing
      // parameter inside the region lowers it (forecast:::pegelsresid.C, computed in the test):
      // the estimates are a minimum, not stuck at a bound.
      const local = reference[`local${i}`];
      expect(Math.abs(fit.sse - local.sse[0]) / local.sse[0]).toBeLessThan(1e-10);
      expect(local.moves[0]).toBeGreaterThan(0);
      expect(local.change[0]).toBeGreaterThan(0);

      // Where R's optimiser reaches the same minimum (SSE within 0.1%), the estimates are R's
      // (R 4.x forecast::ets f$par) within 0.001; elsewhere R's Nelder–Mead stopped at a higher SSE.
      const p = fit.parameters;
      if (c.sameOptimum) {
        expect(Math.abs(fit.sse - rSse) / rSse).toBeLessThan(1e-3);
        const [alpha, beta, gamma, phi] = r.par;
        expect(Math.abs(p.alpha - alpha)).toBeLessThan(1e-3);
        if ("beta" in p) expect(Math.abs(p.beta - beta)).toBeLessThan(1e-3);
        if ("gamma" in p) expect(Math.abs(p.gamma - gamma)).toBeLessThan(1e-3);
        if ("phi" in p) expect(Math.abs(p.phi - phi)).toBeLessThan(1e-3);
      } else {
        expect(fit.sse).toBeLessThan(rSse * (1 - 1e-3));
      }

      // Estimates inside the bounds of R ets's "usual" region (named constants).
      expect(p.alpha).toBeGreaterThanOrEqual(ALPHA_LOWER);
      expect(p.alpha).toBeLessThanOrEqual(ALPHA_UPPER);
      if ("beta" in p) {
        expect(p.beta).toBeGreaterThanOrEqual(BETA_LOWER * (1 - 1e-12));
        expect(p.beta).toBeLessThanOrEqual(p.alpha * (1 + 1e-12));
      }
      if ("gamma" in p) {
        expect(p.gamma).toBeGreaterThanOrEqual(GAMMA_LOWER * (1 - 1e-12));
        expect(p.gamma).toBeLessThanOrEqual((1 - p.alpha) * (1 + 1e-12));
      }
      if ("phi" in p) {
        expect(p.phi).toBeGreaterThanOrEqual(PHI_LOWER);
        expect(p.phi).toBeLessThanOrEqual(PHI_UPPER);
      }

      // σ² = SSE/(n − k) with k the number of estimated parameters and states, counted as
      // R ets counts them (length(fit$par), R 4.x forecast::ets computed in the test).
      expect(fit.state.estimated).toBe(r.k[0]);
      expect(fit.sigma2).toBeCloseTo(fit.sse / (y.length - r.k[0]), 8);
    });
  });
});
