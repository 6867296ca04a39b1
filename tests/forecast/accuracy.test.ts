import { describe, expect, it } from "vitest";
import {
  accuracy,
  maseDenominator,
  meanAbsoluteError,
  meanAbsolutePercentageError,
  meanAbsoluteScaledError,
  meanError,
  rootMeanSquaredError,
  symmetricMape,
  trackingSignal,
  trackingSignalSeries,
  relativeTrackingSignalSeries,
} from "../../lib/forecast/accuracy";
import { referenceCsv } from "../stats/reference-data";
import { expectClose, runR, rVector } from "../stats/rscript";

/** NIST e-Handbook §6.4.3.1 12-point series (reference-data/nist_handbook_6431_ses12.csv). */
const NIST12 = referenceCsv("nist_handbook_6431_ses12.csv");
const SES12: readonly number[] = NIST12.y;
/** Quarterly sales, 24 values (reference-data/quarterly_sales24.csv). */
const QS = referenceCsv("quarterly_sales24.csv");
const QUARTERLY: readonly number[] = QS.y;

describe("accuracy: docs/methods.md §4 check values [COMPUTED-ONLY, R forecast 8.20 accuracy() agrees with a hand calculation]", () => {
  it("data files read as expected", () => {
    expect(SES12).toEqual([71, 70, 69, 68, 64, 65, 72, 78, 75, 75, 75, 70]);
    expect(QUARTERLY.length).toBe(24);
    expect(QUARTERLY[0]).toBe(362);
  });

  it("naive on the NIST 12-point series, test 73, 74, 69: MASE 88/87, ME 2, RMSE 2.943920289, MPE 2.688573028, MAPE 3.654756603", () => {
    const test = [73, 74, 69];
    const fc = [70, 70, 70];
    expect(maseDenominator(SES12)).toBeCloseTo(29 / 11, 14); // scale = 29/11
    const a = accuracy(test, fc, { training: SES12, season: 1 });
    expect(a.mase).toBeCloseTo(88 / 87, 14);
    expect(a.me).toBeCloseTo(2, 14);
    expect(a.mae).toBeCloseTo(8 / 3, 14);
    expect(a.rmse).toBeCloseTo(2.943920289, 9);
    expect(a.mpe).toBeCloseTo(2.688573028, 9);
    expect(a.mape).toBeCloseTo(3.654756603, 9);
  });

  it("in-sample naive on the same series: ME −0.090909, RMSE 3.554766, MAE 2.636364, MASE 1", () => {
    const a = accuracy(SES12.slice(1), SES12.slice(0, -1), { training: SES12 });
    expect(a.me).toBeCloseTo(-0.090909, 6);
    expect(a.rmse).toBeCloseTo(3.554766, 6);
    expect(a.mae).toBeCloseTo(2.636364, 6);
    expect(a.mase).toBeCloseTo(1, 14);
  });

  it("seasonal: quarterly years 1–5 train, seasonal naive for year 6: scale 73.75, MASE 0.5728813559, ME 41.75, RMSE 53.96063380, MAPE 5.641438742", () => {
    const train = QUARTERLY.slice(0, 20);
    const test = QUARTERLY.slice(20);
    const fc = [628, 707, 773, 592];
    expect(maseDenominator(train, 4)).toBeCloseTo(73.75, 12);
    const a = accuracy(test, fc, { training: train, season: 4 });
    expect(a.mae).toBeCloseTo(42.25, 12);
    expect(a.mase).toBeCloseTo(0.5728813559, 10);
    expect(a.me).toBeCloseTo(41.75, 12);
    expect(a.rmse).toBeCloseTo(53.9606338, 8);
    expect(a.mape).toBeCloseTo(5.641438742, 9);
    // mean forecast on the same split: MAE 201.65, MASE 2.734237288
    const m = train.reduce((s, v) => s + v, 0) / train.length;
    expect(meanAbsoluteError(test, [m, m, m, m])).toBeCloseTo(201.65, 10);
    expect(meanAbsoluteScaledError(test, [m, m, m, m], train, 4)).toBeCloseTo(2.734237288, 9);
  });

  it("MAPE/sMAPE example y = 100, 200, 50; ŷ = 110, 190, 60: MAE 10, RMSE 10, MAPE 11.6666667, sMAPE 10.9446109", () => {
    const y = [100, 200, 50];
    const f = [110, 190, 60];
    expect(meanAbsoluteError(y, f)).toBeCloseTo(10, 14);
    expect(rootMeanSquaredError(y, f)).toBeCloseTo(10, 14);
    expect(meanAbsolutePercentageError(y, f)).toBeCloseTo(11.6666667, 7);
    expect(symmetricMape(y, f)).toBeCloseTo(10.9446109, 7);
  });
});

