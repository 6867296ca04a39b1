import { describe, expect, it } from "vitest";
import naive from "../../lib/forecast/methods/naive";
import seasonalNaive from "../../lib/forecast/methods/seasonal-naive";
import drift from "../../lib/forecast/methods/drift";
import linearTrend from "../../lib/forecast/methods/linear-trend";
import type { Method } from "../../lib/forecast/types";
import { ForecastInputError } from "../../lib/forecast/types";
import { expectClose, runRBatch } from "../stats/rscript";

/**
 * Each case runs R's forecast 8.20 on a built-in series and compares means, 80% and 95%
 * bounds and fitted values with ours at the same horizon.
 */
interface Case {
  readonly method: Method;
  readonly r: string; // R call producing a forecast object `fc` from `y`, `h`
  readonly series: string;
  readonly h: number;
}

const CASES: readonly Case[] = [
  { method: naive, r: "naive(y, h = h, level = c(80, 95))", series: "Nile", h: 10 },
  { method: naive, r: "naive(y, h = h, level = c(80, 95))", series: "AirPassengers", h: 24 },
  { method: seasonalNaive, r: "snaive(y, h = h, level = c(80, 95))", series: "AirPassengers", h: 30 },
  { method: seasonalNaive, r: "snaive(y, h = h, level = c(80, 95))", series: "JohnsonJohnson", h: 9 },
  { method: seasonalNaive, r: "snaive(y, h = h, level = c(80, 95))", series: "co2", h: 25 },
  { method: drift, r: "rwf(y, h = h, drift = TRUE, level = c(80, 95))", series: "Nile", h: 12 },
  { method: drift, r: "rwf(y, h = h, drift = TRUE, level = c(80, 95))", series: "WWWusage", h: 20 },
  { method: drift, r: "rwf(y, h = h, drift = TRUE, level = c(80, 95))", series: "AirPassengers", h: 36 },
  { method: linearTrend, r: "forecast(tslm(y ~ trend), h = h, level = c(80, 95))", series: "Nile", h: 10 },
  { method: linearTrend, r: "forecast(tslm(y ~ trend), h = h, level = c(80, 95))", series: "AirPassengers", h: 24 },
  { method: linearTrend, r: "forecast(tslm(y ~ trend), h = h, level = c(80, 95))", series: "lynx", h: 15 },
];

/** Every R reference of this file, computed in one R session (the R calls named in each test). */
const R = runRBatch<string>({
  ...Object.fromEntries(
    CASES.map((c, i) => [
      `case${i}`,
      `suppressPackageStartupMessages(library(forecast))
y <- ${c.series}; h <- ${c.h}; fc <- ${c.r}
out(y); out(frequency(y)); out(fc$mean); out(fc$lower[, 1]); out(fc$lower[, 2]); out(fc$upper[, 1]); out(fc$upper[, 2]); out(fitted(fc))`,
    ]),
  ),
  fixedSlope: `y <- as.numeric(Nile); n <- length(y); t <- 1:n; b <- -2.5; h <- 5
f <- lm(I(y - b * t) ~ 1); p <- predict(f, data.frame(row = 1:h), interval = "prediction", level = 0.95)
out(y); out(coef(f)); out(p[, "fit"] + b * (n + 1:h)); out(p[, "lwr"] + b * (n + 1:h)); out(p[, "upr"] + b * (n + 1:h))`,
  bothFixed: `y <- as.numeric(WWWusage); n <- length(y); t <- 1:n; a <- 100; b <- 0.8
e <- y - a - b * t; s <- sqrt(sum(e^2) / n); m <- a + b * (n + 1:3)
out(y); out(m - qt(0.9, n) * s); out(m + qt(0.975, n) * s)`,
});

describe("simple methods against R forecast 8.20 run now via Rscript", () => {
  for (const [i, c] of CASES.entries()) {
    it(`${c.method.id} on ${c.series}, h = ${c.h}: mean, 80%/95% bounds and fitted values equal R's ${c.r.split("(")[0]}()`, () => {
      const rows = R[`case${i}`];
      const [y, [m], mean, l80, l95, u80, u95, fitted] = rows;
      const fit = c.method.fit({ y, season: m });
      const f = c.method.forecast(fit, c.h, [80, 95]);
      expectClose(f.mean, mean, 1e-13, "mean");
      expectClose(f.lower["80"], l80, 1e-12, "lower 80");
      expectClose(f.lower["95"], l95, 1e-12, "lower 95");
      expectClose(f.upper["80"], u80, 1e-12, "upper 80");
      expectClose(f.upper["95"], u95, 1e-12, "upper 95");
      expectClose(fit.fitted, fitted, 1e-12, "fitted");
      expect(f.method).toBe(c.method.id);
    });
  }
});

