/**
 * Track record and bias: per panelist over questions with an outcome — count, mean error, mean log
 * ratio actual/answer, MAPE, interval hit rate of three-point answers, Theil's decomposition
 * of the MSE — and the bias factor exp(mean log ratio), shrunk toward 1 when few questions have
 * an outcome; corrected answers and the corrected panel figure. Input policy: see `index.ts`.
 */
import { meanAbsolutePercentageError, meanError, meanSquaredError } from "../forecast/accuracy";
import { median } from "../stats/summary";
import { neumaierSum } from "../stats/sum";
import type { ThreePointAnswer } from "./distribution";
import { withinMagnitude } from "./magnitude";
import { assertFinite, assertFinitePairs, assertNonEmpty, assertPositive } from "../stats/validate";

/**
 * Prior strength n0 of the bias-factor shrinkage: with n questions with an outcome the mean log ratio
 * gets credibility Z = n/(n + n0), so n0 = 5 gives half weight after 5 questions. The form
 * Z = n/(n + k) is Bühlmann's credibility factor (H. Bühlmann 1967, "Experience rating and
 * credibility", ASTIN Bulletin 4(3), 199–207 — journal details from memory, see `index.ts`),
 * where k is a ratio of variance components (expected within-panelist variance over the
 * variance between panelists' biases); fixing k at a stated constant instead of estimating it
 * from the roster is common practice, and n0 = 5 is a judgement call, not a published value.
 */
export const BIAS_PRIOR_STRENGTH = 5;

/**
 * Fewest questions with an outcome before Theil's decomposition is reported. With very few points the
 * correlation (and so U^R and U^D) is mostly noise: common practice, not a published threshold.
 */
export const MIN_OUTCOMES_FOR_THEIL = 5;

/** Nominal coverage of a three-point answer's [P10, P90] interval. */
export const NOMINAL_INTERVAL_COVERAGE = 0.8;

/** One question with an outcome in a panelist's record. */
export interface AnswerOutcome {
  /** The outcome value. */
  readonly actual: number;
  /** The panelist's final answer (the mid / P50 of a three-point answer). */
  readonly answer: number;
  /** P10 of a three-point answer, when the question used that format. */
  readonly low?: number;
  /** P90 of a three-point answer, when the question used that format. */
  readonly high?: number;
}

/** Theil's decomposition of the mean squared error. */
export interface TheilDecomposition {
  readonly n: number;
  /** MSE = (1/n)Σ(A − P)². */
  readonly mse: number;
  /** Bias proportion (P̄ − Ā)²/MSE. */
  readonly um: number;
  /** Regression proportion (S_P − r·S_A)²/MSE. */
  readonly ur: number;
  /** Disturbance proportion (1 − r²)·S_A²/MSE. */
  readonly ud: number;
  /** Variance proportion (S_P − S_A)²/MSE. */
  readonly us: number;
  /** Covariance proportion 2(1 − r)·S_P·S_A/MSE. */
  readonly uc: number;
  /** Correlation r of actual and forecast (NaN when either is constant). */
  readonly r: number;
}

/**
 * Theil's decomposition of the MSE (H. Theil 1966, *Applied Economic Forecasting*,
 * North-Holland; formulas as docs/methods.md §5b, confirmed there against gretl's output):
 * with population SDs S_A, S_P (divisor n) and r = corr(A, P),
 * MSE = (P̄ − Ā)² + (S_P − r·S_A)² + (1 − r²)·S_A², so U^M + U^R + U^D = 1, and the
 * alternative split U^M + U^S + U^C = 1 with U^S = (S_P − S_A)²/MSE, U^C = 2(1 − r)S_P·S_A/MSE.
 * MSE by lib/forecast/accuracy; sums by Neumaier summation (lib/stats).
 *
 * Undefined values are NaN: every proportion when MSE = 0 (a perfect record); r, U^R, U^D
 * and U^C when actual or forecast is constant.
 * @throws RangeError for empty, unequal-length or non-finite arrays.
 */
