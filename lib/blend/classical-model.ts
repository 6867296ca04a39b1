/**
 * Cooke's classical model of structured expert judgment (docs/methods.md §21): each panelist gives
 * the 5th, 50th and 95th percentiles on calibration questions whose true values are known; the
 * panelist's calibration and information scores weigh their answers to the questions that matter.
 *
 * Sources: R. M. Cooke (1991), *Experts in Uncertainty*, Oxford University Press (chapters on
 * calibration, information and the classical model — from a secondary source, teaching notes,
 * not the book); R. M. Cooke and L. H. J. Goossens (2008), "TU Delft expert judgment data base",
 * *Reliability Engineering & System Safety* 93(5), 657–674; A. R. Colson and R. M. Cooke (2017),
 * "Cross validation for the classical model of structured expert judgment", *RESS* 163, 109–120
 * (details from memory).
 *
 * Policy: quantiles must be finite and non-decreasing (q5 ≤ q50 ≤ q95), realisations finite;
 * the log-uniform background needs every value above 0; no panelist or no question throws a
 * RangeError naming the input. Ties are read as in the sources: x ≤ q5 is bin 1, q5 < x ≤ q50
 * bin 2, q50 < x ≤ q95 bin 3, x > q95 bin 4.
 */
import { normalSurvival } from "../stats/normal";

/** The probabilities of the four inter-quantile bins of a 5/50/95 assessment. */
export const BIN_PROBABILITIES = [0.05, 0.45, 0.45, 0.05] as const;
/** The quantile levels asked for. */
export const QUANTILE_LEVELS = [0.05, 0.5, 0.95] as const;
/** Overshoot of the intrinsic range on each side (common choice in the sources: 10%). */
export const OVERSHOOT = 0.1;

/** A panelist's 5th, 50th and 95th percentiles for one question. */
export type Assessment = readonly [number, number, number];

/** Uniform or log-uniform background measure for the information score. */
export type Background = "uniform" | "log-uniform";

/** Orders of magnitude (as a ratio, largest / smallest) from which a question's values get the log-uniform background. */
export const LOG_BACKGROUND_RATIO = 100;

/**
 * The background for a question's values (percentiles and, if known, the true value): log-uniform
 * when every value is above 0 and they span at least two orders of magnitude (largest / smallest ≥
 * {@link LOG_BACKGROUND_RATIO}), else uniform. The sources leave the choice to the analyst for
 * "quantities spanning orders of magnitude" (Cooke 1991; Cooke & Goossens 2008); the factor 100 is
 * common practice, not from the sources. Empty input or any value that is not finite: uniform (the
 * scores' own checks then name the bad value).
 */
export function backgroundFor(values: readonly number[]): Background {
  if (values.length === 0 || !values.every((v) => Number.isFinite(v) && v > 0)) return "uniform";
  return Math.max(...values) / Math.min(...values) >= LOG_BACKGROUND_RATIO ? "log-uniform" : "uniform";
}

function checkAssessment(a: Assessment, where: string): void {
  if (!a.every(Number.isFinite)) throw new RangeError(`${where}: percentiles must be finite numbers`);
  if (!(a[0] <= a[1] && a[1] <= a[2])) throw new RangeError(`${where}: percentiles must not decrease (5th ≤ 50th ≤ 95th)`);
}

/** Which inter-quantile bin (0–3) the realisation falls in. */
export function binOf(a: Assessment, x: number): 0 | 1 | 2 | 3 {
  if (x <= a[0]) return 0;
  if (x <= a[1]) return 1;
  if (x <= a[2]) return 2;
  return 3;
}

/**
 * Relative information I(s, p) = Σ s_k ln(s_k / p_k) of the empirical bin shares s against
 * p = (0.05, 0.45, 0.45, 0.05); a share of 0 adds 0 (Cooke 1991).
 */
export function relativeInformation(shares: readonly number[], p: readonly number[] = BIN_PROBABILITIES): number {
  let sum = 0;
  shares.forEach((s, k) => {
    if (s > 0) sum += s * Math.log(s / p[k]);
  });
  return sum;
}

/**
 * P(χ²₃ > x), the upper tail of chi-square with 3 degrees of freedom, in closed form:
 * 2·(1 − Φ(√x)) + √(2x/π)·e^{−x/2} (Abramowitz & Stegun 1964, 26.4.5 with ν = 3).
 */
