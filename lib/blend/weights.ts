/**
 * Blend weights for the panel figure against the baseline: equal, inverse-MSE from past
 * outcomes (Bates & Granger 1969), the two-forecast optimum with error correlation, or set by
 * the organiser. Each result carries the inputs behind the weight so a report can show them,
 * and says why it fell back to equal weights when history is too thin. Input policy: see `index.ts`.
 */
import { meanSquaredError } from "../forecast/accuracy";
import { neumaierSum } from "../stats/sum";
import { BIAS_PRIOR_STRENGTH } from "./track-record";
import { assertFinite, assertPositive, assertUnitInterval } from "../stats/validate";

/**
 * The panel's weight under equal weighting, 1/2: a robust default when there is no history to
 * estimate weights from. R. C. Blattberg and S. J. Hoch (1990) argue for combining a statistical
 * model and managers' judgement half and half: "Database models and managerial intuition:
 * 50% model + 50% manager", Management Science 36(8), 887–899 (the issue number is from
 * memory, see `index.ts`).
 */
export const EQUAL_PANEL_WEIGHT = 0.5;

/**
 * Fewest questions with an outcome for inverse-MSE weights; with fewer the weights fall back to
 * equal. The number is common practice (a judgement call), not a published threshold.
 */
export const MIN_OUTCOMES_FOR_WEIGHTS = 3;

/**
 * Prior standard deviation τ of the best panel weight around equal weights, 0.1 (the best weight
 * believed within about 0.3–0.7). The forecast-combination literature finds weights estimated
 * from short records losing to equal weights, and the simple average hard to beat (R. T. Clemen
 * 1989, "Combining forecasts: a review and annotated bibliography", IJF 5(4), 559–583; J. Smith and
 * K. F. Wallis 2009, Oxford Bull. Econ. Stat. 71(3), 331–355; V. Genre, G. Kenny, A. Meyler and
 * A. Timmermann 2013, "Combining expert forecasts: can anything beat the simple average?", IJF 29(1),
 * 108–121; volumes and pages from memory), i.e. best weights near equal. The value 0.1 is the
 * project's judgement from that finding, not a published figure (docs/methods.md §15c).
 */
export const WEIGHT_PRIOR_SD = 0.1;

/**
 * Fewest questions with an outcome for the optimum with error correlation, which estimates one more
 * quantity (the correlation) than inverse-MSE weights. Common practice, not a published threshold.
 */
export const MIN_OUTCOMES_FOR_CORRELATION = 5;

/**
 * The prior for the correlation of the panel's and the baseline's errors, 0.5, worth
 * {@link BIAS_PRIOR_STRENGTH} questions with an outcome: a panel and a model read partly the same
 * signals and tend to miss the same surprises, so their errors are positively correlated;
 * 0.5 is a judgement (common practice), not a published figure.
 */
export const PRIOR_ERROR_CORRELATION = 0.5;

/** How a weight was (to be) chosen. */
export type WeightRule = "equal" | "inverse-mse" | "optimal" | "organiser";

/** One question with an outcome: the actual value and the two figures that forecast it. */
export interface OutcomePair {
  readonly actual: number;
  /** The panel figure that was reported for the question. */
  readonly panel: number;
  /** The baseline's point forecast for the question. */
  readonly baseline: number;
}