export function theilDecomposition(actual: readonly number[], forecast: readonly number[]): TheilDecomposition {
  const fn = "theilDecomposition";
  assertFinitePairs(actual, forecast, fn, "actual", "forecast");
  const n = actual.length;
  const mse = meanSquaredError(actual, forecast);
  const ma = neumaierSum(actual) / n;
  const mp = neumaierSum(forecast) / n;
  const da = actual.map((a) => a - ma);
  const dp = forecast.map((p) => p - mp);
  const sa = Math.sqrt(neumaierSum(da.map((d) => d * d)) / n);
  const sp = Math.sqrt(neumaierSum(dp.map((d) => d * d)) / n);
  const cov = neumaierSum(da.map((d, i) => d * dp[i])) / n;
  const r = sa > 0 && sp > 0 ? Math.max(-1, Math.min(1, cov / (sa * sp))) : NaN;
  if (mse === 0) return { n, mse, um: NaN, ur: NaN, ud: NaN, us: NaN, uc: NaN, r };
  const bias = mp - ma;
  return {
    n,
    mse,
    um: (bias * bias) / mse,
    ur: (sp - r * sa) ** 2 / mse,
    ud: ((1 - r * r) * sa * sa) / mse,
    us: (sp - sa) ** 2 / mse,
    uc: (2 * (1 - r) * sp * sa) / mse,
    r,
  };
}

/**
 * Mean log ratio (1/n)·Σ ln(actual_i / answer_i): the multiplicative bias of the answers. Above
 * 0 the panelist answered low (actuals came in higher), below 0 high.
 *
 * Input: non-empty, equal-length arrays of positive finite numbers (a log ratio needs both > 0).
 * @throws RangeError for empty, unequal-length, non-finite or non-positive values.
 * @example meanLogRatio([110, 90], [100, 100]) // (ln 1.1 + ln 0.9)/2
 */
export function meanLogRatio(actual: readonly number[], answer: readonly number[]): number {
  const fn = "meanLogRatio";
  assertFinitePairs(actual, answer, fn, "actual", "answer");
  actual.forEach((a, i) => assertPositive(a, fn, `actual[${i}]`));
  answer.forEach((a, i) => assertPositive(a, fn, `answer[${i}]`));
  return neumaierSum(actual.map((a, i) => Math.log(a / answer[i]))) / actual.length;
}

/** A bias factor and how it was shrunk. */
export interface BiasFactor {
  /** Questions with an outcome behind it. */
  readonly n: number;
  /** Prior strength n0 used. */
  readonly priorStrength: number;
  /** Mean log ratio (0 when n = 0). */
  readonly meanLogRatio: number;
  /** Credibility Z = n/(n + n0), in [0, 1). */
  readonly credibility: number;
  /** Unshrunk factor exp(mean log ratio) (1 when n = 0). */
  readonly raw: number;
  /** Shrunk factor exp(Z·mean log ratio): multiply an answer by it to correct it. */
  readonly factor: number;
}

/**
 * Bias factor exp(Z·m) with Z = n/(n + n0) and m the mean log ratio: the unshrunk factor
 * exp(m) pulled toward 1 on the log scale when few questions have an outcome (Bühlmann-style
 * credibility, see {@link BIAS_PRIOR_STRENGTH}). n = 0 gives factor 1.
 *
 * Input: m finite; n a whole number ≥ 0; n0 finite > 0.
 * @throws RangeError for a non-finite m, a negative or fractional n, or n0 ≤ 0.
 * @example shrunkBiasFactor(Math.log(1.2), 5) // exp(0.5·ln 1.2) ≈ 1.0954
 */
export function shrunkBiasFactor(meanLogRatioValue: number, n: number, priorStrength: number = BIAS_PRIOR_STRENGTH): BiasFactor {
  const fn = "shrunkBiasFactor";
  assertFinite(meanLogRatioValue, fn, "meanLogRatio");
  assertFinite(n, fn, "n");
  if (!Number.isInteger(n) || n < 0) throw new RangeError(`${fn}: n is ${n}; it must be a whole number of questions with an outcome`);
  assertPositive(priorStrength, fn, "priorStrength");
  const m = n === 0 ? 0 : meanLogRatioValue;
  const z = n / (n + priorStrength);
  return { n, priorStrength, meanLogRatio: m, credibility: z, raw: Math.exp(m), factor: Math.exp(z * m) };
}

/** Interval hit rate of three-point answers. */
export interface IntervalHitRate {
  /** Questions with an outcome with a three-point answer. */
  readonly count: number;
  /** Of those, actuals within [low, high] (bounds included). */
  readonly hits: number;
  /** hits / count; NaN when count = 0. */
  readonly rate: number;
  /** The nominal coverage, {@link NOMINAL_INTERVAL_COVERAGE}. */
  readonly nominal: number;
}

