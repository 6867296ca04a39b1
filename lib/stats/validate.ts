/**
 * Input checks shared by lib/stats, implementing the policy stated in `index.ts`:
 * an empty sample or a non-finite value (NaN, ±Infinity) throws a `RangeError` that names
 * the function and, for a bad value, its index.
 */

/**
 * Throws a `RangeError` unless `values` is non-empty and every entry is a finite number.
 *
 * @param values - the sample to check.
 * @param fn - name of the calling function, used in the message.
 * @throws RangeError when `values` is empty or holds NaN / ±Infinity (the message names the index).
 */
export function assertFiniteSample(values: readonly number[], fn: string): void {
  if (values.length === 0) {
    throw new RangeError(`${fn}: needs at least one value, got an empty array`);
  }
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (typeof v !== "number" || !Number.isFinite(v)) {
      throw new RangeError(`${fn}: value at index ${i} is ${String(v)}; every value must be a finite number`);
    }
  }
}

/**
 * Throws a `RangeError` unless `p` is a number in [0, 1].
 *
 * @throws RangeError when `p` is NaN or outside [0, 1].
 */
export function assertProbability(p: number, fn: string, name = "p"): void {
  if (typeof p !== "number" || Number.isNaN(p) || p < 0 || p > 1) {
    throw new RangeError(`${fn}: ${name} must be a probability in [0, 1], got ${String(p)}`);
  }
}
