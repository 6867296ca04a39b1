/**
 * The one rule for every number a client gives as a value (answers and their three-point
 * values, question bounds, outcome values and part outcomes, baseline history and future values,
 * scale factors), on every path: the JSON API and server actions through the zod schemas of
 * this folder (`usableNumber` in ./inputs.ts), CSV cells through lib/csv. The range and why it
 * keeps every derived figure finite: lib/blend/magnitude.ts. Pure: no zod here, so lib/csv can
 * use it.
 */
import { MAX_MAGNITUDE, MIN_MAGNITUDE, withinMagnitude } from "../blend/magnitude";

export const NUMBER_RANGE_MESSAGE = `must be 0 or between ${MIN_MAGNITUDE} and ${MAX_MAGNITUDE} in size (positive or negative)`;

/** Why `v` is not a usable value, or null when it is. */
export function numberProblem(v: number): string | null {
  if (typeof v !== "number" || !Number.isFinite(v)) return "must be a finite number";
  return withinMagnitude(v) ? null : NUMBER_RANGE_MESSAGE;
}