export function chiSquare3Survival(x: number): number {
  if (Number.isNaN(x) || x < 0) throw new RangeError(`chiSquare3Survival: x must be ≥ 0 (got ${x})`);
  if (x === 0) return 1;
  return 2 * normalSurvival(Math.sqrt(x)) + Math.sqrt((2 * x) / Math.PI) * Math.exp(-x / 2);
}

/**
 * Calibration score: the p-value of 2N·I(s, p) under χ² with 3 degrees of freedom, where s are the
 * shares of the N realisations in the four bins (Cooke 1991). 1 is perfect; small values say the
 * panelist's percentiles rarely hold the truth where they claim to.
 * @throws RangeError for no calibration question or a count below 0.
 */
export function calibrationScore(binCounts: readonly number[]): number {
  const n = binCounts.reduce((a, c) => a + c, 0);
  if (binCounts.length !== 4 || binCounts.some((c) => !(Number.isInteger(c) && c >= 0))) throw new RangeError("calibrationScore: give four whole, non-negative bin counts");
  if (n === 0) throw new RangeError("calibrationScore: needs at least one calibration question");
  return chiSquare3Survival(2 * n * relativeInformation(binCounts.map((c) => c / n)));
}

/** A question's intrinsic range [L*, U*]: every percentile and the realisation, widened by OVERSHOOT each side. */
export function intrinsicRange(assessments: readonly Assessment[], realisation: number | null, background: Background = "uniform"): readonly [number, number] {
  const values = assessments.flat().concat(realisation === null ? [] : [realisation]);
  if (values.length === 0) throw new RangeError("intrinsicRange: no values");
  if (background === "log-uniform" && values.some((v) => !(v > 0))) throw new RangeError("intrinsicRange: a log-uniform background needs every value above 0");
  const t = background === "log-uniform" ? values.map(Math.log) : values;
  const lo = Math.min(...t);
  const hi = Math.max(...t);
  const pad = OVERSHOOT * (hi - lo);
  return background === "log-uniform" ? [Math.exp(lo - pad), Math.exp(hi + pad)] : [lo - pad, hi + pad];
}

/**
 * Information of one assessment relative to the background on [L*, U*]: the minimum-information
 * density (uniform within each bin) against the uniform (or log-uniform) density:
 * I = Σ_k p_k ln(p_k / (x_k − x_{k−1})) + ln(U* − L*), with x_0 = L*, x_1..3 the percentiles,
 * x_4 = U* (on the log scale for a log-uniform background). A bin of zero width (equal
 * percentiles) is given a width of 1e-12 of the range so that the score stays finite.
 */
export function informationScore(a: Assessment, range: readonly [number, number], background: Background = "uniform"): number {
  checkAssessment(a, "informationScore");
  const tr = (v: number) => (background === "log-uniform" ? Math.log(v) : v);
  const x = [tr(range[0]), tr(a[0]), tr(a[1]), tr(a[2]), tr(range[1])];
  const width = x[4] - x[0];
  if (!(width > 0)) throw new RangeError("informationScore: the intrinsic range has no width");
  let sum = Math.log(width);
  for (let k = 1; k <= 4; k++) {
    const w = Math.max(x[k] - x[k - 1], 1e-12 * width);
    sum += BIN_PROBABILITIES[k - 1] * Math.log(BIN_PROBABILITIES[k - 1] / w);
  }
  return sum;
}

/** One calibration question: every panelist's assessment (same order) and the true value. */
export interface CalibrationQuestion {
  readonly assessments: readonly Assessment[];
  readonly realisation: number;
  readonly background?: Background;
}

/** A panelist's scores over the calibration questions. */
export interface PanelistScore {
  readonly binCounts: readonly [number, number, number, number];
  readonly calibration: number;
  /** Mean information over the calibration questions. */
  readonly information: number;
  /** calibration × information. */
  readonly combined: number;
}

