/**
 * The input checks of the pure core (lib/stats, lib/blend, lib/forecast's accuracy measures),
 * implementing the policy stated in lib/stats/index.ts and lib/blend/index.ts: a bad input
 * throws a `RangeError` whose message names the function, the field and, for an array, the
 * index. Internal: not re-exported from either index.
 */

/**
 * Throws unless `x` is a finite number.
 * @throws RangeError when `x` is NaN, ±Infinity or not a number.
 */
export function assertFinite(x: number, fn: string, name: string): void {
  if (typeof x !== "number" || !Number.isFinite(x)) {
    throw new RangeError(`${fn}: ${name} is ${String(x)}; it must be a finite number`);
  }
}

/**
 * Throws unless `x` is a finite number greater than 0 (or ≥ 0 when `allowZero`).
 * @throws RangeError otherwise.
 */
export function assertPositive(x: number, fn: string, name: string, allowZero = false): void {
  assertFinite(x, fn, name);
  if (allowZero ? x < 0 : x <= 0) {
    throw new RangeError(`${fn}: ${name} is ${x}; it must be ${allowZero ? "zero or more" : "greater than 0"}`);
  }
}

/**
 * Throws unless `w` is a finite number in [0, 1].
 * @throws RangeError otherwise.
 */
export function assertUnitInterval(w: number, fn: string, name: string): void {
  assertFinite(w, fn, name);
  if (w < 0 || w > 1) throw new RangeError(`${fn}: ${name} is ${w}; it must lie between 0 and 1`);
}

/**
 * Throws unless `p` is a probability: a number in [0, 1].
 * @throws RangeError when `p` is NaN, not a number or outside [0, 1].
 */
export function assertProbability(p: number, fn: string, name = "p"): void {
  if (typeof p !== "number" || Number.isNaN(p) || p < 0 || p > 1) {
    throw new RangeError(`${fn}: ${name} is ${String(p)}; it must be a probability in [0, 1]`);
  }
}

/**
 * Throws unless `items` is a non-empty array.
 * @throws RangeError for an empty array.
 */
export function assertNonEmpty(items: readonly unknown[], fn: string, name: string): void {
  if (!Array.isArray(items) || items.length === 0) {
    throw new RangeError(`${fn}: ${name} is empty; at least one entry is needed`);
  }
}

/**
 * Throws unless `values` (a sample) is non-empty and every entry is finite.
 * @throws RangeError for an empty array or a non-finite entry (the message names the index).
 */
export function assertFiniteArray(values: readonly number[], fn: string, name = "values"): void {
  if (!Array.isArray(values) || values.length === 0) {
    throw new RangeError(`${fn}: ${name} is empty; at least one value is needed`);
  }
  for (let i = 0; i < values.length; i++) {
    assertFinite(values[i], fn, `${name}[${i}]`);
  }
}

/**
 * Throws unless `a` and `b` are non-empty arrays of finite numbers of the same length
 * (paired observations such as actuals and forecasts).
 * @throws RangeError for an empty `a`, unequal lengths, or a non-finite entry (named by index).
 */
export function assertFinitePairs(a: readonly number[], b: readonly number[], fn: string, nameA: string, nameB: string): void {
  if (!Array.isArray(a) || a.length === 0) throw new RangeError(`${fn}: ${nameA} is empty; at least one pair is needed`);
  if (a.length !== b.length) {
    throw new RangeError(`${fn}: ${nameA} has ${a.length} values but ${nameB} has ${b.length}; they must pair up`);
  }
  assertFiniteArray(a, fn, nameA);
  assertFiniteArray(b, fn, nameB);
}
