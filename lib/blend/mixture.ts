/**
 * The blend: the combined figure w·panel + (1 − w)·baseline with the predictive distribution of
 * its error (Bates & Granger 1969), and the linear opinion pool (Stone 1961) with quantiles by
 * bisection, used for the panel's three-point pool (triangulation and round statistics). Input policy: see `index.ts`.
 */
import { normalQuantile } from "../stats/normal";
import {
  componentQuantile,
  distributionCdf,
  distributionMean,
  distributionVariance,
  type Component,
  type Distribution,
  type Mixture,
  type NormalComponent,
} from "./distribution";
import { PRIOR_ERROR_CORRELATION } from "./weights";
import { assertFinite, assertNonEmpty, assertProbability, assertUnitInterval } from "../stats/validate";

/** One part of a linear pool: a distribution and its (non-negative) weight. */
export interface PoolPart {
  readonly weight: number;
  readonly distribution: Distribution;
}

/** Interval levels (percent) reported by default: 80% and 95%, as the baseline's. */
export const DEFAULT_BLEND_LEVELS = Object.freeze([80, 95] as const);

/** Most bisection steps {@link distributionQuantile} takes (enough to reach adjacent doubles). */
const MAX_BISECTION_STEPS = 2200;

/**
 * Linear opinion pool F(x) = Σ_j v_j·F_j(x) of the parts, with v_j = weight_j / Σ weight
 * (M. Stone 1961, "The opinion pool", Ann. Math. Statist. 32(4), 1339–1342). Nested mixtures
 * are flattened into one list of components; parts with weight 0 are left out.
 *
 * Input: a non-empty array of parts with finite weights ≥ 0 and a positive total.
 * @throws RangeError for an empty array, a non-finite or negative weight, or weights that are all 0.
 * @example linearPool([{ weight: 0.5, distribution: a }, { weight: 0.5, distribution: b }])
 */
export function linearPool(parts: readonly PoolPart[]): Mixture {
  const fn = "linearPool";
  assertNonEmpty(parts, fn, "parts");
  let total = 0;
  parts.forEach((p, i) => {
    assertFinite(p.weight, fn, `parts[${i}].weight`);
    if (p.weight < 0) throw new RangeError(`${fn}: parts[${i}].weight is ${p.weight}; weights must be zero or more`);
    total += p.weight;
  });
  if (!(total > 0)) throw new RangeError(`${fn}: all weights are 0; at least one part needs a positive weight`);
  const weights: number[] = [];
  const components: Component[] = [];
  for (const p of parts) {
    if (p.weight === 0) continue;
    const v = p.weight / total;
    const d = p.distribution;
    if (d.kind === "mixture") {
      d.components.forEach((c, k) => {
        if (d.weights[k] > 0) {
          weights.push(v * d.weights[k]);
          components.push(c);
        }
      });
    } else {
      weights.push(v);
      components.push(d);
    }
  }
  return { kind: "mixture", weights, components };
}

/**
 * The blended distribution w·F_panel + (1 − w)·F_baseline, w the panel's weight
 * (docs/methods.md §15d; a two-part {@link linearPool}).
 *
 * Input: two distributions and w in [0, 1].
 * @throws RangeError when w is not a finite number in [0, 1].
 */
export function blendDistribution(panel: Distribution, baseline: Distribution, panelWeight: number): Mixture {
  assertUnitInterval(panelWeight, "blendDistribution", "panelWeight");
  return linearPool([
    { weight: panelWeight, distribution: panel },
    { weight: 1 - panelWeight, distribution: baseline },
  ]);
}

function componentsOf(d: Distribution): readonly Component[] {
  return d.kind === "mixture" ? d.components.filter((_, i) => d.weights[i] > 0) : [d];
}

/**
 * Quantile Q(p) = inf{x : F(x) ≥ p} of any {@link Distribution}, found by bisection on its CDF.
 *
 * Bracket: the smallest and largest component quantiles at p. Since every F_i(min_i q_i(p)) ≤ p
 * and F_i(max_i q_i(p)) ≥ p, the mixture's quantile lies between them. Bisection then halves the
 * bracket, keeping F(lo) < p ≤ F(hi), until the two ends are adjacent doubles (at most
 * {@link MAX_BISECTION_STEPS} steps, about 60 for ordinary magnitudes), and returns hi. Bisection
 * is used rather than Newton or Brent because it needs only a monotone CDF and stays correct
 * when a component is a point mass (a step in the CDF). A single component is answered in
 * closed form by {@link componentQuantile}.
 *
 * Input: p in [0, 1]; p = 0 and p = 1 give the smallest and largest component quantile
 * (−Infinity and +Infinity when a component has a normal tail). Complexity O(k·steps) for k components.
 * @throws RangeError when p is NaN or outside [0, 1].
 * @example distributionQuantile(blendDistribution(panel, baseline, 0.5), 0.9)
 */
