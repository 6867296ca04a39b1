/**
 * Input checks shared by lib/blend, implementing the policy stated in `index.ts`: a bad
 * input throws a `RangeError` whose message names the function, the field and, for an
 * array, the index. Internal: not re-exported from `index.ts`.
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
 * Throws unless `values` is non-empty and every entry is finite.
 * @throws RangeError for an empty array or a non-finite entry (the message names the index).
 */
export function assertFiniteArray(values: readonly number[], fn: string, name: string): void {
  if (!Array.isArray(values) || values.length === 0) {
    throw new RangeError(`${fn}: ${name} is empty; at least one value is needed`);
  }
  for (let i = 0; i < values.length; i++) {
    assertFinite(values[i], fn, `${name}[${i}]`);
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
