/**
 * The panel leg's range from track records, not from the spread of opinion: Delphi rounds
 * narrow the spread of the answers by design (feedback and conformity), so IQR/1.349 of the
 * answers says how far apart the panelists are, not how far the panel figure tends to be from
 * the outcome. Two rules live here:
 *
 * 1. Single-value answers (and single-value parts): the panel figure's predictive distribution
 *    from the log errors ln(actual / corrected panel figure) of the organiser's recorded
 *    questions, with a stated prior when that history is short ({@link panelErrorScale},
 *    {@link panelFromTrackRecord}).
 * 2. Three-point answers: each panelist's P10–P90 range widened or narrowed by how often their
 *    past ranges held the outcome ({@link intervalWidthFactor}, {@link widenThreePoint}).
 *
 * Input policy: see `index.ts`.
 */
import { normalQuantile } from "../stats/normal";
import { quantile } from "../stats/quantile";
import { studentTQuantile } from "../stats/student-t";
import { threePointDistribution, type PanelDistribution, type ThreePointAnswer } from "./distribution";
import { BIAS_PRIOR_STRENGTH, NOMINAL_INTERVAL_COVERAGE } from "./track-record";
import { assertFinite, assertPositive } from "../stats/validate";

/**
 * The prior for the scale of the panel figure's log errors when the past outcomes is short:
 * scale s0 = 0.25 (a typical error of about 25% either way) worth ν0 = 3 questions with an outcome.
 * A weakly informative default chosen by the project (common practice: a judgemental forecast
 * of a business quantity is rarely better than ±10% or worse than ±60% typical error); with n
 * questions with an outcome it carries weight ν0/(ν0 + n), so history takes over as it accumulates.
 */
export const PANEL_LOG_ERROR_PRIOR = Object.freeze({ scale: 0.25, strength: 3 });

/** The scale of the panel figure's log errors, with what it rests on. */
export interface PanelErrorScale {
  /** Questions with an outcome behind it. */
  readonly n: number;
  readonly priorScale: number;
  readonly priorStrength: number;
  /** Root mean square of the history's log errors (NaN without history). */
  readonly historyScale: number;
  /** The pooled scale s_n = √((ν0·s0² + Σ e_i²)/(ν0 + n)). */
  readonly scale: number;
  /** Degrees of freedom ν0 + n of the predictive Student t. */
  readonly df: number;
}

/**
 * Scale of the log errors e_i = ln(actual_i / figure_i) of the corrected panel figure, pooled
 * with the prior: s_n² = (ν0·s0² + Σ e_i²)/(ν0 + n), and the predictive distribution of the next
 * log error is a Student t with ν0 + n degrees of freedom and scale s_n. This is the conjugate
 * analysis of a normal with known mean 0 and unknown variance under a scaled inverse-χ²(ν0, s0²)
 * prior (Gelman, Carlin, Stern, Dunson, Vehtari & Rubin 2013, Bayesian Data Analysis, 3rd ed.,
 * §2.6; section number from memory). The mean is taken as 0 because the figure is already
 * bias-corrected (each answer × its shrunk bias factor).
 *
 * Input: finite log errors (possibly none); a prior with scale > 0 and strength > 0.
 * @throws RangeError for a non-finite log error or a bad prior.
 * @example panelErrorScale([0.1, -0.2]).scale // √((3·0.0625 + 0.05)/5) = 0.2179
 */
export function panelErrorScale(logErrors: readonly number[], prior = PANEL_LOG_ERROR_PRIOR): PanelErrorScale {
  const fn = "panelErrorScale";
  assertPositive(prior.scale, fn, "prior.scale");
  assertPositive(prior.strength, fn, "prior.strength");
  let ss = 0;
  logErrors.forEach((e, i) => {
    assertFinite(e, fn, `logErrors[${i}]`);
    ss += e * e;
  });
  const n = logErrors.length;
  const df = prior.strength + n;
  return {
    n,
    priorScale: prior.scale,
    priorStrength: prior.strength,
    historyScale: n === 0 ? NaN : Math.sqrt(ss / n),
    scale: Math.sqrt((prior.strength * prior.scale * prior.scale + ss) / df),
    df,
  };
}

/**
 * The panel leg from the track record: the figure's predictive distribution when the answers
 * are single values. With t = t_{df}(0.9) and s the pooled scale ({@link panelErrorScale}), the
 * outcome's P10 and P90 are figure·e^{∓t·s} (a Student t on the log scale); the distribution is
 * the two-piece normal through figure·e^{−t·s}, figure, figure·e^{t·s} ({@link
 * threePointDistribution}), so it is skewed as a log error is and its median is the figure.
 * A figure ≤ 0 has no log: the range is then figure ± |figure|·(e^{t·s} − 1), symmetric.
 *
 * Input: a finite figure; the scale from {@link panelErrorScale}.
 * @throws RangeError for a non-finite figure.
 */
export function panelFromTrackRecord(figure: number, errors: PanelErrorScale, n: number): PanelDistribution {
  assertFinite(figure, "panelFromTrackRecord", "figure");
  const t = studentTQuantile(0.9, errors.df);
  const up = Math.exp(t * errors.scale);
  const point: ThreePointAnswer =
    figure > 0
      ? { low: figure / up, mid: figure, high: figure * up }
      : { low: figure - Math.abs(figure) * (up - 1), mid: figure, high: figure + Math.abs(figure) * (up - 1) };
  return { distribution: threePointDistribution(point), rule: "track record", n, median: figure, iqr: NaN, sd: NaN };
}