/** A blend weight with everything behind it. */
export interface BlendWeights {
  /** The rule asked for. */
  readonly requested: WeightRule;
  /** The rule actually used (equal when the requested one fell back). */
  readonly applied: WeightRule;
  /** Weight on the panel figure, in [0, 1]. */
  readonly panel: number;
  /** Weight on the baseline, 1 − panel. */
  readonly baseline: number;
  /** Questions with an outcome behind the weight (0 for equal and organiser weights). */
  readonly nOutcomes: number;
  /** Mean squared error of the panel figure over the questions with an outcome (NaN if not used). */
  readonly msePanel: number;
  /** Mean squared error of the baseline over the questions with an outcome (NaN if not used). */
  readonly mseBaseline: number;
  /** Correlation of the two error series (about zero, as the MSEs); NaN unless the optimal rule ran. */
  readonly errorCorrelation: number;
  /**
   * Inverse-MSE rule: the weight from the MSEs alone, MSE_b / (MSE_p + MSE_b), before shrinking
   * toward equal; NaN for the other rules.
   */
  readonly rawPanel: number;
  /** Inverse-MSE rule: the credibility Z = τ²/(τ² + 1/(4(n + 1))) given to the history ({@link weightCredibility}); NaN for the other rules. */
  readonly credibility: number;
  /** The optimal rule's panel weight before clipping to [0, 1]; NaN for the other rules. */
  readonly unconstrainedPanel: number;
  /**
   * Expected MSE of the combination at the chosen weight,
   * (1 − λ)²σ_p² + λ²σ_b² + 2λ(1 − λ)ρσ_pσ_b with λ the baseline weight (ρ = 0 for the
   * inverse-MSE rule); NaN when no history was used.
   */
  readonly expectedMse: number;
  /** A sentence for the report: why this weight. */
  readonly reason: string;
}

/** The result of the two-forecast formula, {@link batesGrangerWeights}. */
export interface BatesGrangerOptimum {
  /** Weight on forecast 1 (the panel), 1 − λ_opt. */
  readonly w1: number;
  /** Weight on forecast 2 (the baseline), λ_opt. */
  readonly w2: number;
  /** Minimum MSE σ1²σ2²(1 − ρ²) / (σ1² + σ2² − 2ρσ1σ2). */
  readonly combinedMse: number;
}

/**
 * The MSE-minimising combination of two unbiased forecasts with error standard deviations
 * σ1, σ2 and error correlation ρ (J. M. Bates and C. W. J. Granger 1969, "The combination of
 * forecasts", Operational Research Quarterly 20(4), 451–468; formula as docs/methods.md §5a):
 * λ_opt = (σ1² − ρσ1σ2) / (σ1² + σ2² − 2ρσ1σ2) on forecast 2, 1 − λ_opt on forecast 1, and
 * minimum MSE σ1²σ2²(1 − ρ²) / (σ1² + σ2² − 2ρσ1σ2). With ρ = 0 this is inverse-variance
 * weighting. The weights are not constrained: when ρ > σ2/σ1 the weight on forecast 1 is
 * negative (callers that need [0, 1] clip, as {@link optimalWeights} does).
 *
 * Input: σ1, σ2 finite and ≥ 0; ρ in [−1, 1]. When the denominator is 0 (σ1 = σ2 and ρ = 1,
 * or both σ 0) every weight gives the same MSE and the weights are NaN (undefined).
 * @throws RangeError for a non-finite or negative σ, or ρ outside [−1, 1].
 * @example batesGrangerWeights(3, 2, 0.3) // w1 0.2340425532, w2 0.7659574468, MSE 3.4851063830
 */
export function batesGrangerWeights(sigma1: number, sigma2: number, rho: number): BatesGrangerOptimum {
  const fn = "batesGrangerWeights";
  assertPositive(sigma1, fn, "sigma1", true);
  assertPositive(sigma2, fn, "sigma2", true);
  assertFinite(rho, fn, "rho");
  if (rho < -1 || rho > 1) throw new RangeError(`${fn}: rho is ${rho}; a correlation must lie between -1 and 1`);
  const v1 = sigma1 * sigma1;
  const v2 = sigma2 * sigma2;
  const c = rho * sigma1 * sigma2;
  const den = v1 + v2 - 2 * c;
  if (!(den > 0)) return { w1: NaN, w2: NaN, combinedMse: NaN };
  const w2 = (v1 - c) / den;
  return { w1: 1 - w2, w2, combinedMse: (v1 * v2 * (1 - rho * rho)) / den };
}

/** A number for a sentence: 4 significant digits. */
function fmt(x: number): string {
  return String(Number(x.toPrecision(4)));
}

