/**
 * The figures of Cooke's classical model on a panel (docs/methods.md §21) from plain inputs: the
 * panel's questions and each panelist's final answers in, scores, pools and the leave-one-out verdict
 * out. No database or framework: it runs on the worker pool (lib/work/jobs.ts), so a large panel's
 * scoring does not hold up other requests. The rules are stated in lib/triangulation/calibration.ts.
 */
import {
  backgroundFor,
  intrinsicRange,
  leaveOneOut,
  equalWeightPool,
  panelistScores,
  performanceWeightedPool,
  pooledQuantiles,
  type Assessment,
  type CalibrationQuestion,
} from "../blend/classical-model";

/** The levels target questions are answered at (three-point: P10 / P50 / P90, docs/methods.md §14.1). */
export const TARGET_LEVELS = [0.1, 0.5, 0.9] as const;
/** The pooled percentiles reported for a target question. */
export const POOL_LEVELS = [0.05, 0.1, 0.5, 0.9, 0.95] as const;
/** Calibration questions the sources work with (about 10; from memory, common practice): fewer make the scores rough. */
export const FEW_CALIBRATION_QUESTIONS = 10;

export interface PanelistCalibration {
  readonly pseudonym: string;
  /** Counted calibration questions this panelist answered. */
  readonly answered: number;
  /** Scored only when every counted calibration question was answered. */
  readonly scored: boolean;
  readonly binCounts: readonly number[] | null;
  readonly calibration: number | null;
  readonly information: number | null;
  /** calibration × information. */
  readonly combined: number | null;
  /** Weight in the performance-weighted pool (0 below the cut-off). */
  readonly weight: number | null;
}

export interface PoolScore {
  readonly binCounts: readonly number[];
  readonly calibration: number;
  readonly information: number;
  readonly combined: number;
}

/** Pooled percentiles p5, p10, p50, p90, p95 of a target question. */
export interface PooledPercentiles {
  readonly p5: number;
  readonly p10: number;
  readonly p50: number;
  readonly p90: number;
  readonly p95: number;
}

export interface TargetPools {
  readonly questionId: string;
  readonly text: string;
  readonly unit: string;
  /** Panelists whose answers are pooled (equal weights). */
  readonly answers: number;
  readonly equal: PooledPercentiles | null;
  readonly performance: PooledPercentiles | null;
  /** Why a pool is missing (null when both are there). */
  readonly note: string | null;
}

export interface CalibrationReport {
  /** Calibration questions on the panel. */
  readonly calibrationQuestions: number;
  /** Those with a true value and answers (counted). */
  readonly counted: number;
  /** Why nothing is scored yet (null once scored). */
  readonly waiting: string | null;
  readonly panelists: readonly PanelistCalibration[];
  /** Each pool scored on the calibration questions (in sample); null until scored. */
  readonly pools: { readonly equal: PoolScore; readonly performance: PoolScore & { readonly cutoff: number | null } } | null;
  /** Leave-one-calibration-question-out comparison; null with fewer than 2 counted questions. */
  readonly outOfSample: {
    readonly questions: number;
    readonly equal: PoolScore;
    readonly performance: PoolScore;
    /** The performance-weighted pool's out-of-sample combined score is above the equal-weight pool's. */
    readonly weightingHelped: boolean;
  } | null;
  /** The out-of-sample result in one plain sentence (or why there is none). */
  readonly verdict: string;
  readonly targets: readonly TargetPools[];
  readonly method: readonly string[];
}

/** What the core needs, plus what links it back to the answers. */
export interface CalibrationData {
  readonly report: CalibrationReport;
  /** Performance weight per invitation id (scored panelists; empty until scored). */
  readonly weights: ReadonlyMap<string, number>;
}

export interface FinalAnswer {
  readonly invitationId: string;
  readonly pseudonym: string;
  readonly value: number;
  readonly low: number | null;
  readonly high: number | null;
}

const percentiles = (q: readonly number[]): PooledPercentiles => ({ p5: q[0], p10: q[1], p50: q[2], p90: q[3], p95: q[4] });
const poolScore = (s: { binCounts: readonly number[]; calibration: number; information: number; combined: number }): PoolScore => ({
  binCounts: [...s.binCounts],
  calibration: s.calibration,
  information: s.information,
  combined: s.combined,
});