describe("simple methods: FPP §5.5 interval formulas at a glance (hand-checkable)", () => {
  it("naive on 1, 2, 4, 7: σ̂² = mean(1, 4, 9) = 14/3; sd_h = σ̂√h", () => {
    const fit = naive.fit({ y: [1, 2, 4, 7], season: 1 });
    expect(fit.sigma2).toBeCloseTo(14 / 3, 14);
    const f = naive.forecast(fit, 4, [95]);
    f.sd.forEach((s, i) => expect(s).toBeCloseTo(Math.sqrt((14 / 3) * (i + 1)), 13));
    expect(f.mean).toEqual([7, 7, 7, 7]);
  });
  it("drift on 1, 2, 4, 7: b = 2; residuals −1, 0, 1; σ̂² = 2/(3 − 1) = 1; sd_h = √(h + h²/3)", () => {
    const fit = drift.fit({ y: [1, 2, 4, 7], season: 1 });
    expect(fit.parameters.drift).toBe(2);
    expect(fit.sigma2).toBeCloseTo(1, 14);
    const f = drift.forecast(fit, 3, [80]);
    f.sd.forEach((s, i) => expect(s).toBeCloseTo(Math.sqrt(i + 1 + (i + 1) ** 2 / 3), 13));
    expect(f.mean).toEqual([9, 11, 13]);
  });
});

describe("simple methods: input policy", () => {
  it("too short, non-finite values, bad season, bad horizon or level throw ForecastInputError with a reason", () => {
    expect(() => naive.fit({ y: [1], season: 1 })).toThrow(/naive needs at least 2 observations/);
    expect(() => drift.fit({ y: [1, 2], season: 1 })).toThrow(ForecastInputError);
    expect(() => naive.fit({ y: [1, NaN, 3], season: 1 })).toThrow(/observation 2/);
    expect(() => seasonalNaive.fit({ y: [1, 2, 3, 4, 5], season: 1 })).toThrow(/season length of at least 2/);
    expect(() => seasonalNaive.fit({ y: [1, 2, 3, 4], season: 4 })).toThrow(/at least 5 observations/);
    const fit = naive.fit({ y: [1, 2, 3], season: 1 });
    expect(() => naive.forecast(fit, 0, [80])).toThrow(/horizon/);
    expect(() => naive.forecast(fit, 2.5, [80])).toThrow(/horizon/);
    expect(() => naive.forecast(fit, 1e6, [80])).toThrow(/beyond/);
    expect(() => naive.forecast(fit, 3, [100])).toThrow(/levels/);
  });
  it("applicable(): seasonal naive only with a season ≥ 2 and more than one season of data", () => {
    expect(seasonalNaive.applicable([1, 2, 3, 4, 5], 4, false)).toBe(true);
    expect(seasonalNaive.applicable([1, 2, 3, 4], 4, false)).toBe(false);
    expect(seasonalNaive.applicable([1, 2, 3, 4, 5], 1, false)).toBe(false);
    expect(linearTrend.applicable([1, 2], 1, false)).toBe(false);
  });
  it("a constant series: naive intervals collapse to the value (σ̂ = 0), linear trend has slope 0", () => {
    const f = naive.forecast(naive.fit({ y: [5, 5, 5, 5], season: 1 }), 2, [95]);
    expect(f.lower["95"]).toEqual([5, 5]);
    const lt = linearTrend.fit({ y: [5, 5, 5, 5], season: 1 });
    expect(lt.parameters.slope).toBeCloseTo(0, 14);
  });
});

describe("linear-trend with fixed coefficients (estimated unless given)", () => {
  it("fixed slope: intercept estimated on y − slope·t; intervals as R lm(I(y − b·t) ~ 1) + predict.lm", () => {
    const rows = R.fixedSlope; // R lm() + predict.lm, above
    const [y, [a], mean, lwr, upr] = rows;
    const fit = linearTrend.fit({ y, season: 1, fixed: { slope: -2.5 } });
    expect(fit.parameters.slope).toBe(-2.5);
    expect(Math.abs(fit.parameters.intercept - a) / Math.abs(a)).toBeLessThan(1e-13);
    const f = linearTrend.forecast(fit, 5, [95]);
    expectClose(f.mean, mean, 1e-13, "mean");
    expectClose(f.lower["95"], lwr, 1e-12, "lower 95");
    expectClose(f.upper["95"], upr, 1e-12, "upper 95");
  });
  it("both fixed (coefficients known): s² = SSE/n, bounds ŷ ± t_n·s (computed in R)", () => {
    const rows = R.bothFixed; // R qt(), above
    const [y, l80, u95] = rows;
    const fit = linearTrend.fit({ y, season: 1, fixed: { intercept: 100, slope: 0.8 } });
    const f = linearTrend.forecast(fit, 3, [80, 95]);
    expectClose(f.lower["80"], l80, 1e-12, "lower 80");
    expectClose(f.upper["95"], u95, 1e-12, "upper 95");
    expect(fit.notes.join(" ")).toMatch(/held fixed: intercept, slope/);
  });
  it("a non-finite fixed value is refused", () => {
    expect(() => linearTrend.fit({ y: [1, 2, 3, 5], season: 1, fixed: { slope: NaN } })).toThrow(/fixed slope must be a finite number/);
  });
});