export function distributionQuantile(d: Distribution, p: number): number {
  assertProbability(p, "distributionQuantile");
  const comps = componentsOf(d);
  if (comps.length === 1) return componentQuantile(comps[0], p);
  let lo = Infinity;
  let hi = -Infinity;
  for (const c of comps) {
    const q = componentQuantile(c, p);
    if (q < lo) lo = q;
    if (q > hi) hi = q;
  }
  if (p === 0) return lo;
  if (p === 1) return hi;
  if (lo === hi || distributionCdf(d, lo) >= p) return lo;
  for (let step = 0; step < MAX_BISECTION_STEPS; step++) {
    const mid = lo + (hi - lo) / 2;
    if (mid <= lo || mid >= hi) break;
    if (distributionCdf(d, mid) >= p) hi = mid;
    else lo = mid;
  }
  return hi;
}

/** The figures a table of a distribution shows: five quantiles, the mean and the sd. */
export interface DistributionSummary {
  readonly p10: number;
  readonly p25: number;
  readonly p50: number;
  readonly p75: number;
  readonly p90: number;
  readonly mean: number;
  readonly sd: number;
}

/**
 * The 10th, 25th, 50th, 75th and 90th percentiles ({@link distributionQuantile}), the mean
 * ({@link distributionMean}) and the standard deviation (√{@link distributionVariance}) of any
 * {@link Distribution}; for the panel's three-point pool (`panelFromThreePoint`) these are the
 * round statistics' pooled figures (docs/methods.md §13, §15a).
 *
 * Input: a distribution built by `distribution.ts` or this module (already checked there).
 * Never throws for such input; a point mass gives five equal quantiles and sd 0.
 * @example distributionSummary(normalDistribution(100, 15)).p90 // 119.22
 */
export function distributionSummary(d: Distribution): DistributionSummary {
  return {
    p10: distributionQuantile(d, 0.1),
    p25: distributionQuantile(d, 0.25),
    p50: distributionQuantile(d, 0.5),
    p75: distributionQuantile(d, 0.75),
    p90: distributionQuantile(d, 0.9),
    mean: distributionMean(d),
    sd: Math.sqrt(Math.max(0, distributionVariance(d))),
  };
}

/** A central prediction interval of the blend. */
export interface BlendInterval {
  /** Coverage in percent, e.g. 80. */
  readonly level: number;
  /** Quantile at (1 − level/100)/2. */
  readonly lower: number;
  /** Quantile at 1 − (1 − level/100)/2. */
  readonly upper: number;
}

/** Input of {@link blend}. */
export interface BlendInput {
  /** The panel figure (median of a shared quantity, or sum of parts), raw or corrected. */
  readonly panelFigure: number;
  /** The baseline's point forecast. */
  readonly baselineFigure: number;
  /** The panel's predictive distribution (its spread sets σ_p). */
  readonly panelDistribution: Distribution;
  /** The baseline's predictive distribution (`baselineDistribution`; its spread sets σ_b). */
  readonly baselineDistribution: Distribution;
  /** The panel's weight w in [0, 1] (`weights.ts`). */
  readonly panelWeight: number;
  /** Correlation ρ of the two legs' errors (`blendErrorCorrelation`); default {@link PRIOR_ERROR_CORRELATION}. */
  readonly errorCorrelation?: number;
  /** Multiplier of σ_c from the blend's own track record (`blendRangeScale`); default 1. */
  readonly rangeScale?: number;
  /** Interval levels in percent, each in (0, 100); default {@link DEFAULT_BLEND_LEVELS}. */
  readonly levels?: readonly number[];
}

