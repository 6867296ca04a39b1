import { assertFiniteArray } from "./validate";
import { neumaierSum } from "./sum";
import { welford } from "./moments";
import { quantileOfSorted, sortAscending, type QuantileType, DEFAULT_QUANTILE_TYPE } from "./quantile";

/** Round statistics of one sample (docs/methods.md §13). */
export interface Summary {
  readonly n: number;
  readonly mean: number;
  /** Sample standard deviation, divisor n − 1 (NaN when n = 1). */
  readonly sd: number;
  /** Coefficient of variation sd / mean (NaN when n = 1 or mean = 0). */
  readonly cv: number;
  readonly min: number;
  readonly max: number;
  /** First quartile, Hyndman & Fan type 7 unless another type was asked for. */
  readonly q1: number;
  readonly median: number;
  readonly q3: number;
  /** Interquartile range q3 − q1. */
  readonly iqr: number;
  /** IQR / |median| (NaN when median = 0). */
  readonly relativeIqr: number;
}

/** Options for {@link summarise}. */
export interface SummaryOptions {
  /** Quantile definition for q1, median, q3; default 7 (Hyndman & Fan 1996, R's default). */
  readonly type?: QuantileType;
}

/**
 * Round statistics of a sample, as docs/methods.md §13 specifies.
 *
 * Definitions:
 * - mean = Σx/n (Neumaier compensated sum); sd = √(Σ(x − x̄)²/(n − 1)) by Welford (1962),
 *   as R's `sd`; cv = sd / mean (signed; English & Kernan 1976 use it for Delphi estimates).
 * - q1, median, q3 = sample quantiles at 0.25, 0.5, 0.75 by Hyndman & Fan (1996)
 *   definition 7 (R's `quantile` default; R's `median` equals the type-7 0.5 quantile);
 *   iqr = q3 − q1 (R's `IQR`); relativeIqr = iqr / |median|.
 *
 * Degenerate cases (values, not errors): n = 1 → sd and cv are NaN (no spread can be
 * estimated; R's `sd` gives NA), while q1 = median = q3 and iqr = 0. mean = 0 → cv is NaN
 * (undefined; a ±Infinity would read as "no consensus" for the wrong reason). median = 0 →
 * relativeIqr is NaN, even when iqr = 0. All values equal and non-zero → sd = cv = iqr =
 * relativeIqr = 0.
 *
 * Input: a non-empty array of finite numbers (need not be sorted). Complexity O(n log n).
 * @throws RangeError for an empty array or a non-finite value (policy in `index.ts`).
 * @example summarise([3, 4, 4, 5, 5, 5, 6, 7]).iqr // 1.25
 */
export function summarise(values: readonly number[], options: SummaryOptions = {}): Summary {
  assertFiniteArray(values, "summarise");
  const type = options.type ?? DEFAULT_QUANTILE_TYPE;
  const n = values.length;
  const sorted = sortAscending(values);
  const mean = neumaierSum(values) / n;
  const sd = n > 1 ? Math.sqrt(welford(values).m2 / (n - 1)) : NaN;
  const q1 = quantileOfSorted(sorted, 0.25, type);
  const median = quantileOfSorted(sorted, 0.5, type);
  const q3 = quantileOfSorted(sorted, 0.75, type);
  const iqr = q3 - q1;
  return {
    n,
    mean,
    sd,
    cv: mean === 0 ? NaN : sd / mean,
    min: sorted[0],
    max: sorted[n - 1],
    q1,
    median,
    q3,
    iqr,
    relativeIqr: median === 0 ? NaN : iqr / Math.abs(median),
  };
}

/**
 * Sample median: the type-7 quantile at 0.5 (the middle value, or the mean of the two
 * middle values), as R's `median`.
 * @throws RangeError for an empty array or a non-finite value (policy in `index.ts`).
 * @example median([2, 4, 4, 5, 7, 9, 10]) // 5
 */
export function median(values: readonly number[]): number {
  assertFiniteArray(values, "median");
  return quantileOfSorted(sortAscending(values), 0.5, 7);
}

export default summarise;
