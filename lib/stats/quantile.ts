import { assertFiniteArray, assertProbability } from "./validate";

/** Hyndman & Fan (1996) sample-quantile definitions 1–9. */
export type QuantileType = 1 | 2 | 3 | 4 | 5 | 6 | 7 | 8 | 9;

/** Options for {@link quantile} and {@link quantileSorted}. */
export interface QuantileOptions {
  /** Hyndman & Fan definition; default 7 (R's and NumPy's default). */
  readonly type?: QuantileType;
}

/** Default definition: Hyndman & Fan type 7, R's default. */
export const DEFAULT_QUANTILE_TYPE: QuantileType = 7;

/** R's tolerance for types 4–9 (4 · machine epsilon), see `stats:::quantile.default`. */
const FUZZ = 4 * Number.EPSILON;

/** Plotting-position constants (a, b) of Hyndman & Fan types 4–9: m = a + p(1 − a − b). */
const AB: Readonly<Record<4 | 5 | 6 | 7 | 8 | 9, readonly [number, number]>> = {
  4: [0, 1],
  5: [0.5, 0.5],
  6: [0, 0],
  7: [1, 1],
  8: [1 / 3, 1 / 3],
  9: [3 / 8, 3 / 8],
};

/**
 * Sample quantile at probability `p` of an array already sorted in ascending order.
 *
 * Definition (type 7, the default): with h = (n − 1)·p + 1 (1-based), j = ⌊h⌋, g = h − j,
 * Q(p) = (1 − g)·x_(j) + g·x_(j+1); i.e. linear interpolation between the points
 * ((k − 1)/(n − 1), x_(k)). Types 1–9 follow Hyndman & Fan's general form
 * Q(p) = (1 − γ)·x_(j) + γ·x_(j+1) with j = ⌊np + m⌋; the arithmetic (including R's
 * 4·eps fuzz for types 4–9, and not interpolating between equal order statistics) follows
 * R 4.2.2 `stats:::quantile.default`, so results agree with R bit for bit in ordinary cases.
 * Source: R. J. Hyndman and Y. Fan (1996), "Sample quantiles in statistical packages",
 * The American Statistician 50(4), 361–365.
 *
 * Input: a non-empty array of finite numbers in ascending order; p in [0, 1].
 * Complexity O(n) (for the sortedness check).
 * @throws RangeError for an empty array, a non-finite value, an unsorted array, p outside
 *   [0, 1] or NaN, or an unknown type (policy in `index.ts`).
 * @example quantileSorted([15, 20, 35, 40, 50], 0.4) // 29
 */
export function quantileSorted(
  sorted: readonly number[],
  p: number,
  options: QuantileOptions = {},
): number {
  assertFiniteArray(sorted, "quantileSorted", "sorted");
  for (let i = 1; i < sorted.length; i++) {
    if (sorted[i] < sorted[i - 1]) {
      throw new RangeError(
        `quantileSorted: values must be in ascending order (index ${i} is below index ${i - 1}); use quantile() for unsorted data`,
      );
    }
  }
  assertProbability(p, "quantileSorted");
  return quantileOfSorted(sorted, p, options.type ?? DEFAULT_QUANTILE_TYPE);
}

/**
 * Sample quantile at probability `p` of unsorted data: sorts a copy, then
 * {@link quantileSorted}. Default definition: Hyndman & Fan (1996) type 7 (R's default).
 *
 * Input: a non-empty array of finite numbers; p in [0, 1]. Complexity O(n log n).
 * @throws RangeError for an empty array, a non-finite value, p outside [0, 1] or NaN,
 *   or an unknown type (policy in `index.ts`).
 * @example quantile([40, 15, 50, 20, 35], 0.4) // 29
 */
export function quantile(values: readonly number[], p: number, options: QuantileOptions = {}): number {
  assertFiniteArray(values, "quantile");
  assertProbability(p, "quantile");
  return quantileOfSorted(sortAscending(values), p, options.type ?? DEFAULT_QUANTILE_TYPE);
}

/**
 * A sorted copy in ascending numeric order (the input is not modified).
 * No checks: NaN would sort unpredictably, so callers validate first. O(n log n).
 */
export function sortAscending(values: readonly number[]): number[] {
  return Array.from(values).sort((a, b) => a - b);
}

/**
 * The quantile computation of {@link quantileSorted} without input checks, for callers in
 * lib that have already validated: `x` must be non-empty, finite and sorted ascending, and
 * p in [0, 1]; otherwise the result is meaningless (no error is raised). Same definitions and
 * source as {@link quantileSorted}.
 * @throws RangeError only for an unknown type.
 */
export function quantileOfSorted(x: readonly number[], p: number, type: QuantileType): number {
  const n = x.length;
  if (type === 7) {
    const index = (n - 1) * p; // 0-based
    const lo = Math.floor(index);
    const hi = Math.ceil(index);
    const q = x[lo];
    if (index > lo && x[hi] !== q) {
      const h = index - lo;
      return (1 - h) * q + h * x[hi];
    }
    return q;
  }
  // 1-based order statistic, clamped to x_(1) .. x_(n) as R pads the sorted vector.
  const at = (k: number): number => x[Math.min(Math.max(k, 1), n) - 1];
  let j: number;
  let h: number;
  if (type === 1 || type === 2 || type === 3) {
    const nppm = type === 3 ? n * p - 0.5 : n * p;
    j = Math.floor(nppm);
    if (type === 1) h = nppm > j ? 1 : 0;
    else if (type === 2) h = ((nppm > j ? 1 : 0) + 1) / 2;
    else h = nppm !== j || Math.abs(j % 2) === 1 ? 1 : 0;
  } else if (type >= 4 && type <= 9) {
    const [a, b] = AB[type];
    const nppm = a + p * (n + 1 - a - b);
    j = Math.floor(nppm + FUZZ);
    h = nppm - j;
    if (Math.abs(h) < FUZZ) h = 0;
  } else {
    throw new RangeError(`quantile: type must be an integer from 1 to 9, got ${String(type)}`);
  }
  const lower = at(j);
  const upper = at(j + 1);
  if (h === 1) return upper;
  if (h > 0 && h < 1 && lower !== upper) return (1 - h) * lower + h * upper;
  return lower;
}

export default quantile;
