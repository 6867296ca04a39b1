/**
 * The two distributions a blend is made of: the panel's (from three-point answers, or from
 * the spread of the final round) and the baseline's predictive distribution (a normal).
 *
 * Distributions are plain, JSON-serialisable objects (no closures). A {@link Component} is a
 * normal or a two-piece normal; a {@link Mixture} is a linear pool of components (built here
 * for the panel and in `mixture.ts` for the blend). Evaluation functions ({@link distributionCdf},
 * {@link distributionDensity}, {@link distributionMean}, {@link componentQuantile}) accept any
 * of them. Input policy: see `index.ts`.
 */
import { normalCdf, normalQuantile } from "../stats/normal";
import { summarise } from "../stats/summary";
import { assertFinite, assertFiniteArray, assertNonEmpty, assertPositive, assertProbability } from "../stats/validate";

/** 1/√(2π), the standard normal density at 0. */
const INV_SQRT_2PI = 0.398942280401432677939946059934;

/**
 * A normal distribution N(mean, sd²). `sd` = 0 is allowed and means a point mass at `mean`
 * (its CDF is a step; its density is 0 away from `mean`).
 */
export interface NormalComponent {
  readonly kind: "normal";
  readonly mean: number;
  readonly sd: number;
}

/**
 * A two-piece normal joined at its median: below `median` the density is that of
 * N(median, sdLow²), above it that of N(median, sdHigh²); each half carries probability 1/2,
 * so the CDF is continuous and equals 1/2 at `median`. A zero sd puts that half's probability
 * 1/2 as a point mass at `median`.
 */
export interface TwoPieceNormalComponent {
  readonly kind: "two-piece-normal";
  readonly median: number;
  readonly sdLow: number;
  readonly sdHigh: number;
}

/** One non-mixture distribution. */
export type Component = NormalComponent | TwoPieceNormalComponent;

/**
 * A finite mixture (linear opinion pool) Σ w_i·F_i of components; the weights are
 * non-negative and sum to 1.
 */
export interface Mixture {
  readonly kind: "mixture";
  readonly weights: readonly number[];
  readonly components: readonly Component[];
}

/** Any distribution lib/blend works with. */
export type Distribution = Component | Mixture;

/** A three-point answer read as the 10th / 50th / 90th percentiles (docs/methods.md §14.1). */
export interface ThreePointAnswer {
  /** 10th percentile ("low"). */
  readonly low: number;
  /** 50th percentile: the answer's middle value, read as the median. */
  readonly mid: number;
  /** 90th percentile ("high"). */
  readonly high: number;
}

/** Cumulative probabilities of a three-point answer's low, mid and high. */
export const THREE_POINT_PROBABILITIES = Object.freeze([0.1, 0.5, 0.9] as const);

/**
 * A baseline's point forecast for the target period with its spread: the standard deviation
 * of the forecast error at the horizon, or the 80% and/or 95% prediction interval it implies.
 */
export interface BaselineForecast {
  /** Point forecast (the predictive mean). */
  readonly mean: number;
  /** Standard deviation of the forecast error at the horizon, when the method gives one. */
  readonly sd?: number;
  readonly lower80?: number;
  readonly upper80?: number;
  readonly lower95?: number;
  readonly upper95?: number;
}

/** Where a baseline's standard deviation came from. */
export type BaselineSdSource = "sd" | "80% interval" | "95% interval";

/** A baseline's predictive distribution with the origin of its sd. */
export interface BaselineDistribution {
  readonly distribution: NormalComponent;
  readonly sdSource: BaselineSdSource;
}

/** How a panel distribution was built, for method notes. */
export type PanelDistributionRule = "three-point pool" | "round spread" | "sum of parts" | "track record";

/** A panel distribution with the rule that built it and the numbers behind it. */
export interface PanelDistribution {
  readonly distribution: Distribution;
  readonly rule: PanelDistributionRule;
  /** Number of answers used. */
  readonly n: number;
  /**
   * For "round spread": the round's median, IQR (type 7) and the sd IQR / (2·Φ⁻¹(0.75)).
   * For "sum of parts": median and sd of the normal approximation to the total, iqr NaN.
   * NaN otherwise.
   */
  readonly median: number;
  readonly iqr: number;
  readonly sd: number;
}

/**
 * A normal distribution N(mean, sd²) as a {@link NormalComponent}.
 *
 * Input: finite mean; finite sd ≥ 0 (0 = point mass).
 * @throws RangeError for a non-finite mean or sd, or a negative sd.
 * @example normalDistribution(100, 15) // { kind: "normal", mean: 100, sd: 15 }
 */
export function normalDistribution(mean: number, sd: number): NormalComponent {
  assertFinite(mean, "normalDistribution", "mean");
  assertPositive(sd, "normalDistribution", "sd", true);
  return { kind: "normal", mean, sd };
}