const METHOD = [
  "Calibration score: the p-value of 2N·I(s, p) under χ² with 3 degrees of freedom, s the shares of the N true values in the panelist's four inter-percentile bins and p = (0.05, 0.45, 0.45, 0.05) (Cooke 1991).",
  "Information score: the mean over the calibration questions of the relative information of the panelist's distribution (uniform between the percentiles) against a uniform background on the question's intrinsic range — every percentile and the true value, widened by 10% each side — or, when the values are all above 0 and span two orders of magnitude or more, the same on their logarithms (log-uniform background; Cooke 1991).",
  "Performance weights ∝ calibration × information for panelists whose calibration is at least the cut-off, the cut-off chosen to maximise the pool's own calibration × information on the calibration questions (Cooke & Goossens 2008). The equal-weight pool weighs every panelist alike.",
  "Target questions: each panelist's P10 / P50 / P90 read as a distribution uniform between the percentiles (between their logarithms when the answers span two orders of magnitude or more) on the answers' range widened by 10%, pooled linearly (Stone 1961).",
  "Out of sample: each calibration question left out in turn, the weights found on the others, both pools scored on the one left out (after Colson & Cooke 2017, who leave out larger sets). Weighting helps when the performance-weighted pool's calibration × information is the higher.",
  "A panelist's final answer is their latest answer in a closed round; a panelist is scored only when they answered every calibration question that has a true value.",
];

/**
 * The P50 of the linear pool of P10 / P50 / P90 answers with these weights, on the answers' range
 * widened by 10% (the target questions' rule above; used as the panel figure of the
 * performance-weighted panel leg). Every answer the same number: that number.
 */
export function targetPoolMedian(answers: readonly { low: number; mid: number; high: number }[], weights: readonly number[]): number {
  const assessments = answers.map((a) => [a.low, a.mid, a.high] as Assessment);
  const background = backgroundFor(assessments.flat());
  const range = intrinsicRange(assessments, null, background);
  if (!(range[1] > range[0])) return answers[0].mid;
  return pooledQuantiles(assessments, weights, range, [0.5], background, TARGET_LEVELS)[0];
}

