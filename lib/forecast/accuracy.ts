/**
 * Forecast accuracy measures (pure TypeScript; imports only lib/stats).
 *
 * Conventions, as Hyndman & Koehler (2006) and R's `forecast::accuracy()`:
 * the error is e_t = actual_t − forecast_t (so a positive mean error means forecasts were too
 * low), percentages are in percent (×100).
 *
 * Policy (the same as lib/stats, see lib/stats/index.ts): `actual` and `forecast` must be
 * non-empty, of equal length and finite, else a `RangeError` naming the array and index.
 * A measure that is undefined for valid input is NaN and says so in its doc comment
 * (MAPE with a zero actual, MASE with a constant training series, sMAPE with a zero
 * denominator).
 *
 * Sources: R. J. Hyndman and A. B. Koehler (2006), "Another look at measures of forecast
 * accuracy", International Journal of Forecasting 22(4), 679–688; R. J. Hyndman and
 * G. Athanasopoulos, Forecasting: Principles and Practice, §2.5 / §5.8 (sMAPE, MASE);
 * tracking signal as defined in docs/methods.md §8 (cumulative error over the running MAD, on raw
 * or relative errors).
 */
import { neumaierSum, RunningSum } from "../stats/sum";
import { assertFinitePairs } from "../stats/validate";

function check(actual: readonly number[], forecast: readonly number[], fn: string): void {
  assertFinitePairs(actual, forecast, fn, "actual", "forecast");
}

function meanOf(values: readonly number[]): number {
  return neumaierSum(values) / values.length;
}

function errors(actual: readonly number[], forecast: readonly number[]): number[] {
  return actual.map((a, i) => a - forecast[i]);
}

/**
 * Mean error (bias), ME = mean(actual − forecast). Positive: forecasts too low on average.
 * @throws RangeError for empty, unequal-length or non-finite input.
 * @example meanError([10, 12], [9, 9]) // 2
 */
export function meanError(actual: readonly number[], forecast: readonly number[]): number {
  check(actual, forecast, "meanError");
  return meanOf(errors(actual, forecast));
}

/**
 * Mean absolute error, MAE = mean|actual − forecast| (MAD in operations texts).
 * @throws RangeError for empty, unequal-length or non-finite input.
 */
export function meanAbsoluteError(actual: readonly number[], forecast: readonly number[]): number {
  check(actual, forecast, "meanAbsoluteError");
  return meanOf(errors(actual, forecast).map(Math.abs));
}

/**
 * Mean squared error, MSE = mean((actual − forecast)²).
 * @throws RangeError for empty, unequal-length or non-finite input.
 */
export function meanSquaredError(actual: readonly number[], forecast: readonly number[]): number {
  check(actual, forecast, "meanSquaredError");
  return meanOf(errors(actual, forecast).map((e) => e * e));
}

/**
 * Root mean squared error, RMSE = √MSE.
 * @throws RangeError for empty, unequal-length or non-finite input.
 */
export function rootMeanSquaredError(actual: readonly number[], forecast: readonly number[]): number {
  check(actual, forecast, "rootMeanSquaredError");
  return Math.sqrt(meanOf(errors(actual, forecast).map((e) => e * e)));
}

/**
 * Mean percentage error, MPE = mean(100·(actual − forecast)/actual), as R's `accuracy()`.
 * NaN when any actual is 0 (undefined).
 * @throws RangeError for empty, unequal-length or non-finite input.
 */
export function meanPercentageError(actual: readonly number[], forecast: readonly number[]): number {
  check(actual, forecast, "meanPercentageError");
  if (actual.some((a) => a === 0)) return NaN;
  return meanOf(actual.map((a, i) => (100 * (a - forecast[i])) / a));
}

/**
 * Mean absolute percentage error, MAPE = mean|100·(actual − forecast)/actual|
 * (Hyndman & Koehler 2006 §2; R's `accuracy()`). NaN when any actual is 0 (undefined; R
 * would give Inf or NaN). Meaningful only for quantities on a ratio scale with a true zero.
 * @throws RangeError for empty, unequal-length or non-finite input.
 * @example meanAbsolutePercentageError([100, 200, 50], [110, 190, 60]) // 11.666666666666666
 */
