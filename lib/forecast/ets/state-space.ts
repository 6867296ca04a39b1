/**
 * One member of the exponential-smoothing family in innovations state-space form, with either
 * additive or multiplicative errors: its one-step recursions on a state object, its likelihood
 * and its simulated sample paths. Pure TypeScript.
 *
 * Source: Hyndman, R. J., Koehler, A. B., Snyder, R. D. & Grose, S. (2002) "A state space
 * framework for automatic forecasting using exponential smoothing methods", IJF 18(3),
 * 439–454; Hyndman, Koehler, Ord & Snyder (2008) "Forecasting with Exponential Smoothing: the
 * state space approach", Springer, table 2.1 and ch. 5 (likelihood) and ch. 6 (forecast
 * distributions).
 *
 * With f_t the one-step forecast (q_t = ℓ_{t−1} + φ b_{t−1}, f_t = q_t, q_t + s_{t−m} or
 * q_t·s_{t−m}), the observation is y_t = f_t + ε_t (error A) or y_t = f_t (1 + ε_t) (error M),
 * ε_t ~ N(0, σ²). For both error types table 2.1's state updates are the same functions of
 * y_t (the error type changes only the likelihood and the forecast distribution), written here
 * as in the error-correction form with p_t the seasonally adjusted observation:
 *   ℓ_t = q_t + α (p_t − q_t),  b_t = φ b_{t−1} + β (p_t − q_t),  s_t = s_{t−m} + γ (r_t − s_{t−m}),
 *   p_t = y_t (N), y_t − s_{t−m} (A), y_t / s_{t−m} (M);  r_t = y_t − q_t (A), y_t / q_t (M).
 * E.g. for M,A,M: p_t − q_t = q_t ε_t, so ℓ_t = q_t (1 + α ε_t) and b_t = b_{t−1} + β q_t ε_t.
 */
import type { SeasonKind, TrendKind } from "./model";

/** Error type: additive or multiplicative. */
export type ErrorKind = "A" | "M";

/** Which member: ETS(error, trend, season) with season length m (1 without season). */
export interface EtsSpec {
  readonly error: ErrorKind;
  readonly trend: TrendKind;
  readonly season: SeasonKind;
  readonly m: number;
}

/** Smoothing parameters in the error-correction form (beta, gamma 0 and phi 1 when absent). */
export interface Smoothing {
  readonly alpha: number;
  readonly beta: number;
  readonly gamma: number;
  readonly phi: number;
}

/** States at one time: level, trend, and the seasonal ring (ring[k] is used next). */
export interface EtsState {
  level: number;
  trend: number;
  ring: Float64Array;
  k: number;
}

/** Short name as in the literature, e.g. "M,Ad,M". */
export function specName(spec: Pick<EtsSpec, "error" | "trend" | "season">): string {
  return `${spec.error},${spec.trend},${spec.season}`;
}

/** A state object from the level, trend and the seasonal states in the order they are used. */
export function makeState(level: number, trend: number, season: ArrayLike<number>): EtsState {
  return { level, trend, ring: Float64Array.from(season.length > 0 ? season : [0]), k: 0 };
}

/** q_t = ℓ_{t−1} + φ b_{t−1}: the level part of the one-step forecast. */
function levelPart(spec: EtsSpec, p: Smoothing, st: EtsState): number {
  return spec.trend === "N" ? st.level : st.level + p.phi * st.trend;
}

/** One-step forecast f_t from the current states. */
export function oneStep(spec: EtsSpec, p: Smoothing, st: EtsState): number {
  const q = levelPart(spec, p, st);
  if (spec.season === "N") return q;
  const s = st.ring[st.k];
  return spec.season === "A" ? q + s : q * s;
}

/** Moves the states on by one observation y (table 2.1, in the form above). */
export function update(spec: EtsSpec, p: Smoothing, st: EtsState, y: number): void {
  const q = levelPart(spec, p, st);
  const s = st.ring[st.k];
  const adj = spec.season === "N" ? y : spec.season === "A" ? y - s : y / s;
  st.level = q + p.alpha * (adj - q);
  if (spec.trend !== "N") st.trend = p.phi * st.trend + p.beta * (adj - q);
  if (spec.season !== "N") {
    st.ring[st.k] = s + p.gamma * ((spec.season === "A" ? y - q : y / q) - s);
    if (++st.k === spec.m) st.k = 0;
  }
}

/** The member's switches, for loops that test them per observation rather than per call. */
function switches(spec: EtsSpec): { trended: boolean; seasonal: boolean; multSeason: boolean; multError: boolean } {
  return { trended: spec.trend !== "N", seasonal: spec.season !== "N", multSeason: spec.season === "M", multError: spec.error === "M" };
}

