/**
 * Forecasts of a total over the next h periods (lib/forecast/total.ts).
 *
 * References, each computed in the test:
 * - ETS(A,N,N): the aggregated forecast variance σ² Σ_{j=1}^{h} (1 + (h − j) α)² (Hyndman,
 *   Koehler, Ord & Snyder 2008, ch. 6: each innovation ε_{n+i} enters steps i..h, with weight
 *   1 at step i and α at each later one), evaluated in R with R's α and σ²; and R's simulate()
 *   on the same ets fit, summing each sample path, whose quantiles ours must match within
 *   Monte Carlo error.
 * - ETS(M,A,M): no closed form; our sample-path sums against R's simulate() sums, within
 *   Monte Carlo error.
 * - Naive (random walk): var = σ² Σ_{j=1}^{h} j² (hand computation from the same decomposition
 *   with every weight 1: innovation ε_{n+i} enters the last h − i + 1 steps).
 * Monte Carlo tolerance: 4 standard errors of the difference of two sample quantiles from n1
 * and n2 paths, s.e. = √(p(1 − p)/n)/f(q), density f from a normal with the sums' s.d.
 * (asymptotic normality of sample quantiles; Serfling 1980 §2.3.3).
 */
import { describe, expect, it } from "vitest";
import { forecastTotal } from "../../lib/forecast/total";
import { evaluate } from "../../lib/forecast/ets/estimate";
import { memberToFit } from "../../lib/forecast/ets/family";
import ses from "../../lib/forecast/methods/ses";
import ets from "../../lib/forecast/methods/ets";
import naive from "../../lib/forecast/methods/naive";
import type { Fit } from "../../lib/forecast/types";
import { mcQuantileTolerance, preloadSeries, relDiff, rEval, rSeries } from "../helpers/r";

preloadSeries(["Nile", "AirPassengers"]);
const LEVELS = [80, 95];
const R_PATHS = 5000;


/** R: the ets fit, its final states, and quantiles of the sums of R_PATHS simulate() paths. */
function rSums(series: string, model: string, h: number) {
  return rEval(`f <- ets(${series}, model = "${model}", damped = FALSE)
    out("par", f$par[c("alpha", "beta", "gamma")]); out("states", f$states[1, ]); out("k", length(f$par))
    out("final", f$states[length(f$x) + 1, ]); out("sigma2", f$sigma2)
    a <- f$par["alpha"]; h <- ${h}
    out("annVar", f$sigma2 * sum((1 + (h - (1:h)) * a)^2))
    set.seed(1)
    sums <- replicate(${R_PATHS}, sum(simulate(f, nsim = h, future = TRUE)))
    out("q", quantile(sums, c(0.025, 0.1, 0.9, 0.975))); out("sd", sd(sums))`);
}

function expectWithinMc(ours: Fit, h: number, r: Record<string, number[]>) {
  const t = forecastTotal(ours, ours.method === "ses" ? ses : ets, h, LEVELS);
  const [q025, q10, q90, q975] = r.q;
  const sd = r.sd[0];
  expect(Math.abs(t.lower["95"] - q025)).toBeLessThan(mcQuantileTolerance(0.025, sd, 5000, R_PATHS)); // R simulate() sums
  expect(Math.abs(t.lower["80"] - q10)).toBeLessThan(mcQuantileTolerance(0.1, sd, 5000, R_PATHS));
  expect(Math.abs(t.upper["80"] - q90)).toBeLessThan(mcQuantileTolerance(0.9, sd, 5000, R_PATHS));
  expect(Math.abs(t.upper["95"] - q975)).toBeLessThan(mcQuantileTolerance(0.975, sd, 5000, R_PATHS));
  return t;
}

describe("forecastTotal", () => {
  it("ETS(A,N,N) on Nile: closed-form variance of the 10-step total, and R's simulated sums", () => {
    const h = 10;
    const r = rSums("Nile", "ANN", h);
    const alpha = r.par[0];
    const fit: Fit = {
      method: "ses",
      parameters: { alpha },
      state: { level: r.final[0] },
      fitted: [],
      residuals: [],
      sigma2: r.sigma2[0],
      n: 100,
      season: 1,
      sse: NaN,
      notes: [],
    };
    const t = expectWithinMc(fit, h, r);
    expect(relDiff(t.sd ** 2, r.annVar[0])).toBeLessThan(1e-12); // σ² Σ (1 + (h − j)α)², computed in R
    expect(relDiff(t.mean, h * r.final[0])).toBeLessThan(1e-12); // h·ℓ_n (flat point forecasts)
    // Not the sum of the step bounds: with α < 1 the steps are not perfectly correlated.
    const steps = ses.forecast(fit, h, LEVELS);
    expect(t.upper["95"]).toBeLessThan(steps.upper["95"].reduce((a, v) => a + v, 0));
  });

  it("ETS(M,A,M) on AirPassengers: sample-path sums of 12 months against R's simulate() sums", () => {
    const h = 12;
    const r = rSums("AirPassengers", "MAM", h);
    const { y } = rSeries("AirPassengers");
    const [alpha, beta, gamma] = r.par;
    const st = r.states;
    const member = evaluate({ error: "M", trend: "A", season: "M", m: 12 }, y, { alpha, beta, gamma, phi: 1 }, { l0: st[0], b0: st[1], s: st.slice(2).reverse() }, r.k[0]);
    const t = expectWithinMc(memberToFit(member, y, []), h, r);
    expect(t.how).toMatch(/simulated sample paths/);
  });

  it("naive: variance of the h-step total is σ² Σ j²", () => {
    const y = [10, 12, 11, 15, 14, 13, 17, 16];
    const fit = naive.fit({ y, season: 1 });
    const h = 4;
    const t = forecastTotal(fit, naive, h, LEVELS);
    // σ² (1 + 4 + 9 + 16) = 30 σ²
    expect(relDiff(t.sd ** 2, 30 * fit.sigma2)).toBeLessThan(1e-12);
    expect(t.mean).toBe(4 * 16); // h × last value
  });
});