/** E[ε_c²] at baseline weight λ (docs/methods.md §5a). */
function combinationMse(lambda: number, v1: number, v2: number, cov: number): number {
  return (1 - lambda) * (1 - lambda) * v1 + lambda * lambda * v2 + 2 * lambda * (1 - lambda) * cov;
}

function result(
  requested: WeightRule,
  applied: WeightRule,
  panel: number,
  reason: string,
  extra: Partial<
    Pick<BlendWeights, "nOutcomes" | "msePanel" | "mseBaseline" | "rawPanel" | "credibility" | "errorCorrelation" | "unconstrainedPanel" | "expectedMse">
  > = {},
): BlendWeights {
  return {
    requested,
    applied,
    panel,
    baseline: 1 - panel,
    nOutcomes: extra.nOutcomes ?? 0,
    msePanel: extra.msePanel ?? NaN,
    mseBaseline: extra.mseBaseline ?? NaN,
    rawPanel: extra.rawPanel ?? NaN,
    credibility: extra.credibility ?? NaN,
    errorCorrelation: extra.errorCorrelation ?? NaN,
    unconstrainedPanel: extra.unconstrainedPanel ?? NaN,
    expectedMse: extra.expectedMse ?? NaN,
    reason,
  };
}

/**
 * Equal weights, 0.5 on the panel and 0.5 on the baseline ({@link EQUAL_PANEL_WEIGHT};
 * Blattberg & Hoch 1990).
 */
export function equalWeights(): BlendWeights {
  return result("equal", "equal", EQUAL_PANEL_WEIGHT, "Equal weights (50% panel, 50% baseline), a robust default (Blattberg & Hoch 1990).");
}

/**
 * A weight set by the organiser: `panelWeight` on the panel, 1 − panelWeight on the baseline.
 *
 * Input: panelWeight a finite number in [0, 1].
 * @throws RangeError when panelWeight is NaN, infinite or outside [0, 1].
 */
export function organiserWeights(panelWeight: number): BlendWeights {
  assertUnitInterval(panelWeight, "organiserWeights", "panelWeight");
  return result("organiser", "organiser", panelWeight, `Weight set by the organiser: ${panelWeight} on the panel.`);
}

/** Options for the history-based rules. */
export interface HistoryWeightOptions {
  /** Fewest questions with an outcome before the rule is used (default: the rule's named constant). */
  readonly minOutcomes?: number;
  /**
   * Inverse-MSE rule: prior standard deviation τ of the best panel weight around 0.5
   * (default {@link WEIGHT_PRIOR_SD}); see {@link weightCredibility}.
   */
  readonly priorSd?: number;
}

function checkHistory(history: readonly OutcomePair[], fn: string, minOutcomes: number): void {
  if (!Array.isArray(history)) throw new RangeError(`${fn}: history must be an array of questions with an outcome`);
  assertFinite(minOutcomes, fn, "minOutcomes");
  if (!Number.isInteger(minOutcomes) || minOutcomes < 1) {
    throw new RangeError(`${fn}: minOutcomes is ${minOutcomes}; it must be a whole number of at least 1`);
  }
  history.forEach((h, i) => {
    assertFinite(h.actual, fn, `history[${i}].actual`);
    assertFinite(h.panel, fn, `history[${i}].panel`);
    assertFinite(h.baseline, fn, `history[${i}].baseline`);
  });
}

function historyMses(history: readonly OutcomePair[]): { mseP: number; mseB: number; crossMoment: number } {
  const actual = history.map((h) => h.actual);
  const mseP = meanSquaredError(actual, history.map((h) => h.panel));
  const mseB = meanSquaredError(actual, history.map((h) => h.baseline));
  const crossMoment = neumaierSum(history.map((h) => (h.actual - h.panel) * (h.actual - h.baseline))) / history.length;
  return { mseP, mseB, crossMoment };
}

