/**
 * The forecast of a total over a window of future periods: the distribution of
 * Y = y_{n+a} + … + y_{n+b} (1 ≤ a ≤ b; a = 1 the next b periods), with the errors' correlation
 * across steps, never the sum of step bounds. Pure TypeScript.
 *
 * Linear innovations models (ETS class 1: A errors, N/A/Ad trend, N/A season; naive and
 * seasonal naive as their limiting cases): the j-step error is
 * e_{n+j} = Σ_{k=0}^{j−1} ψ_k ε_{n+j−k}, ψ_0 = 1, ψ_k = c_k (Hyndman, Koehler, Ord & Snyder
 * 2008, ch. 6), so the error of the total collects innovation ε_{n+i} (i = 1..b) once for every
 * step j of the window with j ≥ i, i.e. steps max(i, a)..b:
 *   Y − Ŷ = Σ_{i=1}^{b} ε_{n+i} Σ_{j=max(i,a)}^{b} ψ_{j−i},  var = σ² Σ_{i=1}^{b} (Σ_{j=max(i,a)}^{b} ψ_{j−i})²
 * (the aggregated forecast variance of Hyndman et al. 2008 §6.6, "lead-time demand", for a
 * window that starts after the next period; for a = 1 it is σ² Σ_{i=1}^{b} (1 + Σ_{k=1}^{b−i} c_k)²).
 * ETS(A,N,N): var = σ² [(a − 1)((b − a + 1)α)² + Σ_{i=a}^{b} (1 + (b − i)α)²]. Bounds are normal.
 * Lag walks (naive, seasonal naive, drift; R's lagwalk): ψ_k = 1 when k is a multiple of the
 * lag, else 0, and the drift's estimation error δ (sd se_b) enters step j ⌈j/lag⌉ times:
 *   var = σ² Σ_{i=1}^{b} (#{j ∈ [max(i,a), b] : j ≡ i mod lag})² + se_b² (Σ_{j=a}^{b} ⌈j/lag⌉)².
 * Non-linear ETS members (M errors, M season): sums over the window of the simulated sample
 * paths (fixed PRNG start value), bounds their type-7 quantiles.
 * Akaike-weighted ETS (`ets-weighted`): the total of its largest-weight member moved to the sum of
 * the weighted means, as its step bounds.
 * Bass diffusion: (b − a + 1)·s² plus the parameters' part gᵀCg of the summed curve (lib/forecast/bass.ts).
 * Other methods: their step variances v_j read as a linear innovations model with
 * non-negative weights, c_k = √((v_{k+1} − v_k)/v_1) (exact for the models above, e.g. ARIMA
 * with positive ψ-weights; an approximation otherwise, said in `how`).
 */
import { checkHorizon, type EtsModel } from "./ets";
import { memberOf } from "./ets/family";
import { errorWeights, hasClosedForm, normalBounds, pointForecasts, sampleBounds } from "./ets/distribution";
import { samplePaths, PATHS, type EtsSpec, type EtsState, type Smoothing } from "./ets/state-space";
import { weightedMembers, weightedPointForecasts } from "./methods/ets-weighted";
import { ForecastInputError, type Fit, type FutureX, type Method } from "./types";
import { bassForecastSum } from "./bass";
import { asBassFit } from "./methods/bass";

/** The total's mean and bounds by level ("80", "95"), and how its distribution was made. */
export interface TotalForecast {
  readonly mean: number;
  readonly sd: number;
  readonly lower: Record<string, number>;
  readonly upper: Record<string, number>;
  readonly how: string;
}

/** ETS members behind the named exponential-smoothing methods. */
const NAMED_ETS: Partial<Record<string, EtsModel>> = {
  ses: { trend: "N", season: "N" },
  holt: { trend: "A", season: "N" },
  "damped-holt": { trend: "Ad", season: "N" },
  "holt-winters-additive": { trend: "A", season: "A" },
  "holt-winters-multiplicative": { trend: "A", season: "M" },
};