export function meanAbsolutePercentageError(actual: readonly number[], forecast: readonly number[]): number {
  check(actual, forecast, "meanAbsolutePercentageError");
  if (actual.some((a) => a === 0)) return NaN;
  return meanOf(actual.map((a, i) => Math.abs((100 * (a - forecast[i])) / a)));
}

/**
 * Symmetric MAPE, sMAPE = mean(200·|actual − forecast| / (|actual| + |forecast|)).
 *
 * Source: the M3-competition form credited to Armstrong (1985, p. 348), as in FPP §2.5 and
 * Hyndman & Koehler (2006) §2. FPP writes the denominator y + ŷ; this uses |y| + |ŷ|, which
 * is identical for non-negative data and stays within [0, 200] when a value is negative.
 * A pair with actual = forecast = 0 contributes 0 (no error); the result is never NaN.
 * @throws RangeError for empty, unequal-length or non-finite input.
 * @example symmetricMape([100, 200, 50], [110, 190, 60]) // 10.944610885...
 */
export function symmetricMape(actual: readonly number[], forecast: readonly number[]): number {
  check(actual, forecast, "symmetricMape");
  return meanOf(
    actual.map((a, i) => {
      const den = Math.abs(a) + Math.abs(forecast[i]);
      return den === 0 ? 0 : (200 * Math.abs(a - forecast[i])) / den;
    }),
  );
}

/**
 * Scale of MASE: the in-sample MAE of the one-step naive forecast (season 1) or of the
 * seasonal naive forecast (season m > 1) on the training series,
 * (1/(T − m))·Σ_{t=m+1..T} |y_t − y_{t−m}| (Hyndman & Koehler 2006, eq. for q_t; as R's
 * `accuracy()`, which uses lag m when the series is seasonal).
 *
 * Returns NaN when the training series has no more than m values, and 0 when it is constant
 * at lag m (MASE is then undefined).
 * @throws RangeError for a non-finite training value or a season that is not a positive integer.
 */
export function maseDenominator(training: readonly number[], season = 1): number {
  if (!Number.isInteger(season) || season < 1) {
    throw new RangeError(`maseDenominator: season must be a positive integer, got ${season}`);
  }
  training.forEach((v, i) => {
    if (!Number.isFinite(v)) throw new RangeError(`maseDenominator: training[${i}] is ${v}; values must be finite`);
  });
  if (training.length <= season) return NaN;
  const d: number[] = [];
  for (let t = season; t < training.length; t++) d.push(Math.abs(training[t] - training[t - season]));
  return meanOf(d);
}

/**
 * Mean absolute scaled error, MASE = mean|e_t| / scale, with scale from
 * {@link maseDenominator} on the training series (Hyndman & Koehler 2006). Below 1: better
 * than the in-sample (seasonal) naive forecast on average.
 *
 * NaN when the scale is 0 or undefined (constant or too short training series).
 * @throws RangeError for empty, unequal-length or non-finite input, or a bad season.
 * @example meanAbsoluteScaledError([73, 74, 69], [70, 70, 70], nist12) // 88/87 (docs/methods.md §4)
 */
export function meanAbsoluteScaledError(
  actual: readonly number[],
  forecast: readonly number[],
  training: readonly number[],
  season = 1,
): number {
  check(actual, forecast, "meanAbsoluteScaledError");
  const scale = maseDenominator(training, season);
  if (!(scale > 0)) return NaN;
  return meanOf(errors(actual, forecast).map((e) => Math.abs(e) / scale));
}

/**
 * Tracking signal after each period: TS_t = (Σ_{i≤t} e_i) / MAD_t, with e_i = actual −
 * forecast and MAD_t = (1/t)·Σ_{i≤t} |e_i| the running mean absolute deviation
 * (docs/methods.md §8; the cumulative-MAD form, not Brown's or Trigg's smoothed one).
 * A value beyond about ±4 is the usual alarm limit (common practice, no authoritative source).
 * For forecasts of quantities of different sizes use {@link relativeTrackingSignalSeries}.
 *
 * TS_t is NaN while all errors so far are 0 (MAD_t = 0).
 * @throws RangeError for empty, unequal-length or non-finite input.
 * @example trackingSignalSeries([100, 105], [102, 100]) // [-1, 0.857142...]
 */
