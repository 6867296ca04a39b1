/**
 * A panelist's own record in words (docs/methods.md §22): whether their ranges held as often as
 * they say, and whether their answers ran high or low, from the figures the track record already
 * computes (./track-record.ts: `intervalHitRate`, `trackRecord`'s mean log ratio and bias factor).
 * Nothing here is recomputed differently; this only reads those figures and says what they mean.
 * Input policy: see `index.ts` (thin history is expected: below the minimum the advice says so).
 */
import { assertFinite } from "../stats/validate";
import { binomialCdf, binomialUpperTail } from "../stats/binomial";
import type { IntervalHitRate } from "./track-record";

/**
 * Fewest outcomes before any advice is given, for ranges and for bias alike: with fewer, the
 * advice says there is too little to go on. Common practice (a judgement call, no published
 * threshold). With 5 outcomes an 80% range of the stated width holds at most once with
 * probability 0.00672 (below the test's 5%), so the advice can already speak then.
 */
export const MIN_OUTCOMES_FOR_ADVICE = 5;

/** One-sided level of the binomial test behind the range advice: 0.05, common practice. */
export const RANGE_TEST_LEVEL = 0.05;

/**
 * Answers within this share of the outcomes on average (geometric mean of answer/outcome within
 * 1 ± 0.05) are called close: 5% is a judgement call, common practice, not a published value.
 */
export const CLOSE_ENOUGH = 0.05;

/** Nominal coverage of a calibration question's [P5, P95] range (Cooke 1991; docs/methods.md §21). */
export const NOMINAL_CALIBRATION_COVERAGE = 0.9;

/** The verdict on a set of ranges. */
export type RangeVerdict = "too-few" | "too-narrow" | "too-wide" | "as-stated";

/** The advice on one set of ranges (80% three-point answers or 90% calibration answers). */
export interface RangeAdvice {
  readonly verdict: RangeVerdict;
  /** P(at most this many held) if the ranges were as stated; NaN with too few outcomes. */
  readonly pLow: number;
  /** P(at least this many held) if the ranges were as stated; NaN with too few outcomes. */
  readonly pHigh: number;
  readonly sentence: string;
}

const pct = (x: number) => `${Math.round(x * 100)}%`;

/**
 * Advice on a set of ranges from their hit count (`intervalHitRate`, ./track-record.ts): with
 * n ≥ {@link MIN_OUTCOMES_FOR_ADVICE} outcomes, the exact one-sided binomial test of the nominal
 * coverage π (interval calibration as in R. M. Cooke (1991), *Experts in Uncertainty*, Oxford
 * University Press, ch. 8–9: the share of realisations inside a stated range compared with its
 * nominal probability): "too narrow" (widen them) when P(X ≤ hits | n, π) < 0.05, "too wide"
 * (they may be narrowed) when P(X ≥ hits | n, π) < 0.05, else "as stated". The 0.05 level is
 * common practice. With fewer outcomes the verdict is "too-few" and the sentence says so.
 *
 * Input: an `IntervalHitRate` (count 0 allowed). `what` names the ranges ("80% ranges").
 * @throws RangeError for hits outside [0, count] or a nominal outside (0, 1).
 * @example rangeAdvice({ count: 10, hits: 5, rate: 0.5, nominal: 0.8 }, "80% ranges").verdict // "too-narrow" (P(X ≤ 5) = 0.0328)
 */