/**
 * One three-point answer (P10, P50, P90) as a two-piece normal joined at the median that
 * passes exactly through all three points: sdLow = (P50 − P10)/z, sdHigh = (P90 − P50)/z with
 * z = Φ⁻¹(0.9) ≈ 1.2816, so F(P10) = 0.1, F(P50) = 0.5 and F(P90) = 0.9; the tails beyond P10
 * and P90 are normal tails.
 *
 * Source: the fitting rule is this project's (stated here, not taken from a publication). It
 * is a two-piece ("split") normal in the sense of Gibbons & Mylroie (1973) and John (1982),
 * but joined so that the CDF, not the density, is continuous at P50: the published split
 * normal joins at the mode, which would not reproduce a skewed answer's P50.
 *
 * Input: finite low ≤ mid ≤ high. Equal points give a point mass for that half (low = mid =
 * high is a point mass at mid).
 * @throws RangeError for a non-finite value or low > mid or mid > high.
 * @example threePointDistribution({ low: 80, mid: 100, high: 140 }) // sdLow 15.61, sdHigh 31.21
 */
export function threePointDistribution(answer: ThreePointAnswer): TwoPieceNormalComponent {
  const fn = "threePointDistribution";
  assertFinite(answer.low, fn, "low");
  assertFinite(answer.mid, fn, "mid");
  assertFinite(answer.high, fn, "high");
  if (answer.low > answer.mid) throw new RangeError(`${fn}: low (${answer.low}) is above mid (${answer.mid}); low must not exceed mid`);
  if (answer.mid > answer.high) throw new RangeError(`${fn}: mid (${answer.mid}) is above high (${answer.high}); mid must not exceed high`);
  const z90 = normalQuantile(0.9);
  return {
    kind: "two-piece-normal",
    median: answer.mid,
    sdLow: (answer.mid - answer.low) / z90,
    sdHigh: (answer.high - answer.mid) / z90,
  };
}

/** {@link threePointDistribution} whose error message names the caller and the array index. */
function indexedThreePoint(a: ThreePointAnswer, i: number, fn: string, name: string): TwoPieceNormalComponent {
  try {
    return threePointDistribution(a);
  } catch (err) {
    throw new RangeError(`${fn}: ${name}[${i}]: ${(err as Error).message}`);
  }
}

/**
 * The panel's distribution from three-point answers: each answer as a
 * {@link threePointDistribution}, pooled linearly with equal weights,
 * F_panel(x) = (1/n)·Σ_i F_i(x) — the linear opinion pool of M. Stone (1961), "The opinion
 * pool", Annals of Mathematical Statistics 32(4), 1339–1342.
 *
 * With `weights` (one per answer, ≥ 0, not all 0; normalised here) the pool is Σ_i w_i·F_i, as
 * in Cooke's performance-weighted pool (docs/methods.md §21); without them every w_i = 1/n.
 *
 * Input: a non-empty array of valid three-point answers.
 * @throws RangeError for an empty array, an invalid answer (the message names its index), or
 * weights that are not one per answer, negative, non-finite or all 0.
 */
export function panelFromThreePoint(answers: readonly ThreePointAnswer[], weights?: readonly number[]): PanelDistribution {
  assertNonEmpty(answers, "panelFromThreePoint", "answers");
  const components = answers.map((a, i) => indexedThreePoint(a, i, "panelFromThreePoint", "answers"));
  let ws = components.map(() => 1 / components.length);
  if (weights) {
    if (weights.length !== answers.length) throw new RangeError("panelFromThreePoint: give one weight per answer");
    weights.forEach((w, i) => assertFinite(w, "panelFromThreePoint", `weights[${i}]`));
    const total = weights.reduce((a, w) => a + w, 0);
    if (weights.some((w) => w < 0) || !(total > 0)) throw new RangeError("panelFromThreePoint: weights must be ≥ 0 and not all 0");
    ws = weights.map((w) => w / total);
  }
  return {
    distribution: { kind: "mixture", weights: ws, components },
    rule: "three-point pool",
    n: answers.length,
    median: NaN,
    iqr: NaN,
    sd: NaN,
  };
}

/**
 * The panel's distribution from the spread of single-value answers (the final round): a
 * normal centred on the round's median with sd = IQR / (2·Φ⁻¹(0.75)) ≈ IQR / 1.349, the IQR by
 * Hyndman & Fan (1996) definition 7 (lib/stats). The divisor is the IQR of a standard normal,
 * so the sd is the normal-consistent robust scale of the answers (common practice).
 *
 * This describes how far apart the panelists are, not the sampling error of the median.
 * An IQR of 0 (one answer, or the middle half identical) gives sd 0, a point mass at the median.
 *
 * Input: a non-empty array of finite numbers.
 * @throws RangeError for an empty array or a non-finite value.
 */
