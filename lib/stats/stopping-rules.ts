/**
 * Delphi stopping rules: stability first, consensus reported beside it, and the round limit;
 * the recommendation built from them. Also the default settings and the text of their sources,
 * exported from here so that every page and the API show the same thing (the project's
 * DEVELOPERS.md "Rules the panel and the blend follow" maps each rule to its source).
 *
 * Rules, as their sources state them:
 * - Stability decides. Dajani, Sincoff & Talley (1979), "Stability and agreement criteria for
 *   the termination of Delphi studies", TFSC 13, 83–90, put stability of the group's responses
 *   before agreement: a round that no longer changes the responses ends the study, agreed or not;
 *   von der Gracht (2012), TFSC 79(8), 1525–1536, judges consensus not a suitable stopping rule
 *   on its own. So consensus alone never settles a question here.
 * - Stability is a change in the response *distribution* between rounds, not in the median:
 *   Scheibe, Skutsch & Schofer (1975), "Experiments in Delphi methodology", in Linstone &
 *   Turoff (eds.), The Delphi Method, ch. IV.C, count the net "units of change" of participants
 *   between response classes over the number of participants, and call under 15% stable
 *   (read from secondary accounts; the chapter's opening only was checked). Numeric estimates
 *   have no response classes, so Triangulate uses the previous round's quartiles (Hyndman & Fan
 *   type 7) as class limits — four classes x ≤ Q1, Q1 < x ≤ M, M < x ≤ Q3, x > Q3 — and the
 *   change is ½·Σ_k |p_k(current) − p_k(previous)|, the share of participants who would have
 *   to move class to turn one round's distribution into the other ({@link distributionChange}).
 * - Sum of parts: the panelists estimate different quantities, so consensus does not apply
 *   ({@link consensusApplies}, the one function every view asks) and stability is judged on
 *   the total (relative change of the sum of the parts).
 * - Consensus (reported, never stopping alone): relative IQR = IQR / |median| or CV = s / x̄
 *   at or under the threshold.
 * - Round limit: the round number has reached the limit.
 *
 * Recommendation: "stop" when every question is stable or the round limit is reached,
 * otherwise "another-round". A stable question without consensus is reported as stable
 * disagreement: more rounds would not be expected to close it, and the spread is the finding.
 *
 * Pure: no framework imports. Missing figures (a question nobody answered, an undefined CV)
 * make the rule "not met" with a null value, never an error.
 */
import { quantile } from "./quantile";

export type ConsensusMeasure = "relative-iqr" | "cv";

/** A default value and where it comes from, for display beside the setting. */
export interface RuleDefault<T> {
  readonly value: T;
  /** Citation and what it says. */
  readonly source: string;
  /** False when the number is a convention the project could not verify in the source. */
  readonly verified: boolean;
  /** What the UI must say about it. */
  readonly note: string;
}

/** Default stopping-rule settings with their sources (shown by the pages and the API). */
export const STOPPING_RULE_DEFAULTS = {
  consensusMeasure: {
    value: "relative-iqr" as ConsensusMeasure,
    source:
      "Linstone & Turoff (1975), ch. IV.A: the interquartile range is the usual spread reported in forecasting Delphis; English, J. M. and Kernan, G. L. (1976), Transportation Research 10, 1–8, propose CV bands instead.",
    verified: false,
    note: "Consensus is reported, never a reason to stop on its own. The CV bands of English & Kernan are quoted from memory; CV ≤ 0.5 would call answers from 9,000 to 30,000 agreement, so the default measure is the relative IQR.",
  },
  consensusThreshold: {
    cv: {
      value: 0.5,
      source: "English & Kernan (1976): CV ≤ 0.5 good consensus, 0.5–0.8 less than satisfactory, > 0.8 poor.",
      verified: false,
      note: "Convention: quoted from memory, not verified in the source (docs/methods.md §6).",
    },
    "relative-iqr": {
      value: 0.25,
      source: "No published threshold for the relative IQR of numeric estimates was found; 0.25 (the middle half of the answers within ±12.5% of the median) is Triangulate's own default.",
      verified: false,
      note: "Project convention, not a published finding: a 3:1 spread of answers (e.g. 9,000 to 30,000 spread evenly) does not meet it.",
    },
  },
  stabilityThreshold: {
    value: 0.15,
    source:
      "Usually credited to Scheibe, M., Skutsch, M. and Schofer, J. (1975), 'Experiments in Delphi methodology', in Linstone & Turoff (eds.), The Delphi Method: a change of under 15% in the response distribution between rounds (net units of change over participants) counts as stable.",
    verified: false,
    note: "Convention: the 15% rule is quoted from secondary accounts; only the chapter's opening was checked. Measured on the distribution of the answers (share of panelists who changed quartile class), not on the median; on the total for sum-of-parts questions.",
  },
  roundLimit: {
    value: 3,
    source: "Linstone, H. A. and Turoff, M. (1975), The Delphi Method, ch. IV.A: early forecasting Delphis found three rounds were usually enough for stability.",
    verified: true,
    note: "Reported in the source (docs/methods.md §6).",
  },
} as const;