function checkQuestions(questions: readonly CalibrationQuestion[]): number {
  if (questions.length === 0) throw new RangeError("classical model: needs at least one calibration question");
  const k = questions[0].assessments.length;
  if (k === 0) throw new RangeError("classical model: needs at least one panelist");
  questions.forEach((q, j) => {
    if (q.assessments.length !== k) throw new RangeError(`classical model: question ${j + 1} has ${q.assessments.length} assessments, not ${k}`);
    if (!Number.isFinite(q.realisation)) throw new RangeError(`classical model: question ${j + 1}'s true value must be a finite number`);
    q.assessments.forEach((a, e) => checkAssessment(a, `question ${j + 1}, panelist ${e + 1}`));
  });
  return k;
}

/** Every panelist's calibration, information and combined score (Cooke 1991). */
export function panelistScores(questions: readonly CalibrationQuestion[]): PanelistScore[] {
  const k = checkQuestions(questions);
  const ranges = questions.map((q) => intrinsicRange(q.assessments, q.realisation, q.background));
  return Array.from({ length: k }, (_, e) => {
    const counts: [number, number, number, number] = [0, 0, 0, 0];
    let info = 0;
    questions.forEach((q, j) => {
      counts[binOf(q.assessments[e], q.realisation)]++;
      info += informationScore(q.assessments[e], ranges[j], q.background);
    });
    const calibration = calibrationScore(counts);
    const information = info / questions.length;
    return { binCounts: counts, calibration, information, combined: calibration * information };
  });
}

/** The levels of a three-quantile assessment, increasing inside (0, 1): (0.05, 0.5, 0.95) on calibration questions. */
export type AssessedLevels = readonly [number, number, number];

/**
 * The linear pool's CDF at t (on the working scale: ln x for a log-uniform background): Σ w_e F_e(t)
 * with weights summing to 1, F_e the minimum-information CDF of assessment e, piecewise linear
 * through (L*, 0), (q_1, level_1), (q_2, level_2), (q_3, level_3), (U*, 1) — for a 5/50/95
 * assessment (L*, 0), (q5, 0.05), (q50, 0.5), (q95, 0.95), (U*, 1). `knots` holds each
 * assessment's five x values; a bin of zero width is a jump.
 */
function pooledCdf(knots: readonly (readonly number[])[], w: readonly number[], ps: readonly number[], t: number): number {
  let sum = 0;
  for (let e = 0; e < knots.length; e++) {
    if (w[e] === 0) continue;
    const xs = knots[e];
    let f = 1;
    if (t <= xs[0]) f = 0;
    else if (t < xs[4]) {
      for (let k = 1; k <= 4; k++) {
        if (t <= xs[k]) {
          const width = xs[k] - xs[k - 1];
          f = width > 0 ? ps[k - 1] + ((ps[k] - ps[k - 1]) * (t - xs[k - 1])) / width : ps[k];
          break;
        }
      }
    }
    sum += w[e] * f;
  }
  return sum;
}

/**
 * The pooled distribution's quantiles (the linear opinion pool F = Σ w_e F_e of the panelists'
 * minimum-information distributions; Stone 1961, Cooke 1991) at the given levels: the smallest x
 * with F(x) ≥ p. F is piecewise linear between the assessments' percentiles (on ln x for a
 * log-uniform background), so the quantile is found exactly: the segment by bisection over the
 * sorted knots, then the line through F inside it (a jump — equal percentiles — gives its knot).
 * The assessments are 5/50/95 percentiles unless `assessedLevels` says otherwise (a target
 * question asked as P10/P50/P90: the same minimum-information CDF through those levels).
 * @throws RangeError for weights that are negative, not one per panelist, or all zero; levels
 * outside (0, 1); assessed levels that do not increase inside (0, 1); a bad assessment.
 */
export function pooledQuantiles(
  assessments: readonly Assessment[],
  weights: readonly number[],
  range: readonly [number, number],
  levels: readonly number[] = QUANTILE_LEVELS,
  background: Background = "uniform",
  assessedLevels: AssessedLevels = QUANTILE_LEVELS,
): number[] {
  if (weights.length !== assessments.length) throw new RangeError("pooledQuantiles: one weight per panelist");
  if (!(0 < assessedLevels[0] && assessedLevels[0] < assessedLevels[1] && assessedLevels[1] < assessedLevels[2] && assessedLevels[2] < 1)) {
    throw new RangeError("pooledQuantiles: the assessed levels must increase inside (0, 1)");
  }
  assessments.forEach((a, e) => checkAssessment(a, `pooledQuantiles, panelist ${e + 1}`));
  if (levels.some((p) => !(p > 0 && p < 1))) throw new RangeError("pooledQuantiles: levels must lie inside (0, 1)");
  const total = weights.reduce((s, w) => s + w, 0);
  if (weights.some((w) => !(w >= 0)) || !(total > 0)) throw new RangeError("pooledQuantiles: weights must be ≥ 0 and not all 0");
  return preparedQuantiles(preparePool(assessments, range, background, assessedLevels), weights, levels);
}

