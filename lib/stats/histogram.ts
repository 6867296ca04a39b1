import { assertFiniteArray } from "./validate";

/** One bin of a {@link histogram}: the values in (lower, upper] (the first bin also holds `lower`). */
export interface HistogramBin {
  readonly lower: number;
  readonly upper: number;
  readonly count: number;
}

/**
 * Equal-width histogram of a sample from its minimum to its maximum, with Sturges' number of
 * bins, ⌈log2 n⌉ + 1 (Sturges 1926; R's `nclass.Sturges`), unless `bins` is given. Bins are
 * closed on the right and the first also on the left, as R's `hist(x, breaks, right = TRUE,
 * include.lowest = TRUE)`; the inner breaks are min + i·(max − min)/k, as R's
 * `seq(min, max, length.out = k + 1)`. A sample of equal values gives one bin [v, v].
 * @throws RangeError for an empty sample, a non-finite value or a bin count below 1.
 */
export function histogram(values: readonly number[], bins?: number): HistogramBin[] {
  assertFiniteArray(values, "histogram");
  let lo = values[0];
  let hi = values[0];
  for (const v of values) {
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  if (lo === hi) return [{ lower: lo, upper: hi, count: values.length }];
  const k = bins ?? Math.ceil(Math.log2(values.length) + 1);
  if (!Number.isInteger(k) || k < 1) throw new RangeError(`histogram: bins must be a whole number ≥ 1, got ${k}`);
  const width = (hi - lo) / k;
  const breaks = Array.from({ length: k + 1 }, (_, i) => (i === k ? hi : lo + i * width));
  const counts = new Array<number>(k).fill(0);
  for (const v of values) {
    // The first bin whose upper break is ≥ v (right-closed bins).
    let i = Math.min(k - 1, Math.max(0, Math.ceil((v - lo) / width) - 1));
    while (i > 0 && v <= breaks[i]) i--;
    while (i < k - 1 && v > breaks[i + 1]) i++;
    counts[i]++;
  }
  return counts.map((count, i) => ({ lower: breaks[i], upper: breaks[i + 1], count }));
}