/** The result from plain inputs (no I/O). `answers` maps question id → final answers. */
export function computeCalibration(
  questions: readonly { id: string; text: string; unit: string; answerFormat: string; aggregation: string; calibration: boolean; trueValue: number | null }[],
  answers: ReadonlyMap<string, readonly FinalAnswer[]>,
): CalibrationData {
  const calibrationQs = questions.filter((q) => q.calibration);
  const counted = calibrationQs.filter((q) => q.trueValue !== null && (answers.get(q.id) ?? []).some((a) => a.low !== null && a.high !== null));
  const people = new Map<string, string>();
  for (const q of questions) for (const a of answers.get(q.id) ?? []) people.set(a.invitationId, a.pseudonym);
  const answeredBy = (invitationId: string) => counted.filter((q) => (answers.get(q.id) ?? []).some((a) => a.invitationId === invitationId && a.low !== null && a.high !== null)).length;
  const scoredIds = [...people.keys()].filter((id) => counted.length > 0 && answeredBy(id) === counted.length);
  const empty: CalibrationData = { report: { calibrationQuestions: calibrationQs.length, counted: counted.length, waiting: null, panelists: [], pools: null, outOfSample: null, verdict: "", targets: [], method: METHOD }, weights: new Map() };

  let waiting: string | null = null;
  if (calibrationQs.length === 0) return empty;
  if (calibrationQs.every((q) => q.trueValue === null)) waiting = "No calibration question has its true value yet: enter them on the panel page (or PUT …/true-value) to score the panelists.";
  else if (counted.length === 0) waiting = "No calibration question with a true value has answers from a closed round yet.";
  else if (scoredIds.length === 0) waiting = `No panelist has answered all ${counted.length} calibration questions with a true value.`;

  const weights = new Map<string, number>();
  let pools: CalibrationReport["pools"] = null;
  let outOfSample: CalibrationReport["outOfSample"] = null;
  let verdict = waiting ?? "";
  const scores = new Map<string, { binCounts: readonly number[]; calibration: number; information: number; combined: number }>();
  if (!waiting) {
    const cq: CalibrationQuestion[] = counted.map((q) => {
      const byId = new Map((answers.get(q.id) ?? []).map((a) => [a.invitationId, a]));
      const assessments = scoredIds.map((id) => {
        const a = byId.get(id)!;
        return [a.low!, a.value, a.high!] as Assessment;
      });
      return { assessments, realisation: q.trueValue!, background: backgroundFor([...assessments.flat(), q.trueValue!]) };
    });
    let s, pw, ew;
    try {
      s = panelistScores(cq);
      pw = performanceWeightedPool(cq);
      ew = equalWeightPool(cq);
    } catch (error) {
      // e.g. every answer and the true value of a question the same number: no range to score on.
      if (!(error instanceof RangeError)) throw error;
      const reason = `The calibration questions cannot be scored: ${error.message}.`;
      return { ...empty, report: { ...empty.report, waiting: reason, verdict: reason } };
    }
    scoredIds.forEach((id, e) => {
      scores.set(id, s[e]);
      weights.set(id, pw.weights[e]);
    });
    pools = { equal: poolScore(ew.score), performance: { ...poolScore(pw.score), cutoff: pw.cutoff } };
    if (cq.length >= 2) {
      const cv = leaveOneOut(cq);
      const withCombined = (x: { binCounts: readonly number[]; calibration: number; information: number }) => poolScore({ ...x, combined: x.calibration * x.information });
      const perf = withCombined(cv.performance);
      const eq = withCombined(cv.equal);
      const helped = perf.combined > eq.combined;
      outOfSample = { questions: cq.length, equal: eq, performance: perf, weightingHelped: helped };
      const f = (v: number) => v.toPrecision(2);
      verdict =
        `Out of sample (each of the ${cq.length} calibration questions left out in turn), the performance-weighted pool scored calibration ${f(perf.calibration)} × information ${f(perf.information)} = ${f(perf.combined)}, ` +
        `the equal-weight pool ${f(eq.calibration)} × ${f(eq.information)} = ${f(eq.combined)}: ` +
        (helped ? "weighting helped on this panel." : perf.combined === eq.combined ? "weighting made no difference on this panel." : "weighting did not help on this panel; equal weights did at least as well.") +
        (cq.length < FEW_CALIBRATION_QUESTIONS ? ` With only ${cq.length} calibration questions this comparison is rough (about ${FEW_CALIBRATION_QUESTIONS} are usual).` : "");
    } else {
      verdict = "With one calibration question there is nothing to leave out: add at least one more to see whether weighting helps on this panel.";
    }
  }

  const panelists: PanelistCalibration[] = [...people.entries()]
    .map(([id, pseudonym]) => {
      const sc = scores.get(id);
      return {
        pseudonym,
        answered: answeredBy(id),
        scored: sc !== undefined,
        binCounts: sc ? [...sc.binCounts] : null,
        calibration: sc?.calibration ?? null,
        information: sc?.information ?? null,
        combined: sc?.combined ?? null,
        weight: weights.get(id) ?? null,
      };
    })
    .sort((a, b) => (a.pseudonym < b.pseudonym ? -1 : a.pseudonym > b.pseudonym ? 1 : 0));

  const targets: TargetPools[] = questions
    .filter((q) => !q.calibration)
    .map((q) => {
      const base = { questionId: q.id, text: q.text, unit: q.unit };
      if (q.answerFormat !== "three-point" || q.aggregation !== "shared") {
        return { ...base, answers: 0, equal: null, performance: null, note: "Not pooled: only three-point questions with a shared quantity give percentiles to pool." };
      }
      const as = (answers.get(q.id) ?? []).filter((a) => a.low !== null && a.high !== null);
      if (as.length === 0) return { ...base, answers: 0, equal: null, performance: null, note: "No answers from a closed round yet." };
      const assessments = as.map((a) => [a.low!, a.value, a.high!] as Assessment);
      const background = backgroundFor(assessments.flat());
      const range = intrinsicRange(assessments, null, background);
      if (!(range[1] > range[0])) return { ...base, answers: as.length, equal: null, performance: null, note: "Every answer is the same number: there is no range to pool on." };
      const pool = (w: readonly number[]) => percentiles(pooledQuantiles(assessments, w, range, POOL_LEVELS, background, TARGET_LEVELS));
      const equal = pool(as.map(() => 1));
      const pw = as.map((a) => weights.get(a.invitationId) ?? 0);
      const performance = pw.some((w) => w > 0) ? pool(pw) : null;
      const note = performance
        ? null
        : waiting
          ? `No performance-weighted pool yet: ${waiting}`
          : "No performance-weighted pool: no panelist with a performance weight above 0 answered this question.";
      return { ...base, answers: as.length, equal, performance, note };
    });

  return { report: { calibrationQuestions: calibrationQs.length, counted: counted.length, waiting, panelists, pools, outOfSample, verdict, targets, method: METHOD }, weights };
}
