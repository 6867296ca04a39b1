/**
 * Forecast distributions of one ETS member (Hyndman, Koehler, Ord & Snyder 2008, ch. 6):
 * point forecasts, per-step variances where a closed form exists, simulated sample paths
 * otherwise, and the distribution of the total over the next h periods.
 *
 * Classes (ch. 6): class 1 = A errors with N/A trend and N/A season (linear, Gaussian);
 * class 2 = M errors with N/A trend and N/A season (exact mean and variance, §6.3);
 * the rest (M season, or A errors with M season) = simulation (§6.1).
 */
import { normalQuantile } from "../../stats/normal";
import { quantileOfSorted } from "../../stats/quantile";
import { oneStep, samplePaths, update, PATHS, type EtsSpec, type EtsState, type Smoothing } from "./state-space";

/** Whether the member's forecast variances have a closed form here (classes 1 and 2). */
export function hasClosedForm(spec: EtsSpec): boolean {
  return spec.season !== "M";
}

/** Point forecasts for steps 1..h: the recursions run on with zero errors (table 2.1). */
export function pointForecasts(spec: EtsSpec, p: Smoothing, origin: EtsState, h: number): number[] {
  const st: EtsState = { level: origin.level, trend: origin.trend, ring: Float64Array.from(origin.ring), k: origin.k };
  const out: number[] = [];
  for (let i = 0; i < h; i++) {
    const f = oneStep(spec, p, st);
    out.push(f);
    update(spec, p, st, f);
  }
  return out;
}

/**
 * c_j of the class-1 error decomposition y_{n+h} − ŷ_{n+h} = ε_{n+h} + Σ_{j=1}^{h−1} c_j ε_{n+h−j}
 * (Hyndman et al. 2008 table 6.1): c_j = α + β φ_j + γ·[j mod m = 0], φ_j = φ + … + φ^j. Returns c_1..c_{h−1}.
 */
export function errorWeights(spec: EtsSpec, p: Smoothing, h: number): number[] {
  const c: number[] = [];
  let phiJ = 0;
  let pw = 1;
  for (let j = 1; j < h; j++) {
    pw *= p.phi;
    phiJ += pw;
    c.push(p.alpha + (spec.trend !== "N" ? p.beta * phiJ : 0) + (spec.season !== "N" && j % spec.m === 0 ? p.gamma : 0));
  }
  return c;
}

/**
 * Per-step forecast variances for classes 1 and 2 (Hyndman et al. 2008 §6.2–6.3; R's class1
 * and class2): class 1 v_h = σ²(1 + Σ_{j<h} c_j²); class 2 θ_1 = μ_1², θ_h = μ_h² + σ² Σ_{j<h} c_j² θ_{h−j},
 * v_h = (1 + σ²) θ_h − μ_h².
 */
export function stepVariances(spec: EtsSpec, p: Smoothing, sigma2: number, mean: readonly number[]): number[] {
  const h = mean.length;
  const c = errorWeights(spec, p, h);
  if (spec.error === "A") {
    let acc = 1;
    return mean.map((_, i) => {
      const v = sigma2 * acc;
      if (i < c.length) acc += c[i] * c[i];
      return v;
    });
  }
  const theta: number[] = [];
  for (let i = 0; i < h; i++) {
    let t = mean[i] * mean[i];
    for (let j = 1; j <= i; j++) t += sigma2 * c[j - 1] * c[j - 1] * theta[i - j];
    theta.push(t);
  }
  return theta.map((t, i) => (1 + sigma2) * t - mean[i] * mean[i]);
}

/** Lower and upper type-7 quantiles of each level from an ascending sample (Hyndman & Fan 1996). */
export function sampleBounds(sorted: readonly number[], levels: readonly number[]): { lower: number[]; upper: number[] } {
  return {
    lower: levels.map((lv) => quantileOfSorted(sorted, 0.5 - lv / 200, 7)),
    upper: levels.map((lv) => quantileOfSorted(sorted, 0.5 + lv / 200, 7)),
  };
}

/** Normal bounds mean ± z_{(1+L/100)/2}·sd for each level. */
export function normalBounds(mean: number, sd: number, levels: readonly number[]): { lower: number[]; upper: number[] } {
  const z = levels.map((lv) => normalQuantile(0.5 + lv / 200));
  return { lower: z.map((q) => mean - q * sd), upper: z.map((q) => mean + q * sd) };
}

/** Forecast of one member: means, sd and bounds per step (bounds[l][i] for levels[l], step i + 1). */
export interface MemberForecast {
  readonly mean: number[];
  readonly sd: number[];
  readonly lower: number[][];
  readonly upper: number[][];
}

