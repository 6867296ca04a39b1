/**
 * Fixed parameters and fixed initial states: our recursions against R.
 *
 * Two independent R implementations are used:
 * - forecast:::pegelsresid.C, the C routine `etscalc` that R forecast::ets itself runs, called
 *   with the same parameters and initial states (R orders seasonal states newest first:
 *   s0, s−1, …, s−(m−1), so our time-ordered s1…sm are passed reversed); point forecasts
 *   from forecast:::class1 (additive) or the ETS forecast formula evaluated in R on R's own
 *   final state (A,A,M);
 * - stats::HoltWinters, the classical component form (β* and γ*), mapped onto the
 *   error-correction form by β = α·β* and γ = (1 − α)·γ* (exact for the additive models), with
 *   its start values as our initial states and its first fitted observation as our first.
 * Expected values are all computed by R 4.x in the test (forecast package 8.x).
 */
import { describe, expect, it } from "vitest";
import ses from "../../lib/forecast/methods/ses";
import holt from "../../lib/forecast/methods/holt";
import dampedHolt from "../../lib/forecast/methods/damped-holt";
import hwAdditive from "../../lib/forecast/methods/holt-winters-additive";
import hwMultiplicative from "../../lib/forecast/methods/holt-winters-multiplicative";
import type { Method } from "../../lib/forecast/types";
import { maxRelDiff, preloadSeries, rEvalBatch, rSeries, rVector } from "../helpers/r";

const TOL = 1e-8;
const H = 30;

interface Case {
  name: string;
  method: Method;
  series: string;
  trend: "N" | "A";
  damped: boolean;
  season: "N" | "A" | "M";
  alpha: number;
  beta?: number;
  gamma?: number;
  phi?: number;
  l0: number;
  b0?: number;
  s?: number[];
}

const cases: Case[] = [
  { name: "SES on Nile", method: ses, series: "Nile", trend: "N", damped: false, season: "N", alpha: 0.3, l0: 1100 },
  { name: "Holt on WWWusage", method: holt, series: "WWWusage", trend: "A", damped: false, season: "N", alpha: 0.6, beta: 0.2, l0: 88, b0: -0.5 },
  { name: "damped Holt on WWWusage", method: dampedHolt, series: "WWWusage", trend: "A", damped: true, season: "N", alpha: 0.7, beta: 0.1, phi: 0.9, l0: 85, b0: 1 },
  { name: "damped Holt on Nile", method: dampedHolt, series: "Nile", trend: "A", damped: true, season: "N", alpha: 0.2, beta: 0.05, phi: 0.85, l0: 1120, b0: -3 },
  {
    name: "Holt-Winters additive on UKgas", method: hwAdditive, series: "UKgas", trend: "A", damped: false, season: "A",
    alpha: 0.2, beta: 0.02, gamma: 0.3, l0: 150, b0: 1, s: [-10, -40, 10, 40],
  },
  {
    name: "Holt-Winters additive on AirPassengers", method: hwAdditive, series: "AirPassengers", trend: "A", damped: false, season: "A",
    alpha: 0.4, beta: 0.01, gamma: 0.5, l0: 118, b0: 1.5, s: [-24, -36, -2, -8, -11, 22, 53, 50, 17, -20, -52, -29],
  },
  {
    name: "Holt-Winters multiplicative on AirPassengers", method: hwMultiplicative, series: "AirPassengers", trend: "A", damped: false, season: "M",
    alpha: 0.3, beta: 0.01, gamma: 0.2, l0: 118, b0: 1.5,
    s: [0.91, 0.88, 1.01, 0.98, 0.98, 1.11, 1.23, 1.22, 1.06, 0.92, 0.80, 0.90],
  },
  {
    name: "Holt-Winters multiplicative on UKgas", method: hwMultiplicative, series: "UKgas", trend: "A", damped: false, season: "M",
    alpha: 0.1, beta: 0.05, gamma: 0.6, l0: 140, b0: 0.5, s: [1.2, 0.8, 0.6, 1.4],
  },
];