function checkRecords(records: readonly AnswerOutcome[], fn: string): void {
  if (!Array.isArray(records)) throw new RangeError(`${fn}: records must be an array of answers with an outcome`);
  records.forEach((r, i) => {
    assertFinite(r.actual, fn, `records[${i}].actual`);
    assertFinite(r.answer, fn, `records[${i}].answer`);
    if ((r.low === undefined) !== (r.high === undefined)) {
      throw new RangeError(`${fn}: records[${i}] has only one of low and high; give both or neither`);
    }
    if (r.low !== undefined && r.high !== undefined) {
      assertFinite(r.low, fn, `records[${i}].low`);
      assertFinite(r.high, fn, `records[${i}].high`);
      if (r.low > r.answer || r.answer > r.high) {
        throw new RangeError(`${fn}: records[${i}] needs low ≤ answer ≤ high, got ${r.low}, ${r.answer}, ${r.high}`);
      }
    }
  });
}

/**
 * Share of three-point answers with an outcome whose [low, high] = [P10, P90] contained the actual,
 * against the nominal 80%. Records without low/high are not counted.
 *
 * Input: answers with an outcome (possibly empty; then count 0 and rate NaN).
 * @throws RangeError for a non-finite value, only one of low/high, or low > answer > high ordering errors.
 */
export function intervalHitRate(records: readonly AnswerOutcome[]): IntervalHitRate {
  checkRecords(records, "intervalHitRate");
  let count = 0;
  let hits = 0;
  for (const r of records) {
    if (r.low === undefined || r.high === undefined) continue;
    count++;
    if (r.actual >= r.low && r.actual <= r.high) hits++;
  }
  return { count, hits, rate: count === 0 ? NaN : hits / count, nominal: NOMINAL_INTERVAL_COVERAGE };
}

/** A panelist's track record. */
export interface TrackRecord {
  /** Questions with an outcome. */
  readonly count: number;
  /** Answers with an outcome left out as unusable (see {@link usableRecord}); not in `count`. */
  readonly skipped: number;
  /** Mean of actual − answer (positive: answers too low); NaN when count = 0. */
  readonly meanError: number;
  /** Mean ln(actual/answer); NaN when count = 0. */
  readonly meanLogRatio: number;
  /** MAPE in percent (NaN when count = 0 or an actual is 0). */
  readonly mape: number;
  readonly intervalHitRate: IntervalHitRate;
  /** Theil's decomposition, or null with fewer than the minimum questions with an outcome. */
  readonly theil: TheilDecomposition | null;
  /** Why `theil` is null ("" when it is present). */
  readonly theilNote: string;
  readonly bias: BiasFactor;
}

/** Options for {@link trackRecord}. */
export interface TrackRecordOptions {
  /** Prior strength n0 for the bias factor (default {@link BIAS_PRIOR_STRENGTH}). */
  readonly priorStrength?: number;
  /** Fewest questions with an outcome for Theil's decomposition (default {@link MIN_OUTCOMES_FOR_THEIL}). */
  readonly minForTheil?: number;
}

/**
 * True when every value of an answer with an outcome is within the range every way in accepts
 * (./magnitude.ts: 0 or a magnitude in [1e-12, 1e15]). Within it the log ratio, the
 * errors, their squares and sums, and the bias factor are finite; outside it (a value stored
 * before that rule, such as an answer of 5e-324, whose ln(actual/answer) is Infinity) they are
 * not, so such an answer is left out of the record and counted instead of making every
 * measure NaN.
 */
export function usableRecord(r: AnswerOutcome): boolean {
  return [r.actual, r.answer, r.low ?? 0, r.high ?? 0].every(withinMagnitude);
}

/**
 * A panelist's track record over questions with an outcome: count; mean error and MAPE (lib/forecast/
 * accuracy: Hyndman & Koehler 2006); mean log ratio ({@link meanLogRatio}); interval hit rate
 * ({@link intervalHitRate}); Theil's decomposition ({@link theilDecomposition}) from
 * `minForTheil` questions on; the shrunk bias factor ({@link shrunkBiasFactor}).
 *
 * Input: answers with an outcome, possibly empty (thin history is expected: count 0, NaN measures,
 * bias factor 1, no Theil). Actuals and answers must be positive (for the log ratio). Answers
 * that are not {@link usableRecord} are left out and counted in `skipped`.
 * @throws RangeError for a non-finite or non-positive actual/answer, malformed low/high, or bad options.
 */