/**
 * Steps 1..h. Classes 1–2: normal bounds from the closed-form variances (as R's forecast.ets;
 * for class 2 the normal shape is an approximation, §6.3). Otherwise: type-7 quantiles of
 * PATHS simulated paths (fixed PRNG start value), sd from the same paths, means the point
 * forecasts (as R's forecast.ets with simulate = TRUE). No levels: no simulation, sd NaN.
 */
export function memberForecast(spec: EtsSpec, p: Smoothing, origin: EtsState, sigma2: number, h: number, levels: readonly number[]): MemberForecast {
  const mean = pointForecasts(spec, p, origin, h);
  const lower: number[][] = levels.map(() => []);
  const upper: number[][] = levels.map(() => []);
  if (hasClosedForm(spec)) {
    const sd = stepVariances(spec, p, sigma2, mean).map((v) => Math.sqrt(Math.max(v, 0)));
    mean.forEach((mu, i) => {
      const b = normalBounds(mu, sd[i], levels);
      levels.forEach((_, l) => {
        lower[l].push(b.lower[l]);
        upper[l].push(b.upper[l]);
      });
    });
    return { mean, sd, lower, upper };
  }
  if (levels.length === 0) return { mean, sd: mean.map(() => NaN), lower, upper };
  const b = pathBounds(samplePaths(spec, p, origin, sigma2, h), PATHS, h, levels);
  return { mean, sd: b.sd, lower: b.lower, upper: b.upper };
}

/**
 * Per-step sd (n − 1 divisor) and type-7 bounds (Hyndman & Fan 1996) of each level from
 * simulated paths, step-major (paths[i·count + j]: step i + 1 of path j); the paths are
 * reordered in place. Type 7 reads only the order statistics at ⌊(n − 1)p⌋ and ⌈(n − 1)p⌉, so
 * only those are put in their sorted places (the values a full sort gives, in linear expected
 * time); a step with a non-finite path is sorted in full (NaN last).
 */
export function pathBounds(paths: Float64Array, count: number, h: number, levels: readonly number[]): { sd: number[]; lower: number[][]; upper: number[][] } {
  const sd: number[] = [];
  const lower: number[][] = levels.map(() => []);
  const upper: number[][] = levels.map(() => []);
  // Positions (0-based, ascending) of the order statistics the quantiles read.
  const ks = [
    ...new Set(levels.flatMap((lv) => [0.5 - lv / 200, 0.5 + lv / 200].flatMap((q) => [Math.floor((count - 1) * q), Math.ceil((count - 1) * q)]))),
  ].sort((a, b) => a - b);
  for (let i = 0; i < h; i++) {
    const col = paths.subarray(i * count, (i + 1) * count);
    const s = sampleSd(col);
    sd.push(s);
    if (Number.isFinite(s)) selectOrderStatistics(col, ks);
    else col.sort(); // a typed array sorts numerically, NaN last
    const b = sampleBounds(col as unknown as readonly number[], levels);
    levels.forEach((_, l) => {
      lower[l].push(b.lower[l]);
      upper[l].push(b.upper[l]);
    });
  }
  return { sd, lower, upper };
}

/**
 * Rearranges finite values `a` in place so that a[k] holds the k-th smallest value (0-based)
 * for every k in `ks` (ascending, within range), with no larger value before and no smaller
 * one after each such position: the values a full sort would put there. Hoare's selection
 * (Hoare 1961, "Algorithm 65: Find", CACM 4(7); Wirth's formulation), O(n) expected per
 * position: the middle position of `ks` first, then those below it in the part below it and
 * those above in the part above (each later search in a shorter part); no allocation.
 */
function selectOrderStatistics(a: Float64Array, ks: readonly number[], from = 0, to = ks.length, lo = 0, hi = a.length - 1): void {
  if (from >= to) return;
  const mid = (from + to) >> 1;
  const k = ks[mid];
  let left = lo;
  let right = hi;
  while (left < right) {
    const x = a[k];
    let i = left;
    let j = right;
    do {
      while (a[i] < x) i++;
      while (x < a[j]) j--;
      if (i <= j) {
        const tmp = a[i];
        a[i] = a[j];
        a[j] = tmp;
        i++;
        j--;
      }
    } while (i <= j);
    if (j < k) left = i;
    if (k < i) right = j;
  }
  selectOrderStatistics(a, ks, from, mid, lo, k - 1);
  selectOrderStatistics(a, ks, mid + 1, to, k + 1, hi);
}

/** Sample standard deviation (n − 1 divisor). */
export function sampleSd(x: ArrayLike<number>): number {
  let sum = 0;
  for (let i = 0; i < x.length; i++) sum += x[i];
  const avg = sum / x.length;
  let ss = 0;
  for (let i = 0; i < x.length; i++) ss += (x[i] - avg) ** 2;
  return Math.sqrt(ss / (x.length - 1));
}
