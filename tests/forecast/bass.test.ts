/**
 * The Bass diffusion model (lib/forecast/bass.ts, docs/methods.md §19).
 *
 * References, each computed in the test or by hand:
 * - F(t) = (1 − e^{−(p+q)t}) / (1 + (q/p)e^{−(p+q)t}) (Bass 1969): values evaluated by R from the
 *   formula, and the special case q = 0, where F(t) = 1 − e^{−pt} (hand computation: with no
 *   imitation the model is the exponential adoption curve).
 * - Peak t* = ln(q/p)/(p + q) (Bass 1969), by hand.
 * - Fitted p, q, m, their standard errors and the SSE against R's `nls` (stats, Debian
 *   r-base-core, algorithm "port" with p, q, m kept positive) on the discrete form m·(F(t) − F(t−1)) (Srinivasan & Mason 1986), run live on
 *   (a) a series R simulates from a Bass curve with normal noise (set.seed, so the data come from R),
 *   (b) the year-on-year increases of M3 series N0115 (M3 competition, Makridakis & Hibon 2000,
 *   IJF 16(4); yearly, micro; as distributed in R's Mcomp data), an open series.
 * - Forecast intervals against R: the delta-method variance gᵀCg from R's `vcov(nls)` and a
 *   numerical gradient (numDeriv-free: central differences in R), plus s², with Student's t.
 */
import { describe, expect, it } from "vitest";
import { bassAdoptions, bassForecastSum, bassPeak, bassShare, fitBass } from "../../lib/forecast/bass";
import { baseline } from "../../lib/forecast/baseline";
import { rEval, rVector } from "../helpers/r";

const N0115 = [13.0, 32.06, 89.72, 128.1, 110.7, 154.94, 195.16, 183.56, 181.32, 187.54, 266.64, 199.48, 498.84, 1179.28, 640.4, 421.56, 506.78, 722.78, 543.46];

const R_BASS = `Fb <- function(t, p, q) (1 - exp(-(p + q) * t)) / (1 + (q / p) * exp(-(p + q) * t))
fitb <- function(y) {
  t <- seq_along(y)
  f <- nls(y ~ m * (Fb(t, p, q) - Fb(t - 1, p, q)), start = list(p = 0.03, q = 0.38, m = 1.1 * sum(y)),
    algorithm = "port", lower = c(1e-9, 0, 1), control = list(maxiter = 1000, eval.max = 5000))
  f
}
report <- function(name, f, y, periods) {
  out(paste0(name, ".est"), coef(f)); out(paste0(name, ".se"), sqrt(diag(vcov(f)))); out(paste0(name, ".sse"), deviance(f))
  cf <- coef(f); g <- function(th) sum(th[3] * (Fb(periods, th[1], th[2]) - Fb(periods - 1, th[1], th[2])))
  grad <- sapply(1:3, function(i) { d <- rep(0, 3); d[i] <- 1e-6 * abs(cf[i]); (g(cf + d) - g(cf - d)) / (2 * d[i]) })
  s2 <- deviance(f) / (length(y) - 3)
  v <- length(periods) * s2 + as.numeric(t(grad) %*% vcov(f) %*% grad)
  out(paste0(name, ".sum"), g(cf)); out(paste0(name, ".upper80"), g(cf) + qt(0.9, length(y) - 3) * sqrt(v))
}
`;

describe("Bass curve", () => {
  it("F(t) matches R's evaluation of the closed form, and 1 − e^{−pt} when q = 0", () => {
    const r = rEval(`Fb <- function(t, p, q) (1 - exp(-(p + q) * t)) / (1 + (q / p) * exp(-(p + q) * t))
      out("F", Fb(c(0, 1, 2.5, 10, 40), 0.03, 0.38))`, { withForecast: false });
    [0, 1, 2.5, 10, 40].forEach((t, i) => expect(bassShare(t, 0.03, 0.38)).toBeCloseTo(r.F[i], 14));
    // q = 0: hand computation 1 − e^{−0.05·4} = 1 − e^{−0.2} = 0.18126924692201818
    expect(bassShare(4, 0.05, 0)).toBeCloseTo(0.18126924692201818, 14);
  });

  it("peak period ln(q/p)/(p+q) and adoptions that add up to m·F(n)", () => {
    // hand: ln(0.38/0.03)/0.41 = ln(12.6667)/0.41 = 2.538974/0.41 = 6.192620
    expect(bassPeak(0.03, 0.38)).toBeCloseTo(Math.log(0.38 / 0.03) / 0.41, 14);
    expect(bassPeak(0.03, 0.38)).toBeCloseTo(6.19262, 4);
    expect(bassPeak(0.3, 0.1)).toBe(0);
    const a = bassAdoptions({ p: 0.03, q: 0.38, m: 1000 }, 1, 10);
    expect(a.reduce((s, v) => s + v, 0)).toBeCloseTo(1000 * bassShare(10, 0.03, 0.38), 9);
  });

  it("rejects bad parameters and histories with a message", () => {
    expect(() => bassShare(1, 0, 0.3)).toThrow(/p must be a positive/);
    expect(() => bassShare(-1, 0.03, 0.3)).toThrow(/t must be/);
    expect(() => fitBass([1, 2, 3])).toThrow(/at least 5/);
    expect(() => fitBass([1, 2, -3, 4, 5])).toThrow(/non-negative/);
    expect(() => fitBass([0, 0, 0, 0, 0])).toThrow(/add up to zero/);
    expect(() => fitBass([1, 2, NaN, 4, 5])).toThrow(/non-negative numbers/);
  });
});

