/**
 * Round statistics of one question (docs/methods.md §13), computed from the final
 * answers of a round by lib/stats. Pure: no database; lib/panels/rounds.ts stores the result
 * as JSON in RoundStatistic.data when a round closes.
 *
 * - `values`: summarise() of the single values, or of the median estimates (P50) of three-point
 *   answers: n, mean, sd (n − 1), CV, min, max, Q1/median/Q3 (Hyndman & Fan type 7), IQR,
 *   relative IQR.
 * - three-point answers also: `lows` and `highs` (the same summary of the 10th and 90th
 *   percentiles) and `pooled`: the equal-weight linear opinion pool of the answers, each a
 *   two-piece normal through its P10 / P50 / P90 (lib/blend `panelFromThreePoint`, the same pool
 *   the triangulation uses), summarised by `distributionSummary`.
 * - sum-of-parts questions also: `sumOfParts`: each part (by pseudonym) with its share of the
 *   total, and the total = Σ parts (of the median estimates for three-point answers; the sum
 *   of 10th percentiles is not the 10th percentile of the sum, so no range is summed).
 * Undefined statistics (sd of one answer, CV with mean 0, …) are stored as null.
 */
import { summarise, type Summary } from "../stats/summary";
import { distributionSummary, panelFromThreePoint, type DistributionSummary } from "../blend";

/** A summary with undefined values as null (JSON has no NaN). */
export type SummaryFigures = { readonly [K in keyof Summary]: number | null };

export interface FinalAnswer {
  readonly pseudonym: string;
  readonly value: number;
  readonly low: number | null;
  readonly high: number | null;
}

/** The pooled distribution of a round's three-point answers: how many, and its summary figures. */
export type PooledDistribution = { readonly n: number } & DistributionSummary;

/** The pool of three-point answers (each with low and high) as stored in the round statistics. */
function pooledFigures(answers: readonly FinalAnswer[]): PooledDistribution {
  const panel = panelFromThreePoint(answers.map((a) => ({ low: a.low as number, mid: a.value, high: a.high as number })));
  return { n: panel.n, ...distributionSummary(panel.distribution) };
}

export interface PartContribution {
  readonly pseudonym: string;
  readonly value: number;
  /** value / total (null when the total is 0). */
  readonly share: number | null;
}

export interface QuestionStatistics {
  readonly questionId: string;
  readonly roundNumber: number;
  readonly answerFormat: "single" | "three-point";
  readonly aggregation: "shared" | "sum-of-parts";
  readonly n: number;
  readonly values: SummaryFigures | null;
  readonly lows: SummaryFigures | null;
  readonly highs: SummaryFigures | null;
  readonly pooled: PooledDistribution | null;
  readonly sumOfParts: { readonly total: number; readonly parts: readonly PartContribution[] } | null;
}

const finite = (v: number): number | null => (Number.isFinite(v) ? v : null);

function figures(values: readonly number[]): SummaryFigures | null {
  if (values.length === 0) return null;
  const s = summarise(values);
  return Object.fromEntries(Object.entries(s).map(([k, v]) => [k, finite(v)])) as SummaryFigures;
}

/** Round statistics of one question from the round's final answers (one per panelist). */
export function computeQuestionStatistics(
  question: { readonly id: string; readonly answerFormat: string; readonly aggregation: string; readonly calibration?: boolean },
  roundNumber: number,
  answers: readonly FinalAnswer[],
): QuestionStatistics {
  const threePoint = question.answerFormat === "three-point";
  const sumOfParts = question.aggregation === "sum-of-parts";
  const values = answers.map((a) => a.value);
  const tp = threePoint ? answers.filter((a) => a.low !== null && a.high !== null) : [];
  let parts: QuestionStatistics["sumOfParts"] = null;
  if (sumOfParts && answers.length > 0) {
    const total = values.reduce((s, v) => s + v, 0);
    parts = {
      total,
      parts: [...answers]
        .sort((a, b) => b.value - a.value || a.pseudonym.localeCompare(b.pseudonym))
        .map((a) => ({ pseudonym: a.pseudonym, value: a.value, share: total === 0 ? null : a.value / total })),
    };
  }
  return {
    questionId: question.id,
    roundNumber,
    answerFormat: threePoint ? "three-point" : "single",
    aggregation: sumOfParts ? "sum-of-parts" : "shared",
    n: answers.length,
    values: figures(values),
    lows: threePoint ? figures(tp.map((a) => a.low as number)) : null,
    highs: threePoint ? figures(tp.map((a) => a.high as number)) : null,
    // A calibration question's answers are P5 / P50 / P95, not the P10 / P90 the pool reads.
    pooled: threePoint && !question.calibration && tp.length > 0 ? pooledFigures(tp) : null,
    sumOfParts: parts,
  };
}