function thin(rule: WeightRule, n: number, min: number): BlendWeights {
  return result(
    rule,
    "equal",
    EQUAL_PANEL_WEIGHT,
    `Equal weights: only ${n} recorded outcome${n === 1 ? "" : "s"}, fewer than the ${min} needed for ${rule} weights (a common-practice minimum).`,
    { nOutcomes: n },
  );
}

/**
 * The weight given to the history's inverse-MSE weight against equal weights:
 * Z = τ²/(τ² + v_n), v_n = 1/(4(n + 1)), i.e. Z = (n + 1)/(n + 1 + 1/(4τ²)) — with τ = 0.1,
 * (n + 1)/(n + 26). This is the normal approximation to the posterior mean of the best weight
 * (precision weighting of prior and estimate: A. Gelman et al. 2013, Bayesian Data Analysis,
 * 3rd ed., §2.5, section from memory): prior N(0.5, τ²) ({@link WEIGHT_PRIOR_SD}); the raw weight
 * MSE_b/(MSE_p + MSE_b) of two equally good legs with independent normal errors is
 * Beta(n/2, n/2)-distributed (a ratio of χ²_n variables), with variance v_n = 1/(4(n + 1)).
 * With 3 questions with an outcome Z = 4/29 ≈ 0.14; the history gets half the say at n = 24.
 *
 * Input: n ≥ 0 a whole number, τ > 0 finite.
 * @throws RangeError for a bad n or τ.
 * @example weightCredibility(3) // 4/29 = 0.1379310345
 */
export function weightCredibility(n: number, priorSd: number = WEIGHT_PRIOR_SD): number {
  const fn = "weightCredibility";
  assertFinite(n, fn, "n");
  if (!Number.isInteger(n) || n < 0) throw new RangeError(`${fn}: n is ${n}; it must be a whole number of at least 0`);
  assertPositive(priorSd, fn, "priorSd");
  const t2 = priorSd * priorSd;
  return t2 / (t2 + 1 / (4 * (n + 1)));
}

/**
 * Inverse-MSE weights from past outcomes (Bates & Granger 1969 with the error correlation
 * set to 0; as the diagonal-only `comb_BG` of R package GeomComb, docs/methods.md §5a):
 * w_raw = (1/MSE_p) / (1/MSE_p + 1/MSE_b) = MSE_b / (MSE_p + MSE_b), MSE by
 * lib/forecast/accuracy `meanSquaredError` (errors actual − figure), then shrunk hard toward
 * equal weights: w = Z·w_raw + (1 − Z)·0.5 with Z from {@link weightCredibility} (prior sd
 * τ = {@link WEIGHT_PRIOR_SD}). Without the shrinkage, with 3 questions and two equally good
 * legs the raw weight lands anywhere from 0.10 to 0.90; weights estimated from few observations
 * lose to equal weights in practice (the "forecast combination puzzle": Clemen 1989; Smith &
 * Wallis 2009; Genre et al. 2013), so the history only takes over when it is long.
 *
 * Fallbacks (to equal weights, with the reason): fewer than `minOutcomes` questions (default
 * {@link MIN_OUTCOMES_FOR_WEIGHTS}), or both MSEs 0. One MSE of 0 gives that figure w_raw = 1.
 *
 * Input: questions with an outcome (possibly empty: thin history is an expected state).
 * @throws RangeError for a non-finite value in history (named by index), a bad minOutcomes or priorSd.
 * @example inverseMseWeights(history) // raw 0.1555555556 when MSE_p = 3.8 and MSE_b = 0.7, n = 5
 *   // → Z = 6/31, panel 0.5 + (6/31)·(0.1555555556 − 0.5) = 0.4333333333
 */