preloadSeries(["Nile", "WWWusage", "UKgas", "AirPassengers", "co2"]);

function fixedOf(c: Case): Record<string, number> {
  const fixed: Record<string, number> = { alpha: c.alpha, l0: c.l0 };
  if (c.beta !== undefined) fixed.beta = c.beta;
  if (c.gamma !== undefined) fixed.gamma = c.gamma;
  if (c.phi !== undefined) fixed.phi = c.phi;
  if (c.b0 !== undefined) fixed.b0 = c.b0;
  c.s?.forEach((v, i) => (fixed[`s${i + 1}`] = v));
  return fixed;
}

/** R code: etscalc (forecast:::pegelsresid.C) at the case's parameters and states, and its forecasts. */
function etscalcCode(c: Case): string {
  const m = c.season === "N" ? 1 : rSeries(c.series).m;
  const init = [c.l0, ...(c.trend === "A" ? [c.b0!] : []), ...(c.s ? [...c.s].reverse() : [])];
  const par = `c(alpha = ${c.alpha}, beta = ${c.beta ?? 0}, gamma = ${c.gamma ?? 0}, phi = ${c.phi ?? 1})`;
  const p = init.length;
  return `
        y <- as.numeric(${c.series}); m <- ${m}; h <- ${H}; par <- ${par}
        r <- forecast:::pegelsresid.C(y, m, ${rVector(init)}, "A", "${c.trend}", "${c.season}", ${c.damped ? "TRUE" : "FALSE"},
                                      par[["alpha"]], par[["beta"]], par[["gamma"]], par[["phi"]], 2)
        last <- r$states[nrow(r$states), ]
        out("fitted", y - r$e); out("sse", sum(r$e^2)); out("last", last)
        if ("${c.season}" == "M") {
          p <- ${p}; s <- last[3:p]; hh <- 1:h
          out("mean", (last[1] + hh * last[2]) * s[m - ((hh - 1) %% m)])
        } else {
          out("mean", forecast:::class1(h, last, "${c.trend}", "${c.season}", ${c.damped ? "TRUE" : "FALSE"}, m, 1, par)$mu)
        }`;
}

const CO2_SEASON = [-0.05, 0.6, 1.3, 2.5, 3.0, 2.3, 0.8, -1.2, -3.0, -3.2, -2.0, -1.0];

/** Every R reference of this file, in one R session (R 4.x forecast and stats, as named in each test). */
const R = rEvalBatch<string>({
  ...Object.fromEntries(cases.map((c, i) => [`case${i}`, etscalcCode(c)])),
  hwNile: `hw <- HoltWinters(Nile, alpha = 0.25, beta = FALSE, gamma = FALSE)
      out("xhat", fitted(hw)[, "xhat"]); out("pred", predict(hw, n.ahead = 5)); out("sse", hw$SSE)`,
  hwWww: `hw <- HoltWinters(WWWusage, alpha = 0.8, beta = 0.3, gamma = FALSE)
      out("xhat", fitted(hw)[, "xhat"]); out("pred", predict(hw, n.ahead = 5)); out("sse", hw$SSE)`,
  hwCo2: `hw <- HoltWinters(co2, alpha = 0.5, beta = 0.01, gamma = 0.3, seasonal = "additive",
        l.start = 315.5, b.start = 0.08, s.start = ${rVector(CO2_SEASON)})
      out("xhat", fitted(hw)[, "xhat"]); out("pred", predict(hw, n.ahead = 24)); out("sse", hw$SSE)`,
});