export function rangeAdvice(hit: IntervalHitRate, what: string): RangeAdvice {
  const fn = "rangeAdvice";
  const { count: n, hits, nominal } = hit;
  assertFinite(nominal, fn, "nominal");
  if (!(nominal > 0 && nominal < 1)) throw new RangeError(`${fn}: nominal is ${nominal}; it must be in (0, 1)`);
  if (!Number.isInteger(n) || n < 0 || !Number.isInteger(hits) || hits < 0 || hits > n) {
    throw new RangeError(`${fn}: hits ${hits} of ${n}; need whole numbers with 0 ≤ hits ≤ count`);
  }
  const held = `Your ${what} held ${hits} ${hits === 1 ? "time" : "times"} in ${n}`;
  if (n < MIN_OUTCOMES_FOR_ADVICE) {
    return {
      verdict: "too-few",
      pLow: NaN,
      pHigh: NaN,
      sentence:
        n === 0
          ? `None of your ${what} has met an outcome yet: nothing to say about them so far.`
          : `${held}: too few outcomes to say whether they are too narrow or too wide (advice from ${MIN_OUTCOMES_FOR_ADVICE} outcomes on).`,
    };
  }
  const pLow = binomialCdf(hits, n, nominal);
  const pHigh = binomialUpperTail(hits, n, nominal);
  if (pLow < RANGE_TEST_LEVEL) {
    return { verdict: "too-narrow", pLow, pHigh, sentence: `${held}, where ${pct(nominal)} would be about ${Math.round(n * nominal)}: widen them.` };
  }
  if (pHigh < RANGE_TEST_LEVEL) {
    return { verdict: "too-wide", pLow, pHigh, sentence: `${held}, more often than ${pct(nominal)}: you may narrow them.` };
  }
  return { verdict: "as-stated", pLow, pHigh, sentence: `${held}, in line with ${pct(nominal)}: keep them as they are.` };
}

/** The advice on a panelist's bias. */
export interface BiasAdvice {
  readonly verdict: "too-few" | "high" | "low" | "close";
  /** Geometric mean of answer/outcome minus 1 (0.12: answers 12% above the outcomes); NaN with too few outcomes. */
  readonly relative: number;
  readonly sentence: string;
}

/**
 * Advice on a panelist's answers against the outcomes from their mean log ratio
 * m = mean ln(actual/answer) (./track-record.ts `meanLogRatio`, docs/methods.md §17): the answers
 * were on average exp(−m) times the outcome (a geometric mean), i.e. (exp(−m) − 1)·100% above it.
 * Within ±{@link CLOSE_ENOUGH} they are called close (common practice). With fewer than
 * {@link MIN_OUTCOMES_FOR_ADVICE} outcomes the verdict is "too-few" and the sentence says so.
 *
 * Input: n outcomes (whole, ≥ 0) and m (finite when n > 0; ignored when n = 0, may be NaN then).
 * @throws RangeError for a negative or fractional n, or a non-finite m with n > 0.
 * @example biasAdvice(10, -Math.log(1.12)).sentence // "Your answers were on average 12% above the outcome (10 outcomes): aim lower."
 */
export function biasAdvice(n: number, meanLogRatio: number): BiasAdvice {
  const fn = "biasAdvice";
  assertFinite(n, fn, "n");
  if (!Number.isInteger(n) || n < 0) throw new RangeError(`${fn}: n is ${n}; it must be a whole number of outcomes`);
  if (n < MIN_OUTCOMES_FOR_ADVICE) {
    return {
      verdict: "too-few",
      relative: NaN,
      sentence:
        n === 0
          ? "No outcome of your answers has been recorded yet: nothing to say about them so far."
          : `Only ${n} of your answers ${n === 1 ? "has" : "have"} a recorded outcome: too few to say whether you answer high or low (advice from ${MIN_OUTCOMES_FOR_ADVICE} outcomes on).`,
    };
  }
  assertFinite(meanLogRatio, fn, "meanLogRatio");
  const relative = Math.exp(-meanLogRatio) - 1;
  const over = `${n} outcomes`;
  if (Math.abs(relative) <= CLOSE_ENOUGH) {
    return { verdict: "close", relative, sentence: `Over ${over} your answers were on average within ${pct(CLOSE_ENOUGH)} of the outcome: no sign that you answer high or low.` };
  }
  return relative > 0
    ? { verdict: "high", relative, sentence: `Your answers were on average ${pct(relative)} above the outcome (${over}): aim lower.` }
    : { verdict: "low", relative, sentence: `Your answers were on average ${pct(-relative)} below the outcome (${over}): aim higher.` };
}