/** The default consensus threshold for a measure. */
export function defaultConsensusThreshold(measure: ConsensusMeasure): number {
  return STOPPING_RULE_DEFAULTS.consensusThreshold[measure].value;
}

/** A panel's stopping-rule settings. */
export interface StoppingRuleConfig {
  readonly consensusMeasure: ConsensusMeasure;
  readonly consensusThreshold: number;
  readonly stabilityThreshold: number;
  readonly roundLimit: number;
}

/** One question's figures in one round (null where undefined or nobody answered). */
export interface QuestionRoundFigures {
  readonly questionId: string;
  readonly aggregation: "shared" | "sum-of-parts";
  readonly n: number;
  readonly median: number | null;
  readonly iqr: number | null;
  readonly relativeIqr: number | null;
  readonly cv: number | null;
  /** Sum of the parts (sum-of-parts questions). */
  readonly total: number | null;
  /** The round's final answers (single values or middle values), for the distribution change; null when not loaded. */
  readonly values?: readonly number[] | null;
}

export interface ConsensusVerdict {
  readonly applicable: boolean;
  readonly measure: ConsensusMeasure;
  readonly value: number | null;
  readonly threshold: number;
  readonly met: boolean;
}

export interface StabilityVerdict {
  /** False in round 1 (nothing to compare with). */
  readonly applicable: boolean;
  /** Shared quantity: the change in the response distribution ({@link distributionChange}); decides. */
  readonly distributionChange: number | null;
  /** Shared quantity, shown for information only: relative changes of the median and the IQR. */
  readonly medianChange: number | null;
  readonly iqrChange: number | null;
  /** Sum of parts: relative change of the total; decides. */
  readonly totalChange: number | null;
  readonly threshold: number;
  readonly met: boolean;
}

export interface QuestionVerdict {
  readonly questionId: string;
  readonly consensus: ConsensusVerdict;
  readonly stability: StabilityVerdict;
  /** stability.met: consensus alone never settles a question. */
  readonly settled: boolean;
}

export interface StoppingEvaluation {
  readonly roundNumber: number;
  readonly questions: readonly QuestionVerdict[];
  readonly roundLimit: { readonly limit: number; readonly roundNumber: number; readonly met: boolean };
  readonly recommendation: "stop" | "another-round";
  /** Plain-language reasons for the recommendation. */
  readonly reasons: readonly string[];
}

/**
 * Relative change |current − previous| / |previous|; 0 when both are 0, ∞ when only the
 * previous is 0; null when either is missing.
 * @example relativeChange(100, 110) // 0.1
 */
export function relativeChange(previous: number | null, current: number | null): number | null {
  if (previous === null || current === null || !Number.isFinite(previous) || !Number.isFinite(current)) return null;
  if (previous === 0) return current === 0 ? 0 : Infinity;
  return Math.abs(current - previous) / Math.abs(previous);
}

const within = (v: number | null, limit: number) => v !== null && v <= limit;

/**
 * Whether a consensus measure (CV, relative IQR) means anything for a question: not for a sum of
 * parts, where panelists estimate different quantities. The one function every view and the
 * verdicts ask, so that no table shows a CV the verdict calls not applicable.
 */
export function consensusApplies(aggregation: "shared" | "sum-of-parts"): boolean {
  return aggregation !== "sum-of-parts";
}

/**
 * Change in the response distribution between two rounds, after Scheibe, Skutsch & Schofer
 * (1975) (see the module comment): class limits the previous round's quartiles (type 7);
 * p_k the share of a round's answers in class k; change = ½·Σ_k |p_k(current) − p_k(previous)|,
 * between 0 (same distribution over the classes) and 1. Null when either round has no answers.
 * @example distributionChange([10, 20, 30, 40], [10, 20, 30, 40]) // 0
 */