/** What a pool's quantiles need that does not depend on the weights: each assessment's knots and all knots sorted. */
interface PreparedPool {
  readonly log: boolean;
  readonly ps: readonly number[];
  readonly knots: readonly (readonly number[])[];
  readonly xs: readonly number[];
}

function preparePool(assessments: readonly Assessment[], range: readonly [number, number], background: Background, assessedLevels: AssessedLevels): PreparedPool {
  const log = background === "log-uniform";
  const tr = (x: number) => (log ? Math.log(x) : x);
  const lo = tr(range[0]);
  const hi = tr(range[1]);
  const knots = assessments.map((a) => [lo, tr(a[0]), tr(a[1]), tr(a[2]), hi]);
  const xs = [...new Set(knots.flat().map((x) => Math.min(hi, Math.max(lo, x))))].sort((a, b) => a - b);
  return { log, ps: [0, assessedLevels[0], assessedLevels[1], assessedLevels[2], 1], knots, xs };
}

/** {@link pooledQuantiles} on a prepared pool (weights ≥ 0, not all 0, not yet normalised). */
function preparedQuantiles(prep: PreparedPool, weights: readonly number[], levels: readonly number[]): number[] {
  const { log, ps, knots, xs } = prep;
  const total = weights.reduce((s, v) => s + v, 0);
  const w = weights.map((v) => v / total);
  const F = (t: number) => pooledCdf(knots, w, ps, t);
  return levels.map((p) => {
    // The first knot with F ≥ p (F(L*) = 0 < p, F(U*) = 1 ≥ p).
    let a = 0;
    let b = xs.length - 1;
    if (b <= 0) return log ? Math.exp(xs[0]) : xs[0];
    while (b - a > 1) {
      const m = (a + b) >> 1;
      if (F(xs[m]) >= p) b = m;
      else a = m;
    }
    // F is linear inside (xs[a], xs[b]): its line from two inner points gives both one-sided limits.
    const x0 = xs[a];
    const x1 = xs[b];
    const t1 = x0 + (x1 - x0) / 3;
    const t2 = x0 + (2 * (x1 - x0)) / 3;
    const f1 = F(t1);
    const slope = (F(t2) - f1) / (t2 - t1);
    const left = f1 - slope * (t1 - x0);
    const right = f1 + slope * (x1 - t1);
    let t: number;
    if (left >= p) t = x0;
    else if (right >= p && slope > 0) t = Math.min(x1, Math.max(x0, x0 + (p - left) / slope));
    else t = x1;
    return log ? Math.exp(t) : t;
  });
}

/** The pool of a weighting, scored as one more panelist on the same questions. */
export interface PoolResult {
  /** Normalised weights, one per panelist. */
  readonly weights: readonly number[];
  /** The calibration cut-off α used (panelists below it get weight 0); null for equal weights. */
  readonly cutoff: number | null;
  readonly score: PanelistScore;
}

/**
 * The pool scored as one more panelist: its 5/50/95 percentiles on each calibration question,
 * scored on the panelists' intrinsic ranges (the pool does not widen them).
 */
function poolScore(questions: readonly PreparedQuestion[], weights: readonly number[]): PanelistScore {
  const counts: [number, number, number, number] = [0, 0, 0, 0];
  let info = 0;
  for (const { q, bg, range, prep } of questions) {
    const pooled = preparedQuantiles(prep, weights, QUANTILE_LEVELS) as unknown as Assessment;
    counts[binOf(pooled, q.realisation)]++;
    info += informationScore(pooled, range, bg);
  }
  const calibration = calibrationScore(counts);
  const information = info / questions.length;
  return { binCounts: counts, calibration, information, combined: calibration * information };
}

