/**
 * Delphi stopping rules: consensus, stability and round limit, and the recommendation built
 * from them. Also the default settings and the text of their sources, exported from here so
 * that every page and the API show the same thing (REFERENCES.md §6 records what was verified).
 *
 * Definitions (REFERENCES.md §6, "Formulas to implement"):
 * - Consensus: the chosen measure at or under its threshold. Measures: relative IQR =
 *   IQR / |median| (IQR by Hyndman & Fan type 7), or CV = s / x̄ (sample SD, divisor n − 1).
 * - Stability: the relative change of a statistic T between consecutive rounds,
 *   Δ = |T_r − T_{r−1}| / |T_{r−1}|, at or under the threshold for both the median and the
 *   IQR ("move by no more than a threshold", DESIGN.md). When T_{r−1} = 0, Δ = 0 if T_r = 0,
 *   else Δ = ∞ (not stable).
 * - Round limit: the round number has reached the limit.
 * For a sum-of-parts question the panelists estimate different quantities, so consensus does
 * not apply and stability is judged on the total (Δ of the sum of the parts).
 *
 * Recommendation: a question is *settled* when it meets the consensus rule or the stability
 * rule; the recommendation is "stop" when every question is settled or the round limit is
 * reached, otherwise "another-round". (von der Gracht 2012 judges consensus alone not a
 * suitable stopping rule, which is why stability also settles a question.)
 *
 * Pure: no framework imports. Missing figures (a question nobody answered, an undefined CV)
 * make the rule "not met" with a null value, never an error.
 */

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
    value: "cv" as ConsensusMeasure,
    source: "English, J. M. and Kernan, G. L. (1976), Transportation Research 10, 1–8: CV bands for numeric Delphi estimates.",
    verified: false,
    note: "Convention: the CV bands are quoted from memory and were not checked in the paper (REFERENCES.md §6).",
  },
  consensusThreshold: {
    cv: {
      value: 0.5,
      source: "English & Kernan (1976): CV ≤ 0.5 good consensus, 0.5–0.8 less than satisfactory, > 0.8 poor.",
      verified: false,
      note: "Convention: quoted from memory, not verified in the source (REFERENCES.md §6).",
    },
    "relative-iqr": {
      value: 0.5,
      source: "No published threshold for the relative IQR was found; 0.5 is Triangulate's own default.",
      verified: false,
      note: "Project convention, not a published finding. For normally spread answers IQR ≈ 1.35·SD, so this is stricter than CV ≤ 0.5.",
    },
  },
  stabilityThreshold: {
    value: 0.15,
    source:
      "Usually credited to Scheibe, M., Skutsch, M. and Schofer, J. (1975), 'Experiments in Delphi methodology', in Linstone & Turoff (eds.), The Delphi Method: under 15% change between rounds counts as stable.",
    verified: false,
    note: "Convention: the 15% rule is quoted from memory; only the chapter's opening was checked (REFERENCES.md §6).",
  },
  roundLimit: {
    value: 3,
    source: "Linstone, H. A. and Turoff, M. (1975), The Delphi Method, ch. IV.A: early forecasting Delphis found three rounds were usually enough for stability.",
    verified: true,
    note: "Reported in the source (REFERENCES.md §6).",
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
  readonly medianChange: number | null;
  readonly iqrChange: number | null;
  readonly totalChange: number | null;
  readonly threshold: number;
  readonly met: boolean;
}

export interface QuestionVerdict {
  readonly questionId: string;
  readonly consensus: ConsensusVerdict;
  readonly stability: StabilityVerdict;
  /** consensus.met || stability.met */
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

/** The consensus verdict for one question's figures. */
export function consensusVerdict(f: QuestionRoundFigures, config: StoppingRuleConfig): ConsensusVerdict {
  const measure = config.consensusMeasure;
  if (f.aggregation === "sum-of-parts") {
    return { applicable: false, measure, value: null, threshold: config.consensusThreshold, met: false };
  }
  const raw = measure === "cv" ? f.cv : f.relativeIqr;
  // CV is compared by magnitude (a negative mean gives a negative CV).
  const value = raw === null || !Number.isFinite(raw) ? null : measure === "cv" ? Math.abs(raw) : raw;
  return { applicable: true, measure, value, threshold: config.consensusThreshold, met: within(value, config.consensusThreshold) };
}

/** The stability verdict between a question's previous and current figures. */
export function stabilityVerdict(
  previous: QuestionRoundFigures | null,
  current: QuestionRoundFigures,
  config: StoppingRuleConfig,
): StabilityVerdict {
  const threshold = config.stabilityThreshold;
  if (!previous) return { applicable: false, medianChange: null, iqrChange: null, totalChange: null, threshold, met: false };
  if (current.aggregation === "sum-of-parts") {
    const totalChange = relativeChange(previous.total, current.total);
    return { applicable: true, medianChange: null, iqrChange: null, totalChange, threshold, met: within(totalChange, threshold) };
  }
  const medianChange = relativeChange(previous.median, current.median);
  const iqrChange = relativeChange(previous.iqr, current.iqr);
  return {
    applicable: true,
    medianChange,
    iqrChange,
    totalChange: null,
    threshold,
    met: within(medianChange, threshold) && within(iqrChange, threshold),
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
    return { questionId: f.questionId, consensus, stability, settled: consensus.met || stability.met };
  });
  const limitMet = roundNumber >= config.roundLimit;
  const allSettled = questions.length > 0 && questions.every((q) => q.settled);
  const reasons: string[] = [];
  if (limitMet) reasons.push(`Round ${roundNumber} has reached the round limit of ${config.roundLimit}.`);
  if (allSettled) reasons.push("Every question has reached consensus or is stable.");
  if (!limitMet && !allSettled) {
    const open = questions.filter((q) => !q.settled).length;
    reasons.push(`${open} of ${questions.length} question(s) have neither reached consensus nor stabilised.`);
  }
  return {
    roundNumber,
    questions,
    roundLimit: { limit: config.roundLimit, roundNumber, met: limitMet },
    recommendation: limitMet || allSettled ? "stop" : "another-round",
    reasons,
  };
}
