/**
 * lib/stats: descriptive statistics and distribution functions for Triangulate's pure core.
 * No framework, database or validation-library imports; plain numbers in, plain objects out.
 *
 * ## Policy for empty input and NaN (applies to every exported function)
 * - A **sample** argument (an array) must be non-empty and hold only finite numbers. An
 *   empty array, or any NaN / +Infinity / −Infinity in it, throws a `RangeError` whose
 *   message names the function and the offending index. Nothing is skipped silently: the
 *   caller decides what a missing answer means before calling.
 * - A **scalar** argument that is NaN throws a `RangeError`. Probabilities must lie in
 *   [0, 1] and degrees of freedom must be positive, else `RangeError`. Infinite scalars are
 *   accepted where the function has a limit there (normalCdf(−Infinity) = 0,
 *   normalQuantile(1) = Infinity, df = Infinity means the normal distribution).
 * - A statistic that is **undefined for a valid sample** is returned as NaN and documented
 *   on the function (e.g. the standard deviation of one value, a CV with mean 0).
 */
export { sum } from "./sum";
export { mean, variance, standardDeviation } from "./moments";
export {
  quantile,
  quantileSorted,
  DEFAULT_QUANTILE_TYPE,
  type QuantileType,
  type QuantileOptions,
} from "./quantile";
export { normalCdf, normalSurvival, normalDensity, normalQuantile } from "./normal";
export { studentTCdf, studentTQuantile } from "./student-t";
export { summarise, median, type Summary, type SummaryOptions } from "./summary";
export { histogram, type HistogramBin } from "./histogram";
export { binomialCdf, binomialUpperTail } from "./binomial";