/** A calibration question with its intrinsic range and prepared pool, made once per question set. */
interface PreparedQuestion {
  readonly q: CalibrationQuestion;
  readonly bg: Background;
  readonly range: readonly [number, number];
  readonly prep: PreparedPool;
}

/** The questions prepared for pooling once (the cut-off search pools them once per candidate cut-off). */
function prepared(questions: readonly CalibrationQuestion[]): PreparedQuestion[] {
  return questions.map((q) => {
    const bg = q.background ?? "uniform";
    const range = intrinsicRange(q.assessments, q.realisation, bg);
    return { q, bg, range, prep: preparePool(q.assessments, range, bg, QUANTILE_LEVELS) };
  });
}

/** Equal weights over all panelists, scored as a pool. */
export function equalWeightPool(questions: readonly CalibrationQuestion[]): PoolResult {
  const k = checkQuestions(questions);
  const weights = Array<number>(k).fill(1 / k);
  return { weights, cutoff: null, score: poolScore(prepared(questions), weights) };
}

/**
 * The performance-weighted pool (Cooke 1991; Cooke & Goossens 2008): weights ∝ calibration ×
 * information for panelists whose calibration is at least α, with α chosen among the panelists'
 * calibration scores to maximise the pool's own combined score on the calibration questions
 * (the "optimised" decision maker). Ties go to the smaller α (more panelists kept).
 */
export function performanceWeightedPool(questions: readonly CalibrationQuestion[]): PoolResult {
  const scores = panelistScores(questions);
  const cutoffs = [...new Set(scores.map((s) => s.calibration))].sort((a, b) => a - b);
  const ready = prepared(questions);
  let best: PoolResult | null = null;
  for (const alpha of cutoffs) {
    const raw = scores.map((s) => (s.calibration >= alpha ? s.combined : 0));
    const sum = raw.reduce((a, v) => a + v, 0);
    if (!(sum > 0)) continue;
    const weights = raw.map((v) => v / sum);
    const score = poolScore(ready, weights);
    if (!best || score.combined > best.score.combined) best = { weights, cutoff: alpha, score };
  }
  return best ?? equalWeightPool(questions);
}

/** Out-of-sample comparison of the two pools: each calibration question left out in turn. */
export interface CrossValidation {
  /** Bin counts of the left-out true values in each pool's 5/50/95 percentiles. */
  readonly performance: { readonly binCounts: readonly number[]; readonly calibration: number; readonly information: number };
  readonly equal: { readonly binCounts: readonly number[]; readonly calibration: number; readonly information: number };
}

/**
 * Leave-one-question-out validation (after Colson & Cooke 2017, who use larger training subsets):
 * for each calibration question j, the performance weights are found on the others and both pools
 * are formed for j; the left-out true values' bins give each pool's out-of-sample calibration, and
 * the pools' information on j is averaged. Needs at least 2 calibration questions.
 */
export function leaveOneOut(questions: readonly CalibrationQuestion[]): CrossValidation {
  const k = checkQuestions(questions);
  if (questions.length < 2) throw new RangeError("leaveOneOut: needs at least 2 calibration questions");
  const perf = [0, 0, 0, 0];
  const eq = [0, 0, 0, 0];
  let perfInfo = 0;
  let eqInfo = 0;
  questions.forEach((q, j) => {
    const training = questions.filter((_, i) => i !== j);
    const w = performanceWeightedPool(training).weights;
    const range = intrinsicRange(q.assessments, q.realisation, q.background);
    const bg = q.background ?? "uniform";
    const pw = pooledQuantiles(q.assessments, w, range, QUANTILE_LEVELS, bg) as unknown as Assessment;
    const ew = pooledQuantiles(q.assessments, Array<number>(k).fill(1), range, QUANTILE_LEVELS, bg) as unknown as Assessment;
    perf[binOf(pw, q.realisation)]++;
    eq[binOf(ew, q.realisation)]++;
    perfInfo += informationScore(pw, range, bg);
    eqInfo += informationScore(ew, range, bg);
  });
  const n = questions.length;
  return {
    performance: { binCounts: perf, calibration: calibrationScore(perf), information: perfInfo / n },
    equal: { binCounts: eq, calibration: calibrationScore(eq), information: eqInfo / n },
  };
}