/** Result of {@link filterSeries}. */
export interface Filtered {
  /** One-step fitted values f_t (null when not asked for). */
  readonly fitted: Float64Array | null;
  /** Σ ε_t², the errors in the model's own units (y − f for A, (y − f)/f for M). */
  readonly sumSq: number;
  /**
   * −2 log-likelihood up to a constant, maximised over σ² (Hyndman et al. 2008 §5.1; as R's
   * forecast::ets): n·log Σ ε_t² (+ 2 Σ log|f_t| for error M). Infinity when not finite.
   */
  readonly lik: number;
  /** States after the last observation (the forecast origin). */
  readonly final: EtsState;
}

/**
 * Runs the recursions over y from the initial states. Never throws; non-finite gives
 * lik = Infinity. With `work` (a state to overwrite, ring of the right length) and no
 * `fitted`, nothing is allocated (the estimation's objective).
 */
export function filterSeries(
  spec: EtsSpec,
  p: Smoothing,
  init: EtsState,
  y: ArrayLike<number>,
  work?: EtsState,
  fitted: Float64Array | null = new Float64Array(y.length),
): Filtered {
  const st: EtsState = work ?? { level: 0, trend: 0, ring: new Float64Array(init.ring.length), k: 0 };
  st.ring.set(init.ring);
  // The recursions of oneStep and update, written out with the member's switches hoisted out of
  // the loop (the same operations in the same order: results are identical).
  const { trended, seasonal, multSeason, multError } = switches(spec);
  const { alpha, beta, gamma, phi } = p;
  const ring = st.ring;
  const m = spec.m;
  let level = init.level;
  let trend = init.trend;
  let k = init.k;
  const n = y.length;
  let sumSq = 0;
  let sumLog = 0;
  for (let t = 0; t < n; t++) {
    const q = trended ? level + phi * trend : level;
    const s = ring[k];
    const f = !seasonal ? q : multSeason ? q * s : q + s;
    if (fitted) fitted[t] = f;
    const yt = y[t];
    const e = multError ? (yt - f) / f : yt - f;
    sumSq += e * e;
    if (multError) sumLog += Math.log(Math.abs(f));
    const adj = !seasonal ? yt : multSeason ? yt / s : yt - s;
    level = q + alpha * (adj - q);
    if (trended) trend = phi * trend + beta * (adj - q);
    if (seasonal) {
      ring[k] = s + gamma * ((multSeason ? yt / q : yt - q) - s);
      if (++k === m) k = 0;
    }
  }
  st.level = level;
  st.trend = trend;
  st.k = k;
  const lik = n * Math.log(sumSq) + 2 * sumLog;
  return { fitted, sumSq, lik: Number.isFinite(lik) ? lik : Infinity, final: st };
}

/**
 * {@link Filtered.lik} of {@link filterSeries} alone, for the estimation's objective, with no
 * fitted values or result object and the loop written out for each error and season. For the
 * M-error members the arithmetic is rearranged for speed (equal up to rounding, relative ~1e-15):
 * one division r_t = y_t / f_t per step gives ε_t = r_t − 1, y_t/s = r_t·q_t and y_t/q_t = r_t·s,
 * and Σ log|f_t| is taken as the log of running products of f_t, renormalised whenever a product
 * leaves [1e-150, 1e150] (so it neither overflows nor underflows while every |f_t| lies within
 * 1e±150; beyond that the trial point is refused, as its likelihood is not finite).
 * `work` (ring of the right length) is overwritten. Never throws; not finite gives Infinity.
 */
export function likelihood(spec: EtsSpec, p: Smoothing, init: EtsState, y: ArrayLike<number>, work: EtsState): number {
  if (spec.error !== "M" || spec.season === "A") return filterSeries(spec, p, init, y, work, null).lik;
  const ring = work.ring;
  ring.set(init.ring);
  const trended = spec.trend !== "N";
  const { alpha, beta, gamma, phi } = p;
  const m = spec.m;
  let level = init.level;
  let trend = init.trend;
  let k = init.k;
  const n = y.length;
  let sumSq = 0;
  let sumLog = 0;
  let prod = 1;
  if (spec.season === "M") {
    for (let t = 0; t < n; t++) {
      const q = trended ? level + phi * trend : level;
      const s = ring[k];
      const f = q * s;
      const r = y[t] / f;
      const e = r - 1;
      sumSq += e * e;
      prod *= f;
      if (!(prod < 1e150 && prod > 1e-150)) {
        sumLog += Math.log(Math.abs(prod));
        prod = 1;
      }
      const d = r * q - q; // y/s − q
      level = q + alpha * d;
      if (trended) trend = phi * trend + beta * d;
      ring[k] = s + gamma * (r * s - s); // y/q − s
      if (++k === m) k = 0;
    }
  } else {
    for (let t = 0; t < n; t++) {
      const q = trended ? level + phi * trend : level;
      const d = y[t] - q;
      const e = d / q;
      sumSq += e * e;
      prod *= q;
      if (!(prod < 1e150 && prod > 1e-150)) {
        sumLog += Math.log(Math.abs(prod));
        prod = 1;
      }
      level = q + alpha * d;
      if (trended) trend = phi * trend + beta * d;
    }
  }
  sumLog += Math.log(Math.abs(prod));
  const lik = n * Math.log(sumSq) + 2 * sumLog;
  return Number.isFinite(lik) ? lik : Infinity;
}

