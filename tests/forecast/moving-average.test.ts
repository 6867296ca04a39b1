import { describe, expect, it } from "vitest";
import movingAverage from "../../lib/forecast/methods/moving-average";
import weightedMovingAverage from "../../lib/forecast/methods/weighted-moving-average";
import { referenceCsv } from "../stats/reference-data";
import { expectClose, runR, rVector } from "../stats/rscript";

/** NIST e-Handbook §6.4.3.1 12-point series (tests/reference-data/nist_handbook_6431_ses12.csv). */
const SES12 = referenceCsv("nist_handbook_6431_ses12.csv").y;

describe("moving-average: docs/methods.md §4 trailing 3-point check values [COMPUTED-ONLY]", () => {
  it("forecasts for t = 4..13: 70, 69, 67, 65.666667, 67, 71.666667, 75, 76, 75, 73.333333; MSE 25.691358, MAE 3.962963", () => {
    const fit = movingAverage.fit({ y: SES12, season: 1, fixed: { window: 3 } });
    const f = movingAverage.forecast(fit, 1, [80]);
    const got = [...fit.fitted.slice(3), f.mean[0]];
    const expected = [70, 69, 67, 65.666667, 67, 71.666667, 75, 76, 75, 73.333333];
    got.forEach((v, i) => expect(v).toBeCloseTo(expected[i], 6));
    expect(fit.sigma2).toBeCloseTo(25.691358, 6); // one-step MSE over 9 errors
    const absErr = fit.residuals.slice(3).map(Math.abs);
    expect(absErr.reduce((a, b) => a + b, 0) / absErr.length).toBeCloseTo(3.962963, 6);
    expect(fit.parameters.window).toBe(3);
  });
});

describe("moving averages against R stats::filter() and a window search written in R", () => {
  for (const series of ["Nile", "WWWusage", "lynx"]) {
    it(`${series}: fitted values of both averages equal R filter(sides = 1) lagged one step, and the estimated windows equal R's arg-min of the in-sample MSE`, () => {
      const rows = runR(`y <- as.numeric(${series}); n <- length(y); K <- min(12, n - 2)
ma <- function(k, w) c(NA, head(as.numeric(stats::filter(y, w, sides = 1)), -1))
eq <- function(k) rep(1/k, k); lin <- function(k) (k:1) / (k * (k + 1) / 2)
mse <- function(w) { f <- ma(length(w), w); mean((y[(K + 1):n] - f[(K + 1):n])^2) }
kEq <- (2:K)[which.min(sapply(2:K, function(k) mse(eq(k))))]
kLin <- (2:K)[which.min(sapply(2:K, function(k) mse(lin(k))))]
out(y); out(c(kEq, kLin)); out(ma(kEq, eq(kEq))); out(ma(kLin, lin(kLin)))`);
      const [y, [kEq, kLin], fEq, fLin] = rows;
      const a = movingAverage.fit({ y, season: 1 });
      const b = weightedMovingAverage.fit({ y, season: 1 });
      expect(a.parameters.window).toBe(kEq);
      expect(b.parameters.window).toBe(kLin);
      expectClose(a.fitted, fEq, 1e-13, "moving-average fitted");
      expectClose(b.fitted, fLin, 1e-13, "weighted-moving-average fitted");
      // the forecast is the average of the last window, by the same filter
      expect(movingAverage.forecast(a, 1, [80]).mean[0]).toBeCloseTo(y.slice(-kEq).reduce((s, v) => s + v, 0) / kEq, 10);
    });
  }
});

describe("moving averages: interval variance (random walk calibrated to the one-step σ̂²)", () => {
  it("Var_h/Var_1 equals the exact random-walk ratio computed in R by a'Σa with Σ_ij = min(i, j)", () => {
    const y = [12, 15, 14, 18, 21, 19, 24, 26, 25, 29, 31, 30, 35];
    for (const [method, rWeights] of [
      [movingAverage, "rep(1/k, k)"],
      [weightedMovingAverage, "(1:k) / (k * (k + 1) / 2)"],
    ] as const) {
      for (const k of [2, 3, 5]) {
        const fit = method.fit({ y, season: 1, fixed: { window: k } });
        const f = method.forecast(fit, 6, [80]);
        const [ratios] = runR(`k <- ${k}; n <- 20; H <- 6; N <- n + H
S <- outer(1:N, 1:N, pmin); w <- ${rWeights}  # oldest first
v <- sapply(1:H, function(h) { a <- numeric(N); a[n + h] <- 1; a[(n - k + 1):n] <- a[(n - k + 1):n] - w; drop(t(a) %*% S %*% a) })
out(v / v[1])`);
        expectClose(
          f.sd.map((s) => (s * s) / fit.sigma2),
          ratios,
          1e-12,
          `${method.id} k=${k}`,
        );
      }
    }
  });

  it("with window 1 the moving average is the naive method, intervals included (R naive())", () => {
    const rows = runR(`suppressPackageStartupMessages(library(forecast)); y <- Nile; fc <- naive(y, h = 8, level = c(80, 95))
out(y); out(fc$lower[, 1]); out(fc$upper[, 2])`);
    const [y, l80, u95] = rows;
    const f = movingAverage.forecast(movingAverage.fit({ y, season: 1, fixed: { window: 1 } }), 8, [80, 95]);
    expectClose(f.lower["80"], l80, 1e-12, "lower 80");
    expectClose(f.upper["95"], u95, 1e-12, "upper 95");
  });
});

describe("moving averages: policy", () => {
  it("errors: too short, window not a whole number, window too long for the data", () => {
    expect(() => movingAverage.fit({ y: [1, 2, 3], season: 1 })).toThrow(/at least 4 observations/);
    expect(() => movingAverage.fit({ y: [1, 2, 3, 4], season: 1, fixed: { window: 2.5 } })).toThrow(/whole number/);
    expect(() => weightedMovingAverage.fit({ y: [1, 2, 3, 4], season: 1, fixed: { window: 4 } })).toThrow(/at least 5/);
    expect(() => movingAverage.fit({ y: [1, 2, Infinity, 4, 5], season: 1 })).toThrow(/observation 3/);
  });
  it("weights: latest value gets k/(k(k+1)/2): for window 3 on 1, 2, 3 the forecast is (3·3 + 2·2 + 1)/6", () => {
    const f = weightedMovingAverage.forecast(weightedMovingAverage.fit({ y: [9, 1, 2, 3], season: 1, fixed: { window: 3 } }), 2, [80]);
    expect(f.mean[0]).toBeCloseTo(14 / 6, 14);
    expect(f.mean[1]).toBeCloseTo(14 / 6, 14);
  });
});