export function trackingSignalSeries(actual: readonly number[], forecast: readonly number[]): number[] {
  check(actual, forecast, "trackingSignalSeries");
  return signalOf(errors(actual, forecast));
}

/**
 * Tracking signal on relative errors r_i = (actual_i − forecast_i)/|actual_i|:
 * TS_t = (Σ_{i≤t} r_i) / ((1/t')·Σ_{i≤t} |r_i|), t' the periods so far with a defined r_i
 * (docs/methods.md §8). The same cumulative-error-over-MAD signal as
 * {@link trackingSignalSeries}, but unit-free, so that a forecast of thousands does not outweigh
 * one of hundreds when the periods are different questions (the project's choice, §8).
 *
 * A period with actual 0 has no relative error: it is left out of both sums and its TS is NaN;
 * TS_t is also NaN while every relative error so far is 0.
 * @throws RangeError for empty, unequal-length or non-finite input.
 * @example relativeTrackingSignalSeries([100, 1000], [90, 1050]) // [1, 0.666666...] (raw errors: [1, -1.333333...])
 */
export function relativeTrackingSignalSeries(actual: readonly number[], forecast: readonly number[]): number[] {
  check(actual, forecast, "relativeTrackingSignalSeries");
  return signalOf(actual.map((a, i) => (a === 0 ? NaN : (a - forecast[i]) / Math.abs(a))));
}

/** Cumulative error over running MAD after each error; a NaN error is skipped (its TS is NaN). */
function signalOf(e: readonly number[]): number[] {
  const out: number[] = [];
  const cum = new RunningSum();
  const abs = new RunningSum();
  let t = 0;
  for (const v of e) {
    if (Number.isNaN(v)) {
      out.push(NaN);
      continue;
    }
    cum.add(v);
    abs.add(Math.abs(v));
    t++;
    const mad = abs.value() / t;
    out.push(mad === 0 ? NaN : cum.value() / mad);
  }
  return out;
}

/**
 * Tracking signal at the last period (see {@link trackingSignalSeries}).
 * @throws RangeError for empty, unequal-length or non-finite input.
 */
export function trackingSignal(actual: readonly number[], forecast: readonly number[]): number {
  const s = trackingSignalSeries(actual, forecast);
  return s[s.length - 1];
}

/** Options for {@link accuracy}. */
export interface AccuracyOptions {
  /** Training series for the MASE scale; without it MASE is NaN. */
  readonly training?: readonly number[];
  /** Season length m for the MASE scale (1 = non-seasonal naive). Default 1. */
  readonly season?: number;
}

/** Every accuracy measure of one set of forecasts. */
export interface AccuracyResult {
  readonly n: number;
  /** Mean error (bias), actual − forecast. */
  readonly me: number;
  readonly mae: number;
  readonly mse: number;
  readonly rmse: number;
  readonly mpe: number;
  readonly mape: number;
  readonly smape: number;
  readonly mase: number;
  /** Tracking signal at the last period. */
  readonly trackingSignal: number;
}

/**
 * All measures at once: ME, MAE, MSE, RMSE, MPE, MAPE, sMAPE, MASE and the final tracking
 * signal, each as its own function documents (NaN where undefined).
 * @throws RangeError for empty, unequal-length or non-finite input, or a bad season.
 */
export function accuracy(
  actual: readonly number[],
  forecast: readonly number[],
  options: AccuracyOptions = {},
): AccuracyResult {
  check(actual, forecast, "accuracy");
  const season = options.season ?? 1;
  return {
    n: actual.length,
    me: meanError(actual, forecast),
    mae: meanAbsoluteError(actual, forecast),
    mse: meanSquaredError(actual, forecast),
    rmse: rootMeanSquaredError(actual, forecast),
    mpe: meanPercentageError(actual, forecast),
    mape: meanAbsolutePercentageError(actual, forecast),
    smape: symmetricMape(actual, forecast),
    mase: options.training ? meanAbsoluteScaledError(actual, forecast, options.training, season) : NaN,
    trackingSignal: trackingSignal(actual, forecast),
  };
}

export default accuracy;