describe("tracking signal: docs/methods.md §8 check values [COMPUTED-ONLY; definition SOURCE via Wikipedia copy]", () => {
  const actual = [100, 105, 98, 110, 112, 115, 120];
  const fc = [102, 100, 100, 104, 106, 108, 110];
  it("TS series −1, 0.8571429, 0.3333333, 1.8666667, 3.0952381, 4.2857143, 5.5263158", () => {
    const ts = trackingSignalSeries(actual, fc);
    const expected = [-1, 0.8571429, 0.3333333, 1.8666667, 3.0952381, 4.2857143, 5.5263158];
    ts.forEach((v, i) => expect(v).toBeCloseTo(expected[i], 7));
    expect(trackingSignal(actual, fc)).toBeCloseTo(5.5263158, 7);
    // first breach of +4 at period 6 (the ±4 limit is common practice, no authoritative source)
    expect(ts.findIndex((v) => Math.abs(v) > 4) + 1).toBe(6);
    expect(meanError(actual, fc)).toBeCloseTo(30 / 7, 14); // CFE 30 over 7 periods
  });
  it("is NaN while every error so far is zero (errors 0, 0, 1: CFE 1 / MAD 1/3 = 3)", () => {
    expect(trackingSignalSeries([1, 2, 3], [1, 2, 2])).toEqual([NaN, NaN, 3]);
  });
  it("on relative errors it can differ in sign from raw errors (docs/methods.md §8, hand computation)", () => {
    // Actuals 100, 100, 10 000; forecasts 90, 90, 10 500. Raw errors 10, 10, −500:
    // TS_3 = −480 / (520/3) = −2.7692308. Relative errors 0.1, 0.1, −0.05: TS_3 = 0.15 / (0.25/3) = 1.8.
    const a = [100, 100, 10000];
    const f = [90, 90, 10500];
    expect(trackingSignalSeries(a, f)[2]).toBeCloseTo(-480 / (520 / 3), 12);
    const rel = relativeTrackingSignalSeries(a, f);
    expect(rel[0]).toBeCloseTo(1, 12);
    expect(rel[1]).toBeCloseTo(2, 12);
    expect(rel[2]).toBeCloseTo(1.8, 12);
    // An actual of 0 has no relative error: NaN there, left out of the sums (0.1, —, −0.05 → 0.05/0.075).
    const z = relativeTrackingSignalSeries([100, 0, 1000], [90, 5, 1050]);
    expect(z[1]).toBeNaN();
    expect(z[2]).toBeCloseTo(0.05 / 0.075, 12);
    expect(() => relativeTrackingSignalSeries([1], [NaN])).toThrow(RangeError);
  });
});

describe("accuracy against R forecast::accuracy() run now via Rscript", () => {
  const cases = [
    { name: "Nile, naive, last 10 held out", series: "Nile", h: 10, model: "naive" },
    { name: "AirPassengers, snaive, last 24 held out", series: "AirPassengers", h: 24, model: "snaive" },
    { name: "WWWusage, rwf drift, last 15 held out", series: "WWWusage", h: 15, model: "rwf(train, h = h, drift = TRUE)" },
    { name: "co2, snaive, last 36 held out", series: "co2", h: 36, model: "snaive" },
  ];
  for (const c of cases) {
    it(`${c.name}: ME, RMSE, MAE, MPE, MAPE, MASE (test and training rows)`, () => {
      const call = c.model.includes("(") ? c.model : `${c.model}(train, h = h)`;
      const rows = runR(`suppressPackageStartupMessages(library(forecast))
y <- ${c.series}; h <- ${c.h}; n <- length(y)
train <- window(y, end = time(y)[n - h]); test <- window(y, start = time(y)[n - h + 1])
fc <- ${call}
out(train); out(test); out(fc$mean); out(fitted(fc)); out(frequency(y))
a <- accuracy(fc, test)
out(a["Test set", c("ME", "RMSE", "MAE", "MPE", "MAPE", "MASE")])
out(a["Training set", c("ME", "RMSE", "MAE", "MPE", "MAPE", "MASE")])`);
      const [train, test, mean, fitted, [m]] = rows;
      const [testRow, trainRow] = [rows[5], rows[6]];
      const a = accuracy(test, mean, { training: train, season: m });
      expectClose([a.me, a.rmse, a.mae, a.mpe, a.mape, a.mase], testRow, 1e-12, "test set");
      const ok = fitted.map((f) => Number.isFinite(f));
      const b = accuracy(
        train.filter((_, i) => ok[i]),
        fitted.filter((_, i) => ok[i]),
        { training: train, season: m },
      );
      // drift makes the in-sample ME zero up to rounding: compare it absolutely there
      expectClose([b.me, b.rmse, b.mae, b.mpe, b.mape, b.mase], trainRow, 1e-12, "training set", 1e-12);
    });
  }

  it("sMAPE equals R mean(200*abs(y - f)/(abs(y) + abs(f))) (formula evaluated in R)", () => {
    const y = [362, 385, 432, 341, 0, -5];
    const f = [370, 380, 450, 300, 0, 5];
    const [[r]] = runR(`y <- ${rVector(y)}; f <- ${rVector(f)}; d <- abs(y) + abs(f); out(mean(ifelse(d == 0, 0, 200*abs(y - f)/d)))`);
    expect(Math.abs(symmetricMape(y, f) - r) / r).toBeLessThan(1e-14);
  });
});

describe("accuracy: policy", () => {
  it("empty, unequal lengths and non-finite values throw RangeError naming the problem", () => {
    expect(() => accuracy([], [])).toThrow(RangeError);
    expect(() => accuracy([1, 2], [1])).toThrow(/pair up/);
    expect(() => meanAbsoluteError([1, NaN], [1, 2])).toThrow(/actual\[1\]/);
    expect(() => meanAbsoluteError([1, 2], [1, Infinity])).toThrow(/forecast\[1\]/);
  });
  it("undefined measures are NaN: MAPE with a zero actual, MASE on a constant training series or without one", () => {
    expect(meanAbsolutePercentageError([0, 1], [1, 1])).toBeNaN();
    expect(meanAbsoluteScaledError([1], [2], [5, 5, 5])).toBeNaN();
    expect(meanAbsoluteScaledError([1], [2], [5], 1)).toBeNaN();
    expect(accuracy([1], [2]).mase).toBeNaN();
    expect(symmetricMape([0], [0])).toBe(0);
  });
  it("a season that is not a positive integer throws", () => {
    expect(() => maseDenominator([1, 2, 3], 0)).toThrow(RangeError);
    expect(() => maseDenominator([1, 2, 3], 1.5)).toThrow(RangeError);
  });
});