/**
 * The weight of each innovation ε_{n+i}, i = 1..b, in the error of the total over steps a..b of a
 * linear innovations model: w_i = Σ_{j=max(i,a)}^{b} ψ_{j−i}, ψ_0 = 1, ψ_k = c_k (c = c_1..c_{b−1};
 * see the file comment). Input: 1 ≤ a ≤ b, c with at least b − 1 finite weights.
 */
export function innovationWeights(c: readonly number[], b: number, a = 1): number[] {
  // cum[m] = Σ_{k=0}^{m} ψ_k, so Σ_{j=lo}^{b} ψ_{j−i} = cum[b − i] − cum[lo − i − 1].
  const cum: number[] = [];
  for (let k = 0; k < b; k++) cum.push((k === 0 ? 0 : cum[k - 1]) + (k === 0 ? 1 : c[k - 1]));
  const w: number[] = [];
  for (let i = 1; i <= b; i++) {
    const skip = Math.max(i, a) - i; // steps i..a−1 lie before the window
    w.push(cum[b - i] - (skip > 0 ? cum[skip - 1] : 0));
  }
  return w;
}

/**
 * σ² Σ_{i=1}^{b} (Σ_{j=max(i,a)}^{b} ψ_{j−i})²: the variance of the total over steps a..b of a
 * linear innovations model ({@link innovationWeights}; see the file comment).
 */
export function linearTotalVariance(sigma2: number, c: readonly number[], b: number, a = 1): number {
  return sigma2 * innovationWeights(c, b, a).reduce((v, w) => v + w * w, 0);
}

/** c_k = √((v_{k+1} − v_k)/v_1), k = 1..h−1: step variances read as a linear innovations model (file comment). */
export function weightsFromStepVariances(v: readonly number[]): number[] {
  return v.slice(1).map((x, k) => Math.sqrt(Math.max(x - v[k], 0) / v[0]));
}

function fromNormal(mean: number, variance: number, levels: readonly number[], how: string): TotalForecast {
  const sd = Math.sqrt(Math.max(variance, 0));
  const b = normalBounds(mean, sd, levels);
  const lower: Record<string, number> = {};
  const upper: Record<string, number> = {};
  levels.forEach((lv, l) => {
    lower[String(lv)] = b.lower[l];
    upper[String(lv)] = b.upper[l];
  });
  return { mean, sd, lower, upper, how };
}

function fromPaths(spec: EtsSpec, par: Smoothing, sigma2: number, a: number, b: number, levels: readonly number[], origin: EtsState): TotalForecast {
  const paths = samplePaths(spec, par, origin, sigma2, b);
  const sums = new Array<number>(PATHS).fill(0);
  for (let i = a - 1; i < b; i++) for (let p = 0; p < PATHS; p++) sums[p] += paths[i * PATHS + p];
  sums.sort((x, y) => x - y);
  const bounds = sampleBounds(sums, levels);
  const lower: Record<string, number> = {};
  const upper: Record<string, number> = {};
  levels.forEach((lv, l) => {
    lower[String(lv)] = bounds.lower[l];
    upper[String(lv)] = bounds.upper[l];
  });
  const mean = windowSum(pointForecasts(spec, par, origin, b), a);
  const avg = sums.reduce((x, v) => x + v, 0) / PATHS;
  const sd = Math.sqrt(sums.reduce((x, v) => x + (v - avg) ** 2, 0) / (PATHS - 1));
  return { mean, sd, lower, upper, how: `sum over the window of ${PATHS} simulated sample paths of ETS(${spec.error},${spec.trend},${spec.season})` };
}

/** Σ of x over steps a..x.length (x holds steps 1..b). */
const windowSum = (x: readonly number[], a: number) => x.slice(a - 1).reduce((s, v) => s + v, 0);

/** The total over steps a..b of one ETS member: closed form for class 1, simulated sample paths otherwise. */
function memberTotal(spec: EtsSpec, par: Smoothing, origin: EtsState, sigma2: number, a: number, b: number, levels: readonly number[]): TotalForecast {
  if (spec.error === "A" && hasClosedForm(spec)) {
    const mean = windowSum(pointForecasts(spec, par, origin, b), a);
    return fromNormal(mean, linearTotalVariance(sigma2, errorWeights(spec, par, b), b, a), levels, `closed form for ETS(A,${spec.trend},${spec.season}) (Hyndman et al. 2008 ch. 6)`);
  }
  return fromPaths(spec, par, sigma2, a, b, levels, origin);
}