export function distributionChange(previous: readonly number[], current: readonly number[]): number | null {
  if (previous.length === 0 || current.length === 0) return null;
  const [q1, m, q3] = [0.25, 0.5, 0.75].map((p) => quantile(previous, p));
  const shares = (xs: readonly number[]) => {
    const c = [0, 0, 0, 0];
    for (const x of xs) c[x <= q1 ? 0 : x <= m ? 1 : x <= q3 ? 2 : 3]++;
    return c.map((k) => k / xs.length);
  };
  const a = shares(previous);
  const b = shares(current);
  return 0.5 * a.reduce((s, p, k) => s + Math.abs(b[k] - p), 0);
}

/** The consensus verdict for one question's figures (reported; it never stops a question alone). */
export function consensusVerdict(f: QuestionRoundFigures, config: StoppingRuleConfig): ConsensusVerdict {
  const measure = config.consensusMeasure;
  if (!consensusApplies(f.aggregation)) {
    return { applicable: false, measure, value: null, threshold: config.consensusThreshold, met: false };
  }
  const raw = measure === "cv" ? f.cv : f.relativeIqr;
  // CV is compared by magnitude (a negative mean gives a negative CV).
  const value = raw === null || !Number.isFinite(raw) ? null : measure === "cv" ? Math.abs(raw) : raw;
  return { applicable: true, measure, value, threshold: config.consensusThreshold, met: within(value, config.consensusThreshold) };
}

/**
 * The stability verdict between a question's previous and current figures: the change in the
 * response distribution ({@link distributionChange}) for a shared quantity, the relative change
 * of the total for a sum of parts, at or under the threshold.
 */
export function stabilityVerdict(
  previous: QuestionRoundFigures | null,
  current: QuestionRoundFigures,
  config: StoppingRuleConfig,
): StabilityVerdict {
  const threshold = config.stabilityThreshold;
  const none = { distributionChange: null, medianChange: null, iqrChange: null, totalChange: null, threshold };
  if (!previous) return { applicable: false, ...none, met: false };
  if (current.aggregation === "sum-of-parts") {
    const totalChange = relativeChange(previous.total, current.total);
    return { applicable: true, ...none, totalChange, met: within(totalChange, threshold) };
  }
  const change = previous.values && current.values ? distributionChange(previous.values, current.values) : null;
  return {
    applicable: true,
    ...none,
    distributionChange: change,
    medianChange: relativeChange(previous.median, current.median),
    iqrChange: relativeChange(previous.iqr, current.iqr),
    met: within(change, threshold),
  };
}

/**
 * Applies the three stopping rules after round `roundNumber` and recommends whether to stop.
 * `previous` holds the figures of round `roundNumber − 1` (null in round 1); questions are
 * matched by id.
 */
export function evaluateStoppingRules(input: {
  readonly roundNumber: number;
  readonly current: readonly QuestionRoundFigures[];
  readonly previous: readonly QuestionRoundFigures[] | null;
  readonly config: StoppingRuleConfig;
}): StoppingEvaluation {
  const { roundNumber, current, previous, config } = input;
  const questions = current.map((f): QuestionVerdict => {
    const prev = previous?.find((p) => p.questionId === f.questionId) ?? null;
    const consensus = consensusVerdict(f, config);
    const stability = stabilityVerdict(prev, f, config);
    return { questionId: f.questionId, consensus, stability, settled: stability.met };
  });
  const limitMet = roundNumber >= config.roundLimit;
  const allSettled = questions.length > 0 && questions.every((q) => q.settled);
  const reasons: string[] = [];
  if (limitMet) reasons.push(`Round ${roundNumber} has reached the round limit of ${config.roundLimit}.`);
  if (allSettled) reasons.push("Every question is stable: another round would not be expected to change the answers.");
  const disagreeing = questions.filter((q) => q.settled && q.consensus.applicable && !q.consensus.met).length;
  if (allSettled && disagreeing > 0) {
    reasons.push(`${disagreeing} stable ${disagreeing === 1 ? "question has" : "questions have"} not reached consensus: report the spread of views as the finding.`);
  }
  if (!limitMet && !allSettled) {
    const open = questions.filter((q) => !q.settled).length;
    reasons.push(`${open} of ${questions.length} ${questions.length === 1 ? "question" : "questions"} ${open === 1 ? "is" : "are"} not yet stable${roundNumber === 1 ? " (stability needs two rounds to compare; consensus alone does not stop a panel)" : ""}.`);
  }
  return {
    roundNumber,
    questions,
    roundLimit: { limit: config.roundLimit, roundNumber, met: limitMet },
    recommendation: limitMet || allSettled ? "stop" : "another-round",
    reasons,
  };
}