export function trackRecord(all: readonly AnswerOutcome[], options: TrackRecordOptions = {}): TrackRecord {
  const fn = "trackRecord";
  checkRecords(all, fn);
  const minForTheil = options.minForTheil ?? MIN_OUTCOMES_FOR_THEIL;
  assertPositive(minForTheil, fn, "minForTheil");
  const records = all.filter(usableRecord);
  const skipped = all.length - records.length;
  const n = records.length;
  const hit = intervalHitRate(records);
  if (n === 0) {
    return {
      count: 0,
      skipped,
      meanError: NaN,
      meanLogRatio: NaN,
      mape: NaN,
      intervalHitRate: hit,
      theil: null,
      theilNote: `Theil's decomposition needs at least ${minForTheil} questions with an outcome; there are none.`,
      bias: shrunkBiasFactor(0, 0, options.priorStrength),
    };
  }
  const actual = records.map((r) => r.actual);
  const answer = records.map((r) => r.answer);
  const mlr = meanLogRatio(actual, answer);
  const enough = n >= minForTheil;
  return {
    count: n,
    skipped,
    meanError: meanError(actual, answer),
    meanLogRatio: mlr,
    mape: meanAbsolutePercentageError(actual, answer),
    intervalHitRate: hit,
    theil: enough ? theilDecomposition(actual, answer) : null,
    theilNote: enough ? "" : `Theil's decomposition needs at least ${minForTheil} questions with an outcome; there are ${n}.`,
    bias: shrunkBiasFactor(mlr, n, options.priorStrength),
  };
}

/**
 * The corrected answer, answer × factor (docs/methods.md §17).
 * @throws RangeError for a non-finite answer or a factor that is not finite and > 0.
 */
export function correctAnswer(answer: number, factor: number): number {
  assertFinite(answer, "correctAnswer", "answer");
  assertPositive(factor, "correctAnswer", "factor");
  return answer * factor;
}

/**
 * A three-point answer corrected by a bias factor: low, mid and high each × factor (a
 * multiplicative correction scales every percentile alike).
 * @throws RangeError for a non-finite point or a factor that is not finite and > 0.
 */
export function correctThreePoint(answer: ThreePointAnswer, factor: number): ThreePointAnswer {
  const fn = "correctThreePoint";
  assertFinite(answer.low, fn, "low");
  assertFinite(answer.mid, fn, "mid");
  assertFinite(answer.high, fn, "high");
  assertPositive(factor, fn, "factor");
  return { low: answer.low * factor, mid: answer.mid * factor, high: answer.high * factor };
}

/** The aggregation mode of a question (docs/methods.md §14.1). */
export type AggregationMode = "shared-quantity" | "sum-of-parts";

/** One panelist's answer with their bias factor. */
export interface AnswerWithFactor {
  readonly answer: number;
  /** The panelist's bias factor (1 for no correction). */
  readonly factor: number;
}

/** Raw and corrected panel figures, side by side. */
export interface CorrectedPanelFigure {
  readonly mode: AggregationMode;
  /** Median (shared quantity) or sum (sum of parts) of the raw answers. */
  readonly raw: number;
  /** The same of the corrected answers. */
  readonly corrected: number;
  /** Each answer × its factor, in input order. */
  readonly correctedAnswers: readonly number[];
}

/**
 * The panel figure from raw and from corrected answers: for a shared quantity the median
 * (Hyndman & Fan 1996 type 7, lib/stats) of the answers and of the corrected answers; for a sum
 * of parts the sum of the parts and the sum of the corrected parts (Neumaier summation).
 *
 * Input: a non-empty array of answers with factors.
 * @throws RangeError for an empty array, a non-finite answer, or a factor that is not finite and > 0.
 */
export function correctedPanelFigure(answers: readonly AnswerWithFactor[], mode: AggregationMode): CorrectedPanelFigure {
  const fn = "correctedPanelFigure";
  assertNonEmpty(answers, fn, "answers");
  if (mode !== "shared-quantity" && mode !== "sum-of-parts") {
    throw new RangeError(`${fn}: mode is "${String(mode)}"; use shared-quantity or sum-of-parts`);
  }
  answers.forEach((a, i) => {
    assertFinite(a.answer, fn, `answers[${i}].answer`);
    assertPositive(a.factor, fn, `answers[${i}].factor`);
  });
  const raw = answers.map((a) => a.answer);
  const correctedAnswers = answers.map((a) => a.answer * a.factor);
  const agg = mode === "shared-quantity" ? median : neumaierSum;
  return { mode, raw: agg(raw), corrected: agg(correctedAnswers), correctedAnswers };
}