describe("ETS recursions at fixed parameters and states equal R's etscalc (forecast:::pegelsresid.C)", () => {
  for (const [i, c] of cases.entries()) {
    it(c.name, () => {
      const { y, m: freq } = rSeries(c.series);
      const r = R[`case${i}`];
      const fit = c.method.fit({ y, season: freq, fixed: fixedOf(c) });
      const fc = c.method.forecast(fit, H, [80, 95]);
      // R 4.x forecast:::pegelsresid.C (etscalc), computed in the test.
      expect(maxRelDiff(fit.fitted, r.fitted)).toBeLessThan(TOL);
      expect(maxRelDiff([fit.sse], r.sse)).toBeLessThan(TOL);
      expect(maxRelDiff(fc.mean, r.mean)).toBeLessThan(TOL);
      expect(maxRelDiff([fit.state.level as number], [r.last[0]])).toBeLessThan(TOL);
      if (c.trend === "A") expect(Math.abs((fit.state.trend as number) - r.last[1])).toBeLessThan(TOL * Math.max(1, Math.abs(r.last[1])));
      if (c.s) {
        const rSeason = r.last.slice(c.trend === "A" ? 2 : 1); // newest first
        const ours = [...(fit.state.season as number[])].reverse(); // steps m..1 = newest first
        expect(maxRelDiff(ours, rSeason, 1)).toBeLessThan(TOL);
      }
      // Every fitted value is a one-step-ahead forecast: residuals are y − fitted.
      expect(fit.residuals.every((e, t) => e === y[t] - fit.fitted[t])).toBe(true);
    });
  }
});

describe("additive models at fixed parameters equal stats::HoltWinters (component form mapped by β = αβ*, γ = (1 − α)γ*)", () => {
  it("SES on Nile: HoltWinters(alpha = 0.25, beta = FALSE, gamma = FALSE), l.start = y1", () => {
    const { y } = rSeries("Nile");
    const r = R.hwNile;
    // HoltWinters starts with level y1 and first fits y2: our series is y2..yn with l0 = y1.
    const fit = ses.fit({ y: y.slice(1), season: 1, fixed: { alpha: 0.25, l0: y[0] } });
    expect(maxRelDiff(fit.fitted, r.xhat)).toBeLessThan(TOL); // R 4.x stats::HoltWinters, computed in the test
    expect(maxRelDiff([fit.sse], r.sse)).toBeLessThan(TOL);
    expect(maxRelDiff(ses.forecast(fit, 5, [95]).mean, r.pred)).toBeLessThan(TOL);
  });

  it("Holt on WWWusage: HoltWinters(alpha = 0.8, beta = 0.3, gamma = FALSE), l.start = y2, b.start = y2 − y1", () => {
    const { y } = rSeries("WWWusage");
    const r = R.hwWww;
    const fit = holt.fit({ y: y.slice(2), season: 1, fixed: { alpha: 0.8, beta: 0.8 * 0.3, l0: y[1], b0: y[1] - y[0] } });
    expect(maxRelDiff(fit.fitted, r.xhat)).toBeLessThan(TOL); // R 4.x stats::HoltWinters, computed in the test
    expect(maxRelDiff([fit.sse], r.sse)).toBeLessThan(TOL);
    expect(maxRelDiff(holt.forecast(fit, 5, [95]).mean, r.pred)).toBeLessThan(TOL);
  });

  it("Holt-Winters additive on co2: HoltWinters(alpha = 0.5, beta = 0.01, gamma = 0.3) with given l.start, b.start, s.start", () => {
    const { y, m } = rSeries("co2");
    const s = CO2_SEASON;
    const r = R.hwCo2;
    // HoltWinters' first fitted observation is y_{m+1}; its start values are the states before it.
    const fixed: Record<string, number> = { alpha: 0.5, beta: 0.5 * 0.01, gamma: (1 - 0.5) * 0.3, l0: 315.5, b0: 0.08 };
    s.forEach((v, i) => (fixed[`s${i + 1}`] = v));
    const fit = hwAdditive.fit({ y: y.slice(m), season: m, fixed });
    expect(maxRelDiff(fit.fitted, r.xhat)).toBeLessThan(TOL); // R 4.x stats::HoltWinters, computed in the test
    expect(maxRelDiff([fit.sse], r.sse)).toBeLessThan(TOL);
    expect(maxRelDiff(hwAdditive.forecast(fit, 24, [95]).mean, r.pred)).toBeLessThan(TOL);
  });
});