/**
 * Corrected Akaike criterion from {@link Filtered.lik}: AICc = lik + 2k + 2k(k + 1)/(n − k − 1),
 * k = estimated parameters and initial states + 1 for σ² (Hyndman et al. 2002 §3; R's ets).
 * Infinity when n ≤ k + 1.
 */
export function aicc(lik: number, estimated: number, n: number): number {
  const k = estimated + 1;
  if (n - k - 1 <= 0) return Infinity;
  return lik + 2 * k + (2 * k * (k + 1)) / (n - k - 1);
}

/** Fixed PRNG start value of the simulated sample paths (the same fit always gives the same paths). */
export const PATH_RNG_START = 0x2545f491;
/** Number of simulated sample paths. */
export const PATHS = 5000;

/**
 * Standard normal draws: Box–Muller (Box & Muller 1958) on the mulberry32 generator
 * (T. Ettinger, public domain), started at `start`. Deterministic.
 */
export function normalStream(start: number): () => number {
  let rng = start >>> 0;
  const uniform = (): number => {
    rng = (rng + 0x6d2b79f5) >>> 0;
    let t = rng;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  let spare = NaN;
  return (): number => {
    if (!Number.isNaN(spare)) {
      const v = spare;
      spare = NaN;
      return v;
    }
    let u = uniform();
    while (u === 0) u = uniform();
    const v = uniform();
    const r = Math.sqrt(-2 * Math.log(u));
    spare = r * Math.sin(2 * Math.PI * v);
    return r * Math.cos(2 * Math.PI * v);
  };
}

/** Most draws {@link sharedNormals} keeps per start value (8 MB; 5,000 paths of up to 209 steps). */
const SHARED_NORMALS_LIMIT = 1 << 20;
const sharedStreams = new Map<number, { draws: Float64Array; next: () => number }>();

/**
 * The first `count` draws of {@link normalStream}(start), generated once per thread and kept
 * (the simulations draw the same standard normals at every fit, scaled by each fit's σ), or
 * null when `count` is above the limit kept (the caller then draws them itself). Read only.
 */
export function sharedNormals(start: number, count: number): Float64Array | null {
  if (count > SHARED_NORMALS_LIMIT) return null;
  let kept = sharedStreams.get(start);
  if (!kept) {
    kept = { draws: new Float64Array(0), next: normalStream(start) };
    sharedStreams.set(start, kept);
  }
  if (kept.draws.length < count) {
    const draws = new Float64Array(Math.min(Math.max(count, 2 * kept.draws.length), SHARED_NORMALS_LIMIT));
    draws.set(kept.draws);
    for (let i = kept.draws.length; i < draws.length; i++) draws[i] = kept.next();
    kept.draws = draws;
  }
  return kept.draws;
}

/**
 * Simulated future sample paths from the forecast origin `origin`, step-major:
 * out[i·paths + p] is step i + 1 of path p. Each step draws ε ~ N(0, σ²), forms
 * y = f + ε (A) or f (1 + ε) (M) and updates the states with it (Hyndman et al. 2008 §6.1:
 * the simulation route to the forecast distributions of the nonlinear members; R's
 * simulate.ets does the same).
 */
export function samplePaths(spec: EtsSpec, p: Smoothing, origin: EtsState, sigma2: number, h: number, paths = PATHS): Float64Array {
  const out = new Float64Array(h * paths);
  const z = sharedNormals(PATH_RNG_START, h * paths);
  const gauss = z ? null : normalStream(PATH_RNG_START);
  let draw = 0;
  const sigma = Math.sqrt(Math.max(sigma2, 0));
  // oneStep and update written out with the member's switches hoisted (the same operations in
  // the same order: the same paths).
  const ring = new Float64Array(origin.ring.length);
  const { trended, seasonal, multSeason, multError } = switches(spec);
  const { alpha, beta, gamma, phi } = p;
  const m = spec.m;
  for (let j = 0; j < paths; j++) {
    let level = origin.level;
    let trend = origin.trend;
    let k = origin.k;
    ring.set(origin.ring);
    for (let i = 0; i < h; i++) {
      const q = trended ? level + phi * trend : level;
      const s = ring[k];
      const f = !seasonal ? q : multSeason ? q * s : q + s;
      const e = sigma * (z ? z[draw++] : gauss!());
      const y = multError ? f * (1 + e) : f + e;
      out[i * paths + j] = y;
      const adj = !seasonal ? y : multSeason ? y / s : y - s;
      level = q + alpha * (adj - q);
      if (trended) trend = phi * trend + beta * (adj - q);
      if (seasonal) {
        ring[k] = s + gamma * ((multSeason ? y / q : y - q) - s);
        if (++k === m) k = 0;
      }
    }
  }
  return out;
}