/** How a panelist's stated P10–P90 range is rescaled from their interval hit rate. */
export interface IntervalWidthFactor {
  readonly hits: number;
  readonly count: number;
  /** The shrunk coverage ĥ = (hits + k·0.8)/(count + k), held to [0.2, 0.98]. */
  readonly coverage: number;
  /** Φ⁻¹(0.9) / Φ⁻¹((1 + ĥ)/2): > 1 widens, < 1 narrows. */
  readonly factor: number;
}

/**
 * The factor that turns a panelist's stated 80% range into one that would have held the outcome
 * 80% of the time. Their past ranges held `hits` of `count` outcomes; the coverage estimate is
 * shrunk toward the nominal 0.8 with prior strength k (a Beta prior with mean 0.8 worth k
 * questions; the posterior mean is (hits + 0.8k)/(count + k) — the same credibility form as the
 * bias factor, Bühlmann 1967, with k = {@link BIAS_PRIOR_STRENGTH}), held to [0.2, 0.98] so one
 * streak cannot make a range vanish or explode. Reading the stated range as a central normal
 * interval with coverage ĥ, its half-width is Φ⁻¹((1 + ĥ)/2)·σ; the 80% range is Φ⁻¹(0.9)·σ, hence
 * the factor Φ⁻¹(0.9)/Φ⁻¹((1 + ĥ)/2). The rule is this project's (stated here in full).
 *
 * Input: whole numbers 0 ≤ hits ≤ count (count 0: factor 1).
 * @throws RangeError for hits or count that are not such whole numbers.
 * @example intervalWidthFactor(1, 5).factor // ĥ = 0.5 → 1.2816/0.6745 = 1.900
 */
export function intervalWidthFactor(hits: number, count: number, priorStrength = BIAS_PRIOR_STRENGTH): IntervalWidthFactor {
  const fn = "intervalWidthFactor";
  assertPositive(count, fn, "count", true);
  assertPositive(hits, fn, "hits", true);
  if (!Number.isInteger(hits) || !Number.isInteger(count) || hits > count) {
    throw new RangeError(`${fn}: hits (${hits}) and count (${count}) must be whole numbers with hits ≤ count`);
  }
  assertPositive(priorStrength, fn, "priorStrength");
  const raw = (hits + priorStrength * NOMINAL_INTERVAL_COVERAGE) / (count + priorStrength);
  const coverage = Math.min(0.98, Math.max(0.2, raw));
  const factor = count === 0 ? 1 : normalQuantile(0.5 + NOMINAL_INTERVAL_COVERAGE / 2) / normalQuantile((1 + coverage) / 2);
  return { hits, count, coverage, factor };
}

/**
 * A three-point answer with both halves of its range multiplied by `factor` about the middle
 * value: (mid − f·(mid − low), mid, mid + f·(high − mid)).
 * @throws RangeError for a factor that is not > 0.
 */
export function widenThreePoint(answer: ThreePointAnswer, factor: number): ThreePointAnswer {
  assertPositive(factor, "widenThreePoint", "factor");
  return { low: answer.mid - factor * (answer.mid - answer.low), mid: answer.mid, high: answer.mid + factor * (answer.high - answer.mid) };
}

/** The blend range's scale from the blend's own track record. */
export interface RangeScale {
  readonly n: number;
  /** Q_0.8(|z_i|)/Φ⁻¹(0.9) of the history alone (NaN without history). */
  readonly historyScale: number;
  /** Credibility Z = n/(n + k). */
  readonly credibility: number;
  /** The scale used: Z·historyScale + (1 − Z)·1. */
  readonly scale: number;
}

/**
 * How much wider or narrower the blend's range must be to have held 80% of past outcomes: from
 * the standardised errors z_i = (actual_i − figure_i)/sd_i of past blends with an outcome, the empirical
 * 80th percentile of |z_i| (Hyndman & Fan type 7) over Φ⁻¹(0.9), the value it would have for
 * well-calibrated normal ranges; shrunk toward 1 (the range as computed) with credibility
 * Z = n/(n + k), k = {@link BIAS_PRIOR_STRENGTH} (Bühlmann 1967, as the bias factor). This is
 * an empirical-quantile recalibration of the interval from its own track record (the rule is
 * this project's, stated here in full).
 *
 * Input: finite standardised errors (possibly none: scale 1).
 * @throws RangeError for a non-finite error.
 * @example blendRangeScale([]).scale // 1
 */
export function blendRangeScale(standardisedErrors: readonly number[], priorStrength = BIAS_PRIOR_STRENGTH): RangeScale {
  standardisedErrors.forEach((z, i) => assertFinite(z, "blendRangeScale", `standardisedErrors[${i}]`));
  const n = standardisedErrors.length;
  if (n === 0) return { n, historyScale: NaN, credibility: 0, scale: 1 };
  const historyScale = quantile(standardisedErrors.map(Math.abs), 0.8) / normalQuantile(0.9);
  const credibility = n / (n + priorStrength);
  return { n, historyScale, credibility, scale: credibility * historyScale + (1 - credibility) };
}
