import { assertFiniteArray } from "./validate";
import { neumaierSum } from "./sum";

/**
 * Arithmetic mean: (Σ x_i) / n, with the sum taken by Neumaier compensated summation.
 *
 * Input: a non-empty array of finite numbers. Complexity O(n).
 * @throws RangeError for an empty array or a non-finite value (policy in `index.ts`).
 * @example mean([1, 2, 3, 4]) // 2.5
 */
export function mean(values: readonly number[]): number {
  assertFiniteArray(values, "mean");
  return neumaierSum(values) / values.length;
}

/**
 * Sample variance with divisor n − 1, by Welford's streaming update.
 *
 * Definition: s² = Σ (x_i − x̄)² / (n − 1), as R's `var`.
 * Source: B. P. Welford (1962), "Note on a method for calculating corrected sums of squares
 * and products", Technometrics 4(3), 419–420; update form as in D. E. Knuth, TAOCP vol. 2,
 * §4.2.2, run on data shifted by the first value (Chan, Golub & LeVeque 1983). The running
 * sum of squared deviations stays accurate when the values share a large offset (e.g. 1e9 +
 * small values), where the textbook Σx² − n·x̄² fails.
 *
 * Input: a non-empty array of finite numbers. n = 1 returns NaN (no spread is estimable;
 * R's `var` gives NA). Complexity O(n).
 * @throws RangeError for an empty array or a non-finite value (policy in `index.ts`).
 * @example variance([2, 4, 4, 4, 5, 5, 7, 9]) // 4.571428571428571
 */
export function variance(values: readonly number[]): number {
  assertFiniteArray(values, "variance");
  return welford(values).m2 / (values.length - 1);
}

/**
 * Sample standard deviation, √variance (divisor n − 1), as R's `sd`.
 * See {@link variance} for the algorithm, source and policy (n = 1 → NaN).
 * @throws RangeError for an empty array or a non-finite value.
 */
export function standardDeviation(values: readonly number[]): number {
  assertFiniteArray(values, "standardDeviation");
  return Math.sqrt(welford(values).m2 / (values.length - 1));
}

/**
 * Welford's running mean and sum of squared deviations m2 = Σ(x − x̄)² (internal, no checks).
 *
 * The update runs on the values shifted by the first value K (x − K is exact when x and K
 * are close, Sterbenz's lemma), the "shifted data" refinement recommended by T. F. Chan,
 * G. H. Golub and R. J. LeVeque (1983), "Algorithms for computing the sample variance:
 * analysis and recommendations", The American Statistician 37(3), 242–247. Without the shift,
 * the running mean of values near 1e9 carries rounding of order 1e-7 into every update.
 */
export function welford(values: readonly number[]): { mean: number; m2: number } {
  const k = values.length > 0 ? values[0] : 0;
  let m = 0;
  let m2 = 0;
  for (let i = 0; i < values.length; i++) {
    const x = values[i] - k;
    const d = x - m;
    m += d / (i + 1);
    m2 += d * (x - m);
  }
  return { mean: m + k, m2 };
}
