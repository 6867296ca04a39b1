/**
 * The range of values the blending arithmetic is safe for: 0, or a magnitude between
 * MIN_MAGNITUDE and MAX_MAGNITUDE. Within it every quantity derived from two values stays
 * finite: a ratio is at most 1e27 (its natural log about 62), a value times a bias factor
 * exp(±62) at most 1e42, its square 1e84, and a sum of a million such squares far below the
 * largest double (about 1.8e308, IEEE 754-2019 binary64). Outside it, ln(actual/answer) of an
 * answer of 5e-324 (a subnormal double) is Infinity, and sums of values near 1e308 overflow.
 * The limits are a judgement call (common practice: quantities a panel forecasts are counts
 * and amounts far inside them), not a published value. Every way in refuses values outside
 * the range (lib/validation/numbers.ts); derived records leave out stored pairs outside it.
 */

/** Largest magnitude accepted: 10^15, just under 2^53 ≈ 9.007e15, the largest integer a double holds exactly. */
export const MAX_MAGNITUDE = 1e15;
/** Smallest non-zero magnitude accepted. */
export const MIN_MAGNITUDE = 1e-12;

/** True when `v` is finite and 0 or of a magnitude in [MIN_MAGNITUDE, MAX_MAGNITUDE]. */
export function withinMagnitude(v: number): boolean {
  if (typeof v !== "number" || !Number.isFinite(v)) return false;
  const m = Math.abs(v);
  return m === 0 || (m >= MIN_MAGNITUDE && m <= MAX_MAGNITUDE);
}