/**
 * Mean and bounds of the total over steps a..b (`from` = a, default 1; `h` = b) of a fitted
 * method (see the file comment). `futureX` as for the method's forecast (regression).
 * @throws ForecastInputError for a bad horizon or level (the method's own checks), or a first
 *   step that is not a whole number in 1..h.
 */
export function forecastTotal(fit: Fit, method: Method, h: number, levels: readonly number[], futureX?: FutureX, from = 1): TotalForecast {
  if (!Number.isInteger(from) || from < 1 || from > h) throw new ForecastInputError(`the total's first period must be a whole number from 1 to the horizon ${h} (got ${from})`);
  const a = from;
  const named = NAMED_ETS[fit.method];
  if (named || fit.method === "ets") {
    const { spec, par, origin } = named
      ? {
          spec: { error: "A" as const, ...named, m: named.season === "N" ? 1 : fit.season },
          par: { alpha: fit.parameters.alpha, beta: fit.parameters.beta ?? 0, gamma: fit.parameters.gamma ?? 0, phi: fit.parameters.phi ?? 1 },
          origin: {
            level: fit.state.level as number,
            trend: (fit.state.trend as number | undefined) ?? 0,
            ring: Float64Array.from((fit.state.season as readonly number[] | undefined) ?? [0]),
            k: 0,
          },
        }
      : memberOf(fit);
    checkHorizon(method.id, h, levels);
    return memberTotal(spec, par, origin, fit.sigma2, a, h, levels);
  }
  if (fit.method === "ets-weighted") {
    // The largest-weight member's total moved to the weighted mean, as its step bounds (lib/forecast/methods/ets-weighted.ts).
    checkHorizon(method.id, h, levels);
    const { members, top } = weightedMembers(fit);
    const x = members[top];
    const t = memberTotal(x.spec, x.par, x.origin, x.sigma2, a, h, levels);
    const shift = windowSum(weightedPointForecasts(members, h), a) - t.mean;
    const move = (r: Record<string, number>) => Object.fromEntries(Object.entries(r).map(([k, v]) => [k, v + shift]));
    return { mean: t.mean + shift, sd: t.sd, lower: move(t.lower), upper: move(t.upper), how: `${t.how}, moved to the Akaike-weighted mean of the ETS members` };
  }
  if (fit.method === "bass") {
    checkHorizon(method.id, h, levels);
    const periods = Array.from({ length: h - a + 1 }, (_, i) => fit.n + a + i);
    return { ...bassForecastSum(asBassFit(fit), periods, levels), how: "Bass curve summed over the periods; period errors independent, parameter uncertainty by the delta method" };
  }
  const fc = method.forecast(fit, h, levels, futureX);
  const mean = windowSum(fc.mean, a);
  const lag = (fit.state.lastValues as readonly number[] | undefined)?.length;
  if (lag !== undefined && typeof fit.state.driftSe === "number") {
    // ψ_k = 1 at multiples of the lag: ε_{n+i} recurs at steps i, i + lag, …
    const psi = Array.from({ length: h - 1 }, (_, k) => ((k + 1) % lag === 0 ? 1 : 0));
    let drift = 0;
    for (let j = a; j <= h; j++) drift += Math.ceil(j / lag);
    return fromNormal(mean, linearTotalVariance(fit.sigma2, psi, h, a) + (fit.state.driftSe * drift) ** 2, levels, `closed form for a lag-${lag} random walk${fit.state.driftSe > 0 ? " with drift" : ""}`);
  }
  const v = fc.sd.map((s) => s * s);
  if (v.some((x) => !Number.isFinite(x))) throw new ForecastInputError(`${fit.method} gives no step variances, so it has no total`);
  return fromNormal(mean, linearTotalVariance(v[0], weightsFromStepVariances(v), h, a), levels, `${fit.method}'s step variances read as a linear innovations model (approximate)`);
}