export function panelFromSpread(values: readonly number[]): PanelDistribution {
  assertFiniteArray(values, "panelFromSpread", "values");
  const s = summarise(values);
  const sd = s.iqr / (2 * normalQuantile(0.75));
  return {
    distribution: { kind: "normal", mean: s.median, sd },
    rule: "round spread",
    n: values.length,
    median: s.median,
    iqr: s.iqr,
    sd,
  };
}

/**
 * The panel's distribution for a sum-of-parts question from three-point answers (one part per
 * panelist, raw or already bias-corrected): the total's distribution approximated by a normal
 * with mean Σ mean_i and variance Σ var_i, each part a {@link threePointDistribution} with the
 * moments of {@link distributionMean} / {@link distributionVariance}. Assumes the parts'
 * errors are independent (a stated assumption: correlated parts would widen the total) and
 * relies on the central limit theorem for the normal shape (common practice). A linear pool
 * would be wrong here: the parts add up, they are not rival views of one quantity.
 *
 * Input: a non-empty array of valid three-point answers.
 * @throws RangeError for an empty array or an invalid answer (the message names its index).
 */
export function panelFromParts(parts: readonly ThreePointAnswer[]): PanelDistribution {
  assertNonEmpty(parts, "panelFromParts", "parts");
  let mean = 0;
  let variance = 0;
  parts.forEach((a, i) => {
    const c = indexedThreePoint(a, i, "panelFromParts", "parts");
    mean += distributionMean(c);
    variance += distributionVariance(c);
  });
  const sd = Math.sqrt(variance);
  return {
    distribution: { kind: "normal", mean, sd },
    rule: "sum of parts",
    n: parts.length,
    median: mean,
    iqr: NaN,
    sd,
  };
}

/**
 * The baseline's predictive distribution: N(mean, sd²) with sd taken, in this order, from the
 * given `sd`; else from the 80% interval, sd = (upper80 − lower80) / (2·Φ⁻¹(0.90)); else from
 * the 95% interval, sd = (upper95 − lower95) / (2·Φ⁻¹(0.975)). These invert the normal
 * prediction interval mean ± Φ⁻¹(1 − α/2)·sd (e.g. Hyndman & Athanasopoulos, FPP §5.5). An
 * asymmetric interval is summarised by its width only; the normal stays centred on `mean`.
 *
 * Input: finite mean; sd > 0, or an interval with lower < upper (both bounds of a level).
 * @throws RangeError for a non-finite value, sd ≤ 0, an interval with lower ≥ upper, a level
 *   with only one bound, or no sd and no interval.
 */
export function baselineDistribution(baseline: BaselineForecast): BaselineDistribution {
  const fn = "baselineDistribution";
  assertFinite(baseline.mean, fn, "mean");
  if (baseline.sd !== undefined) {
    assertPositive(baseline.sd, fn, "sd");
    return { distribution: { kind: "normal", mean: baseline.mean, sd: baseline.sd }, sdSource: "sd" };
  }
  for (const [level, lo, hi] of [
    [80, baseline.lower80, baseline.upper80],
    [95, baseline.lower95, baseline.upper95],
  ] as const) {
    if (lo === undefined && hi === undefined) continue;
    if (lo === undefined || hi === undefined) {
      throw new RangeError(`${fn}: the ${level}% interval needs both lower${level} and upper${level}`);
    }
    assertFinite(lo, fn, `lower${level}`);
    assertFinite(hi, fn, `upper${level}`);
    if (!(lo < hi)) throw new RangeError(`${fn}: lower${level} (${lo}) must be below upper${level} (${hi})`);
    const z = normalQuantile(1 - (1 - level / 100) / 2);
    return {
      distribution: { kind: "normal", mean: baseline.mean, sd: (hi - lo) / (2 * z) },
      sdSource: level === 80 ? "80% interval" : "95% interval",
    };
  }
  throw new RangeError(`${fn}: give sd, or the 80% or 95% interval (lower and upper), to set the baseline's spread`);
}

function normalComponentCdf(c: NormalComponent, x: number): number {
  if (c.sd === 0) return x < c.mean ? 0 : 1;
  return normalCdf((x - c.mean) / c.sd);
}

function twoPieceCdf(c: TwoPieceNormalComponent, x: number): number {
  if (x < c.median) return c.sdLow === 0 ? 0 : normalCdf((x - c.median) / c.sdLow);
  if (x === c.median) return c.sdHigh === 0 ? 1 : 0.5;
  return c.sdHigh === 0 ? 1 : normalCdf((x - c.median) / c.sdHigh);
}

function componentCdf(c: Component, x: number): number {
  return c.kind === "normal" ? normalComponentCdf(c, x) : twoPieceCdf(c, x);
}

