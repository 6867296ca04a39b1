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
 *   with every weight 1: innovation ε_{n+i} enters the last h − i + 1 steps); for a window a..h,
 *   ε_{n+i} enters steps max(i, a)..h (hand computation, written out in each test).
 * - Windows a..h (the total of periods 4..10, 4..15): the same references with R summing each
 *   simulated path over [a:h] only.
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
import snaive from "../../lib/forecast/methods/seasonal-naive";
import type { Fit } from "../../lib/forecast/types";
import { mcQuantileTolerance, preloadSeries, relDiff, rEval, rSeries } from "../helpers/r";

preloadSeries(["Nile", "AirPassengers"]);
const LEVELS = [80, 95];
const R_PATHS = 5000;


/**
 * R: the ets fit, its final states, and quantiles of the sums over steps a..h of R_PATHS
 * simulate() paths; annVar = the ETS(A,N,N) variance of that window's total, written out in R
 * from the decomposition (innovation ε_{n+i} enters steps max(i, a)..h: weight (h − a + 1)α for
 * i < a, 1 + (h − i)α for i ≥ a).
 */
function rSums(series: string, model: string, h: number, a = 1) {
  return rEval(`f <- ets(${series}, model = "${model}", damped = FALSE)
    out("par", f$par[c("alpha", "beta", "gamma")]); out("states", f$states[1, ]); out("k", length(f$par))
    out("final", f$states[length(f$x) + 1, ]); out("sigma2", f$sigma2)
    al <- f$par["alpha"]; h <- ${h}; a <- ${a}; i <- 1:h
    w <- ifelse(i < a, (h - a + 1) * al, 1 + (h - i) * al)
    out("annVar", f$sigma2 * sum(w^2))
    set.seed(1)
    sums <- replicate(${R_PATHS}, sum(simulate(f, nsim = h, future = TRUE)[a:h]))
    out("q", quantile(sums, c(0.025, 0.1, 0.9, 0.975))); out("sd", sd(sums))`);
}

function expectWithinMc(ours: Fit, h: number, r: Record<string, number[]>, a = 1) {
  const t = forecastTotal(ours, ours.method === "ses" ? ses : ets, h, LEVELS, undefined, a);
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

  it("ETS(A,N,N) on Nile: the total of periods 4..10 (closed form and R's simulated window sums)", () => {
    const [a, h] = [4, 10];
    const r = rSums("Nile", "ANN", h, a);
    const fit: Fit = { method: "ses", parameters: { alpha: r.par[0] }, state: { level: r.final[0] }, fitted: [], residuals: [], sigma2: r.sigma2[0], n: 100, season: 1, sse: NaN, notes: [] };
    const t = expectWithinMc(fit, h, r, a);
    expect(relDiff(t.sd ** 2, r.annVar[0])).toBeLessThan(1e-12); // σ² Σ w_i², w_i written out in R (rSums)
    expect(relDiff(t.mean, 7 * r.final[0])).toBeLessThan(1e-12); // 7 periods × ℓ_n (flat point forecasts)
    // Less than the whole 10-period total's variance, more than a 7-period total from the origin's:
    // the first three innovations still move the level the window sums.
    const whole = forecastTotal(fit, ses, h, LEVELS);
    const next7 = forecastTotal(fit, ses, 7, LEVELS);
    expect(t.sd).toBeLessThan(whole.sd);
    expect(t.sd).toBeGreaterThan(next7.sd);
  });

  it("a window that starts at 1 is the plain total; a first period outside 1..h is refused", () => {
    const fit = naive.fit({ y: [10, 12, 11, 15, 14, 13, 17, 16], season: 1 });
    expect(forecastTotal(fit, naive, 4, LEVELS, undefined, 1).sd).toBe(forecastTotal(fit, naive, 4, LEVELS).sd);
    expect(() => forecastTotal(fit, naive, 4, LEVELS, undefined, 5)).toThrow(/first period/);
    expect(() => forecastTotal(fit, naive, 4, LEVELS, undefined, 0)).toThrow(/first period/);
    expect(() => forecastTotal(fit, naive, 4, LEVELS, undefined, 1.5)).toThrow(/first period/);
  });

  it("ETS(M,A,M) on AirPassengers: sample-path sums of months 4..15 against R's simulate() window sums", () => {
    const [a, h] = [4, 15];
    const r = rSums("AirPassengers", "MAM", h, a);
    const { y } = rSeries("AirPassengers");
    const [alpha, beta, gamma] = r.par;
    const st = r.states;
    const member = evaluate({ error: "M", trend: "A", season: "M", m: 12 }, y, { alpha, beta, gamma, phi: 1 }, { l0: st[0], b0: st[1], s: st.slice(2).reverse() }, r.k[0]);
    const t = expectWithinMc(memberToFit(member, y, []), h, r, a);
    expect(t.how).toMatch(/window/);
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

  it("random walk: the total of periods 3..5 has variance 32σ² (by hand)", () => {
    // ε_{n+i} enters steps max(i, 3)..5: i = 1, 2, 3 three times, i = 4 twice, i = 5 once:
    // σ² (9 + 9 + 9 + 4 + 1) = 32σ² (hand computation from the random walk's decomposition).
    const y = [10, 12, 11, 15, 14, 13, 17, 16];
    const fit = naive.fit({ y, season: 1 });
    const t = forecastTotal(fit, naive, 5, LEVELS, undefined, 3);
    expect(relDiff(t.sd ** 2, 32 * fit.sigma2)).toBeLessThan(1e-12);
    expect(t.mean).toBe(3 * 16); // 3 periods × last value
  });

  it("seasonal random walk (lag 4): the total of periods 2..8 has variance 17σ² (by hand)", () => {
    // ε_{n+i} recurs at steps i and i + 4; counted inside 2..8: i = 1 → step 5 (1 time);
    // i = 2, 3, 4 → steps i and i + 4 (2 times each); i = 5..8 → step i (1 time):
    // σ² (1 + 3·4 + 4·1) = 17σ².
    const y = [10, 20, 30, 40, 12, 21, 33, 41, 13, 24, 32, 45];
    const fit = snaive.fit({ y, season: 4 });
    const t = forecastTotal(fit, snaive, 8, LEVELS, undefined, 2);
    expect(relDiff(t.sd ** 2, 17 * fit.sigma2)).toBeLessThan(1e-12);
    expect(t.mean).toBe(24 + 32 + 45 + 13 + 24 + 32 + 45); // periods 2..8 repeat the last season's values
  });
});