export function inverseMseWeights(history: readonly OutcomePair[], options: HistoryWeightOptions = {}): BlendWeights {
  const fn = "inverseMseWeights";
  const min = options.minOutcomes ?? MIN_OUTCOMES_FOR_WEIGHTS;
  const tau = options.priorSd ?? WEIGHT_PRIOR_SD;
  checkHistory(history, fn, min);
  assertPositive(tau, fn, "priorSd");
  const n = history.length;
  if (n < min) return thin("inverse-mse", n, min);
  const { mseP, mseB } = historyMses(history);
  const base = { nOutcomes: n, msePanel: mseP, mseBaseline: mseB };
  if (mseP + mseB === 0) {
    return result("inverse-mse", "equal", EQUAL_PANEL_WEIGHT, "Equal weights: both the panel and the baseline were exact on every question with an outcome.", base);
  }
  const raw = mseB / (mseP + mseB);
  const z = weightCredibility(n, tau);
  const w = z * raw + (1 - z) * EQUAL_PANEL_WEIGHT;
  return result(
    "inverse-mse",
    "inverse-mse",
    w,
    `Inverse-MSE weights (Bates & Granger 1969) from ${n} questions with an outcome: panel MSE ${fmt(mseP)}, baseline MSE ${fmt(mseB)}, ` +
      `raw panel weight ${fmt(raw)} shrunk toward 0.5 with credibility ${fmt(z)} ` +
      `(prior: the best weight within 0.5 ± ${fmt(2 * tau)}; estimated weights from short records lose to equal weights, Smith & Wallis 2009).`,
    { ...base, rawPanel: raw, credibility: z, expectedMse: combinationMse(1 - w, mseP, mseB, 0) },
  );
}

/**
 * The two-forecast optimum with error correlation (Bates & Granger 1969; {@link batesGrangerWeights}),
 * estimated from past outcomes: σ_p² = MSE_p, σ_b² = MSE_b and ρ = mean(e_p·e_b)/(σ_p·σ_b),
 * moments about zero as for MSE (the forecasts are taken as unbiased, as in the formula).
 * The panel weight 1 − λ_opt is clipped to [0, 1] so that the blend stays a mixture (a negative
 * weight would extrapolate beyond both figures); the reason says when it was clipped.
 *
 * Fallbacks (to equal weights, with the reason): fewer than `minOutcomes` questions (default
 * {@link MIN_OUTCOMES_FOR_CORRELATION}); both MSEs 0; identical error series (the optimum is
 * undefined). One MSE of 0 gives that figure weight 1.
 *
 * @throws RangeError for a non-finite value in history (named by index) or a bad minOutcomes.
 */
export function optimalWeights(history: readonly OutcomePair[], options: HistoryWeightOptions = {}): BlendWeights {
  const fn = "optimalWeights";
  const min = options.minOutcomes ?? MIN_OUTCOMES_FOR_CORRELATION;
  checkHistory(history, fn, min);
  const n = history.length;
  if (n < min) return thin("optimal", n, min);
  const { mseP, mseB, crossMoment } = historyMses(history);
  const base = { nOutcomes: n, msePanel: mseP, mseBaseline: mseB };
  if (mseP === 0 || mseB === 0) {
    if (mseP === 0 && mseB === 0) {
      return result("optimal", "equal", EQUAL_PANEL_WEIGHT, "Equal weights: both the panel and the baseline were exact on every question with an outcome.", base);
    }
    const w = mseP === 0 ? 1 : 0;
    return result("optimal", "optimal", w, `All weight on the ${w === 1 ? "panel" : "baseline"}: it was exact on all ${n} questions with an outcome.`, {
      ...base,
      expectedMse: 0,
    });
  }
  const sp = Math.sqrt(mseP);
  const sb = Math.sqrt(mseB);
  const rho = Math.max(-1, Math.min(1, crossMoment / (sp * sb)));
  const opt = batesGrangerWeights(sp, sb, rho);
  if (!Number.isFinite(opt.w1)) {
    return result("optimal", "equal", EQUAL_PANEL_WEIGHT, "Equal weights: the panel's and the baseline's errors were identical, so every weight gives the same MSE.", {
      ...base,
      errorCorrelation: rho,
    });
  }
  const w = Math.max(0, Math.min(1, opt.w1));
  const clipped = w !== opt.w1;
  return result(
    "optimal",
    "optimal",
    w,
    `Bates–Granger optimum with error correlation ${fmt(rho)} from ${n} questions with an outcome: panel MSE ${fmt(mseP)}, baseline MSE ${fmt(mseB)}` +
      (clipped ? `; the unconstrained panel weight ${fmt(opt.w1)} was clipped to ${w}.` : "."),
    { ...base, errorCorrelation: rho, unconstrainedPanel: opt.w1, expectedMse: combinationMse(1 - w, mseP, mseB, rho * sp * sb) },
  );
}