describe("Bass fit against R nls", () => {
  const r = rEval(`${R_BASS}
    set.seed(11); sim <- round(5000 * (Fb(1:14, 0.02, 0.45) - Fb(0:13, 0.02, 0.45)) + rnorm(14, 0, 20), 2)
    out("sim", sim)
    report("sim", fitb(sim), sim, 15:18)
    y <- ${rVector(N0115)}
    report("m3", fitb(y), y, 20:22)`, { withForecast: false });

  for (const [name, y, periods] of [
    ["simulated Bass series (R, set.seed(11))", () => r.sim, [15, 16, 17, 18]],
    ["M3 N0115 increases", () => N0115, [20, 21, 22]],
  ] as const) {
    it(`${name}: p, q, m, standard errors and SSE as R's nls`, () => {
      const key = name.startsWith("M3") ? "m3" : "sim";
      const f = fitBass(y());
      const [p, q, m] = r[`${key}.est`];
      // R's port algorithm stops at its relative-convergence test (objective to ~1e-10), so the
      // estimates agree to about 1e-5 and the SSE (flat at the optimum) much more closely.
      const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);
      expect(rel(f.p, p)).toBeLessThan(1e-4);
      expect(rel(f.q, q)).toBeLessThan(1e-4);
      expect(rel(f.m, m)).toBeLessThan(1e-4);
      expect(f.sse).toBeLessThanOrEqual(r[`${key}.sse`][0] * (1 + 1e-9));
      expect(rel(f.sse, r[`${key}.sse`][0])).toBeLessThan(1e-8);
      const [sp, sq, sm] = r[`${key}.se`];
      expect(rel(f.se.p, sp)).toBeLessThan(1e-3);
      expect(rel(f.se.q, sq)).toBeLessThan(1e-3);
      expect(rel(f.se.m, sm)).toBeLessThan(1e-3);
      const s = bassForecastSum(f, periods, [80]);
      expect(rel(s.mean, r[`${key}.sum`][0])).toBeLessThan(1e-4);
      expect(rel(s.upper["80"], r[`${key}.upper80`][0])).toBeLessThan(1e-3);
    });
  }

  it("the baseline method continues the curve, and its total is the sum with one interval", () => {
    const res = baseline(r.sim, { method: "bass", horizon: 4, total: true });
    const direct = bassForecastSum(fitBass(r.sim), [15, 16, 17, 18], [80, 95]);
    expect(res.total!.mean).toBeCloseTo(direct.mean, 8);
    expect(res.total!.upper["95"]).toBeCloseTo(direct.upper["95"], 8);
    expect(res.method).toBe("bass");
    res.forecast.forEach((s) => {
      expect(s.lower["80"]!).toBeLessThanOrEqual(s.mean!);
      expect(s.mean!).toBeLessThanOrEqual(s.upper["80"]!);
    });
  });

  it("warns when the fit saw fewer than about 6 periods before its peak (common practice)", () => {
    const early = bassAdoptions({ p: 0.01, q: 0.5, m: 10000 }, 1, 6).map((v, i) => v * (1 + 0.02 * (i % 2 ? 1 : -1)));
    const notes = fitBass(early).notes.join(" ");
    expect(notes).toMatch(/ends before the fitted peak/);
    const five = bassAdoptions({ p: 0.01, q: 0.5, m: 10000 }, 1, 12).map((v, i) => v * (1 + 0.02 * (i % 2 ? 1 : -1)));
    // peak ln(50)/0.51 = 7.67 by hand: 7 periods before it, so no caution; 5 of them would give one
    expect(fitBass(five).notes.join(" ")).not.toMatch(/before the fitted peak/);
    // peak ln(0.6/0.03)/0.63 = 4.755 by hand: 4 periods before it, fewer than 6
    const fast = bassAdoptions({ p: 0.03, q: 0.6, m: 10000 }, 1, 12).map((v, i) => v * (1 + 0.02 * (i % 2 ? 1 : -1)));
    expect(fitBass(fast).notes.join(" ")).toMatch(/4 periods before the fitted peak/);
  });
});
