/**
 * JSON has no NaN or Infinity: the blend core returns NaN for undefined statistics (see
 * lib/blend/index.ts), and the API and the stored JSON carry them as null.
 */

/** `T` with every number possibly null (what {@link jsonSafe} returns). */
export type JsonSafe<T> = T extends number
  ? number | null
  : T extends readonly (infer U)[]
    ? JsonSafe<U>[]
    : T extends object
      ? { [K in keyof T]: JsonSafe<T[K]> }
      : T;

/** A deep copy of `value` with every non-finite number replaced by null. */
export function jsonSafe<T>(value: T): JsonSafe<T> {
  if (typeof value === "number") return (Number.isFinite(value) ? value : null) as JsonSafe<T>;
  if (Array.isArray(value)) return value.map((v) => jsonSafe(v)) as JsonSafe<T>;
  if (value instanceof Date) return value as JsonSafe<T>;
  if (value !== null && typeof value === "object") {
    return Object.fromEntries(Object.entries(value).map(([k, v]) => [k, jsonSafe(v)])) as JsonSafe<T>;
  }
  return value as JsonSafe<T>;
}