/** The blended figure and range. */
export interface BlendResult {
  readonly panelWeight: number;
  /**
   * The headline figure w·panelFigure + (1 − w)·baselineFigure (Bates & Granger 1969): the
   * median (and mean) of the blend's predictive distribution, so it lies inside its own ranges.
   */
  readonly figure: number;
  /** Mean of the blended distribution (= figure). */
  readonly mean: number;
  /** Median of the blended distribution (= figure). */
  readonly median: number;
  /** σ_p and σ_b: each leg's sd implied by its central 80% range, (Q(0.9) − Q(0.1)) / (2·Φ⁻¹(0.9)). */
  readonly panelSd: number;
  readonly baselineSd: number;
  /** The error correlation ρ used. */
  readonly errorCorrelation: number;
  /** The multiplier of σ_c used. */
  readonly rangeScale: number;
  /**
   * σ_c before `rangeScale`: what a blend with an outcome's error is standardised by for the next
   * `blendRangeScale` (standardising by the scaled sd would undo the scale it came from).
   */
  readonly combinedSd: number;
  /** Central intervals of the blended distribution, one per level. */
  readonly intervals: readonly BlendInterval[];
  /** The blended distribution itself: N(figure, σ_c²). */
  readonly distribution: NormalComponent;
}

/** A leg's sd implied by its central 80% range, as the baseline's sd is implied by its interval. */
function legSd(d: Distribution): number {
  return (distributionQuantile(d, 0.9) - distributionQuantile(d, 0.1)) / (2 * normalQuantile(0.9));
}

/**
 * The blend: one predictive distribution, and everything shown is read from it. The figure is
 * the combination f_c = w·panel + (1 − w)·baseline; its error is (w·e_p + (1 − w)·e_b), whose
 * variance is σ_c² = w²σ_p² + (1 − w)²σ_b² + 2w(1 − w)ρσ_pσ_b (Bates & Granger 1969; the
 * formula of docs/methods.md §5a with λ = 1 − w). The blend's distribution is N(f_c, σ_c²): its
 * median is the figure, so the figure always lies inside its ranges. σ_p and σ_b are each leg's
 * sd implied by its own 80% range ({@link legSd}), so the panel's track-record range and the
 * baseline's interval carry through. `rangeScale` multiplies σ_c when the blend's own track
 * record shows its ranges held more or fewer outcomes than stated (`blendRangeScale`).
 *
 * Why not the mixture w·F_panel + (1 − w)·F_baseline: a linear pool of two calibrated
 * predictive distributions is over-dispersed — it keeps the spread of both legs and adds the
 * distance between them — while the combined figure is more accurate than either (Ranjan &
 * Gneiting 2010, "Combining probability forecasts", JRSS B 72(1), 71–91; citation from memory).
 * The project's simulated panel study (`npm run bench:blend`) showed it: the mixture's 80% range
 * held 98% of outcomes.
 *
 * @throws RangeError for a non-finite figure, a weight outside [0, 1], ρ outside [−1, 1], or a
 *   level outside (0, 100).
 */
export function blend(input: BlendInput): BlendResult {
  const fn = "blend";
  assertFinite(input.panelFigure, fn, "panelFigure");
  assertFinite(input.baselineFigure, fn, "baselineFigure");
  assertUnitInterval(input.panelWeight, fn, "panelWeight");
  const rho = input.errorCorrelation ?? PRIOR_ERROR_CORRELATION;
  assertFinite(rho, fn, "errorCorrelation");
  if (rho < -1 || rho > 1) throw new RangeError(`${fn}: errorCorrelation is ${rho}; a correlation must lie between -1 and 1`);
  const levels: readonly number[] = input.levels ?? DEFAULT_BLEND_LEVELS;
  levels.forEach((l, i) => {
    assertFinite(l, fn, `levels[${i}]`);
    if (l <= 0 || l >= 100) throw new RangeError(`${fn}: levels[${i}] is ${l}; a level must lie strictly between 0 and 100`);
  });
  const scale = input.rangeScale ?? 1;
  assertFinite(scale, fn, "rangeScale");
  if (!(scale > 0)) throw new RangeError(`${fn}: rangeScale is ${scale}; it must be greater than 0`);
  const w = input.panelWeight;
  const sp = legSd(input.panelDistribution);
  const sb = legSd(input.baselineDistribution);
  const combinedSd = Math.sqrt(Math.max(0, w * w * sp * sp + (1 - w) * (1 - w) * sb * sb + 2 * w * (1 - w) * rho * sp * sb));
  const sd = scale * combinedSd;
  const figure = w * input.panelFigure + (1 - w) * input.baselineFigure;
  const distribution: NormalComponent = { kind: "normal", mean: figure, sd };
  return {
    panelWeight: w,
    figure,
    mean: figure,
    median: figure,
    panelSd: sp,
    baselineSd: sb,
    errorCorrelation: rho,
    rangeScale: scale,
    combinedSd,
    intervals: levels.map((level) => {
      const tail = (1 - level / 100) / 2;
      return { level, lower: componentQuantile(distribution, tail), upper: componentQuantile(distribution, 1 - tail) };
    }),
    distribution,
  };
}
