/**
 * Three-point answers (low / median / high, read as the 10th / 50th / 90th percentiles,
 * docs/methods.md §14.1) and their pooling into one panel distribution.
 *
 * ## Per-answer distribution
 * Each answer (L, M, H) with L ≤ M ≤ H is turned into the continuous distribution whose
 * quantile function is
 *   Q(u) = M + σ_L · Φ⁻¹(u)  for u ≤ 0.5,   Q(u) = M + σ_R · Φ⁻¹(u)  for u > 0.5,
 * with σ_L = (M − L) / z₀.₉ and σ_R = (H − M) / z₀.₉, z₀.₉ = Φ⁻¹(0.9) ≈ 1.2815515655446.
 * That is a half-normal on each side of the median, each scaled to meet its own quantile,
 * so Q(0.1) = L, Q(0.5) = M and Q(0.9) = H exactly. CDF:
 *   F(x) = Φ((x − M)/σ_L) for x ≤ M,  Φ((x − M)/σ_R) for x > M
 * (a side with σ = 0 puts its half of the probability on M). Mean M + (σ_R − σ_L)/√(2π);
 * E[X²] = M² + √(2/π)·M·(σ_R − σ_L) + (σ_L² + σ_R²)/2.
 * This construction is Triangulate's choice (it matches the three stated quantiles and
 * nothing more); it is not a published named distribution.
 *
 * ## Pooling
 * The panel distribution is the linear opinion pool with equal weights (Stone, M. (1961),
 * "The opinion pool", Annals of Mathematical Statistics 32(4), 1339–1342; reviewed by
 * Genest, C. and Zidek, J. V. (1986), Statistical Science 1(1), 114–148 — citations from
 * memory, not verified in this project): F_pool(x) = (1/n) Σ F_i(x). Its quantiles are found
 * by bisection on F_pool (to 1e-10 of the spread), its mean and variance from the mixture
 * moments: mean = (1/n) Σ mean_i, var = (1/n) Σ E_i[X²] − mean².
 *
 * Pure: no framework imports. Input policy as lib/stats (index.ts): finite numbers only,
 * else RangeError; an empty list of answers throws RangeError.
 */
import { normalCdf, normalQuantile } from "./normal";

/** A three-point answer: 10th, 50th and 90th percentiles. */
export interface ThreePoint {
  readonly low: number;
  /** The middle value, the 50th percentile (a median, not a mode). */
  readonly median: number;
  readonly high: number;
}

/** Quantiles and moments of the pooled panel distribution. */
export interface PooledDistribution {
  readonly n: number;
  readonly p10: number;
  readonly p25: number;
  readonly p50: number;
  readonly p75: number;
  readonly p90: number;
  readonly mean: number;
  readonly sd: number;
}

/** Φ⁻¹(0.9), the standard normal 90th percentile. */
export const Z90 = normalQuantile(0.9);

function check(a: ThreePoint, i: number): void {
  for (const [k, v] of Object.entries(a)) {
    if (!Number.isFinite(v)) throw new RangeError(`poolThreePoint: answer ${i} has a non-finite ${k}`);
  }
  if (!(a.low <= a.median && a.median <= a.high)) {
    throw new RangeError(`poolThreePoint: answer ${i} needs low ≤ median ≤ high`);
  }
}

/** CDF of the per-answer distribution at x (see the module comment). */
export function threePointCdf(a: ThreePoint, x: number): number {
  const sL = (a.median - a.low) / Z90;
  const sR = (a.high - a.median) / Z90;
  if (x < a.median) return sL === 0 ? 0 : normalCdf((x - a.median) / sL);
  if (x === a.median) return sL === 0 ? (sR === 0 ? 1 : 0.5) : 0.5;
  return sR === 0 ? 1 : normalCdf((x - a.median) / sR);
}

/** Mean and E[X²] of the per-answer distribution. */
export function threePointMoments(a: ThreePoint): { mean: number; secondMoment: number } {
  const sL = (a.median - a.low) / Z90;
  const sR = (a.high - a.median) / Z90;
  const m = a.median;
  return {
    mean: m + (sR - sL) / Math.sqrt(2 * Math.PI),
    secondMoment: m * m + Math.sqrt(2 / Math.PI) * m * (sR - sL) + (sL * sL + sR * sR) / 2,
  };
}

/**
 * Linear opinion pool (equal weights) of three-point answers; see the module comment.
 * @throws RangeError for no answers, a non-finite value, or low ≤ median ≤ high order broken.
 * Complexity O(n · 200) (bisection per quantile).
 * @example poolThreePoint([{ low: 8, median: 10, high: 12 }]).p90 // 12
 */
export function poolThreePoint(answers: readonly ThreePoint[]): PooledDistribution {
  if (answers.length === 0) throw new RangeError("poolThreePoint: no answers to pool");
  answers.forEach(check);
  const n = answers.length;
  const cdf = (x: number) => answers.reduce((s, a) => s + threePointCdf(a, x), 0) / n;
  const lo0 = Math.min(...answers.map((a) => a.median - 10 * Math.max(a.median - a.low, 0) - 1));
  const hi0 = Math.max(...answers.map((a) => a.median + 10 * Math.max(a.high - a.median, 0) + 1));
  const tol = 1e-12 * Math.max(1, hi0 - lo0);
  /** Smallest x with F(x) ≥ p (the usual generalised inverse), by bisection. */
  const q = (p: number): number => {
    let lo = lo0;
    let hi = hi0;
    for (let i = 0; i < 200 && hi - lo > tol; i++) {
      const mid = (lo + hi) / 2;
      if (cdf(mid) >= p) hi = mid;
      else lo = mid;
    }
    return hi;
  };
  let m1 = 0;
  let m2 = 0;
  for (const a of answers) {
    const mo = threePointMoments(a);
    m1 += mo.mean / n;
    m2 += mo.secondMoment / n;
  }
  return {
    n,
    p10: q(0.1),
    p25: q(0.25),
    p50: q(0.5),
    p75: q(0.75),
    p90: q(0.9),
    mean: m1,
    sd: Math.sqrt(Math.max(0, m2 - m1 * m1)),
  };
}

export default poolThreePoint;