function normalPdf(z: number, sd: number): number {
  return (INV_SQRT_2PI * Math.exp(-0.5 * z * z)) / sd;
}

function componentDensity(c: Component, x: number): number {
  if (c.kind === "normal") {
    if (c.sd === 0) return x === c.mean ? Infinity : 0;
    return normalPdf((x - c.mean) / c.sd, c.sd);
  }
  const sd = x < c.median ? c.sdLow : c.sdHigh;
  if (sd === 0) return x === c.median ? Infinity : 0;
  return normalPdf((x - c.median) / sd, sd);
}

/**
 * Cumulative distribution function F(x) = P(X ≤ x) of any {@link Distribution}; for a
 * mixture F(x) = Σ w_i·F_i(x). Normal CDF by lib/stats `normalCdf` (Cody 1969, as R's pnorm).
 *
 * Input: a distribution built by this module or `mixture.ts`; x finite or ±Infinity.
 * @throws RangeError when x is NaN.
 * @example distributionCdf(normalDistribution(0, 1), 1.959963984540054) // 0.975
 */
export function distributionCdf(d: Distribution, x: number): number {
  if (Number.isNaN(x)) throw new RangeError("distributionCdf: x is NaN");
  if (x === -Infinity) return 0;
  if (x === Infinity) return 1;
  if (d.kind !== "mixture") return componentCdf(d, x);
  let s = 0;
  for (let i = 0; i < d.components.length; i++) s += d.weights[i] * componentCdf(d.components[i], x);
  return Math.min(1, Math.max(0, s));
}

/**
 * Probability density f(x) of any {@link Distribution}; for a mixture Σ w_i·f_i(x). A two-piece
 * normal takes the lower piece's density left of the median and the upper piece's at and right
 * of it. A point mass contributes 0 away from its location and Infinity at it.
 *
 * @throws RangeError when x is NaN.
 */
export function distributionDensity(d: Distribution, x: number): number {
  if (Number.isNaN(x)) throw new RangeError("distributionDensity: x is NaN");
  if (!Number.isFinite(x)) return 0;
  if (d.kind !== "mixture") return componentDensity(d, x);
  let s = 0;
  for (let i = 0; i < d.components.length; i++) {
    if (d.weights[i] > 0) s += d.weights[i] * componentDensity(d.components[i], x);
  }
  return s;
}

/**
 * Mean of any {@link Distribution}: normal → mean; two-piece normal joined at the median →
 * median + (sdHigh − sdLow)/√(2π) (each half-normal has mean offset ±sd·√(2/π) and weight 1/2);
 * mixture → Σ w_i·mean_i.
 */
export function distributionMean(d: Distribution): number {
  if (d.kind === "normal") return d.mean;
  if (d.kind === "two-piece-normal") return d.median + (d.sdHigh - d.sdLow) * INV_SQRT_2PI;
  let s = 0;
  for (let i = 0; i < d.components.length; i++) s += d.weights[i] * distributionMean(d.components[i]);
  return s;
}

/**
 * Variance of any {@link Distribution}: normal → sd²; two-piece normal joined at the median →
 * (sdLow² + sdHigh²)/2 − (sdHigh − sdLow)²/(2π) (second moment about the median minus the
 * squared mean offset); mixture → Σ w_i·(var_i + mean_i²) − mean² (law of total variance).
 */
export function distributionVariance(d: Distribution): number {
  if (d.kind === "normal") return d.sd * d.sd;
  if (d.kind === "two-piece-normal") {
    const off = d.sdHigh - d.sdLow;
    return (d.sdLow * d.sdLow + d.sdHigh * d.sdHigh) / 2 - (off * off) / (2 * Math.PI);
  }
  const m = distributionMean(d);
  let s = 0;
  for (let i = 0; i < d.components.length; i++) {
    const c = d.components[i];
    const dm = distributionMean(c) - m;
    s += d.weights[i] * (distributionVariance(c) + dm * dm);
  }
  return s;
}

/**
 * Quantile inf{x : F(x) ≥ p} of one component, in closed form: normal → mean + sd·Φ⁻¹(p);
 * two-piece → median + sdLow·Φ⁻¹(p) for p < 1/2, median + sdHigh·Φ⁻¹(p) for p ≥ 1/2
 * (Φ⁻¹ by lib/stats, Wichura 1988 AS 241). p = 0 or 1 gives ∓Infinity unless that side is a
 * point mass.
 *
 * @throws RangeError when p is NaN or outside [0, 1].
 */
export function componentQuantile(c: Component, p: number): number {
  assertProbability(p, "componentQuantile");
  const center = c.kind === "normal" ? c.mean : c.median;
  const sd = c.kind === "normal" ? c.sd : p < 0.5 ? c.sdLow : c.sdHigh;
  if (sd === 0 || p === 0.5) return center;
  return center + sd * normalQuantile(p);
}