/** The error correlation used for the blend's range, with what it rests on. */
export interface ErrorCorrelation {
  /** ρ used: Z·ρ_history + (1 − Z)·ρ_prior. */
  readonly rho: number;
  /** ρ from the history alone, mean(e_p·e_b)/√(MSE_p·MSE_b) (NaN without usable history). */
  readonly historyRho: number;
  /** Questions with an outcome behind it. */
  readonly n: number;
  /** Credibility Z = n/(n + k) of the history. */
  readonly credibility: number;
}

/**
 * The correlation of the two legs' errors for the blend's range: the history's
 * ρ = mean(e_p·e_b)/√(MSE_p·MSE_b) (moments about zero, as {@link optimalWeights}), shrunk toward
 * {@link PRIOR_ERROR_CORRELATION} with credibility Z = n/(n + k), k = {@link BIAS_PRIOR_STRENGTH}
 * (Bühlmann 1967, as the bias factor). Without usable history (none, or a leg exact every time)
 * it is the prior.
 * @throws RangeError for a non-finite value in history.
 * @example blendErrorCorrelation([]).rho // 0.5
 */
export function blendErrorCorrelation(history: readonly OutcomePair[], priorStrength: number = BIAS_PRIOR_STRENGTH): ErrorCorrelation {
  checkHistory(history, "blendErrorCorrelation", 1);
  const n = history.length;
  let historyRho = NaN;
  if (n > 0) {
    const { mseP, mseB, crossMoment } = historyMses(history);
    if (mseP > 0 && mseB > 0) historyRho = Math.max(-1, Math.min(1, crossMoment / Math.sqrt(mseP * mseB)));
  }
  const z = Number.isNaN(historyRho) ? 0 : n / (n + priorStrength);
  return { rho: z === 0 ? PRIOR_ERROR_CORRELATION : z * historyRho + (1 - z) * PRIOR_ERROR_CORRELATION, historyRho, n, credibility: z };
}

/** What {@link blendWeights} is asked for. */
export type WeightSpec =
  | { readonly rule: "equal" }
  | { readonly rule: "organiser"; readonly panelWeight: number }
  | { readonly rule: "inverse-mse"; readonly history: readonly OutcomePair[]; readonly minOutcomes?: number; readonly priorSd?: number }
  | { readonly rule: "optimal"; readonly history: readonly OutcomePair[]; readonly minOutcomes?: number };

/**
 * The blend weight for a {@link WeightSpec}: dispatches to {@link equalWeights},
 * {@link organiserWeights}, {@link inverseMseWeights} or {@link optimalWeights}.
 * @throws RangeError as the chosen rule does, or for an unknown rule.
 */
export function blendWeights(spec: WeightSpec): BlendWeights {
  switch (spec.rule) {
    case "equal":
      return equalWeights();
    case "organiser":
      return organiserWeights(spec.panelWeight);
    case "inverse-mse":
      return inverseMseWeights(spec.history, { minOutcomes: spec.minOutcomes, priorSd: spec.priorSd });
    case "optimal":
      return optimalWeights(spec.history, { minOutcomes: spec.minOutcomes });
    default: {
      const rule: string = (spec as { rule: string }).rule;
      throw new RangeError(`blendWeights: unknown rule "${rule}"; use equal, organiser, inverse-mse or optimal`);
    }
  }
}
