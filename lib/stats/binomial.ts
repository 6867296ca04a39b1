/**
 * Binomial distribution tails, for the exact binomial test behind a panelist's range advice
 * (lib/blend/own-record.ts, docs/methods.md §22). Input policy: see `index.ts`; each function
 * states its own.
 */
import { assertFinite } from "./validate";
import { logGamma } from "./special";

/**
 * Binomial probability P(X ≤ k) for X ~ Binomial(n, p), by summing the terms
 * C(n, j)·p^j·(1 − p)^(n − j) for j = 0…k on the log scale (log-gamma, lib/stats/special.ts),
 * as R's `pbinom(k, n, p)`. P(X ≥ k) is `1 − binomialCdf(k − 1, n, p)`, or use
 * {@link binomialUpperTail}, which sums its own terms (no cancellation).
 *
 * Input: n a whole number ≥ 0, k a whole number (k < 0 gives 0, k ≥ n gives 1), p in [0, 1].
 * @throws RangeError for a non-whole or negative n, a non-whole k, or p outside [0, 1].
 */
export function binomialCdf(k: number, n: number, p: number): number {
  checkBinomial(k, n, p, "binomialCdf");
  if (k < 0) return 0;
  if (k >= n) return 1;
  return Math.min(1, sumTerms(0, k, n, p));
}

/**
 * Binomial probability P(X ≥ k) for X ~ Binomial(n, p), as R's `pbinom(k - 1, n, p, lower.tail = FALSE)`.
 * Input and errors as {@link binomialCdf}.
 */
export function binomialUpperTail(k: number, n: number, p: number): number {
  checkBinomial(k, n, p, "binomialUpperTail");
  if (k <= 0) return 1;
  if (k > n) return 0;
  return Math.min(1, sumTerms(k, n, n, p));
}

function checkBinomial(k: number, n: number, p: number, fn: string): void {
  assertFinite(k, fn, "k");
  assertFinite(n, fn, "n");
  assertFinite(p, fn, "p");
  if (!Number.isInteger(n) || n < 0) throw new RangeError(`${fn}: n is ${n}; it must be a whole number ≥ 0`);
  if (!Number.isInteger(k)) throw new RangeError(`${fn}: k is ${k}; it must be a whole number`);
  if (p < 0 || p > 1) throw new RangeError(`${fn}: p is ${p}; it must be in [0, 1]`);
}

function sumTerms(from: number, to: number, n: number, p: number): number {
  if (p === 0) return from === 0 ? 1 : 0;
  if (p === 1) return to === n ? 1 : 0;
  const lp = Math.log(p);
  const lq = Math.log1p(-p);
  const lc = logGamma(n + 1);
  let s = 0;
  for (let j = from; j <= to; j++) s += Math.exp(lc - logGamma(j + 1) - logGamma(n - j + 1) + j * lp + (n - j) * lq);
  return s;
}
