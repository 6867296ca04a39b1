/**
 * The forecast of a total: the distribution of Y = y_{n+1} + … + y_{n+h}, with the errors'
 * correlation across steps, never the sum of step bounds. Pure TypeScript.
 *
 * Linear innovations models (ETS class 1: A errors, N/A/Ad trend, N/A season; naive and
 * seasonal naive as their limiting cases): the h-step error is
 * e_{n+j} = ε_{n+j} + Σ_{k=1}^{j−1} c_k ε_{n+j−k} (Hyndman, Koehler, Ord & Snyder 2008, ch. 6),
 * so the error of the total collects each innovation ε_{n+i} once for every step j ≥ i:
 *   Y − Ŷ = Σ_{i=1}^{h} ε_{n+i} (1 + Σ_{k=1}^{h−i} c_k),  var = σ² Σ_{i=1}^{h} (1 + Σ_{k=1}^{h−i} c_k)²
 * (the aggregated forecast variance of Hyndman et al. 2008 §6.6, "lead-time demand"); for
 * ETS(A,N,N), c_k = α and var = σ² Σ_{j=1}^{h} (1 + (h − j) α)². Bounds are normal.
 * Lag walks (naive, seasonal naive, drift; R's lagwalk): innovation ε_{n+i} enters every step
 * i, i + lag, … ≤ h, and the drift's estimation error δ (sd se_b) enters step j ⌈j/lag⌉ times:
 *   var = σ² Σ_i (⌊(h − i)/lag⌋ + 1)² + se_b² (Σ_j ⌈j/lag⌉)².
 * Non-linear ETS members (M errors, M season): sums of the simulated sample paths (fixed PRNG
 * start value), bounds their type-7 quantiles.
 * Bass diffusion: h·s² plus the parameters' part gᵀCg of the summed curve (lib/forecast/bass.ts).
 * Other methods: their step variances v_j read as a linear innovations model with
 * non-negative weights, c_k = √((v_{k+1} − v_k)/v_1) (exact for the models above, e.g. ARIMA
 * with positive ψ-weights; an approximation otherwise, said in `how`).
 */
import { checkHorizon, type EtsModel } from "./ets";
import { memberOf } from "./ets/family";
import { errorWeights, hasClosedForm, normalBounds, pointForecasts, sampleBounds } from "./ets/distribution";
import { samplePaths, PATHS, type EtsSpec, type Smoothing } from "./ets/state-space";
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

/** σ² Σ_{i=1}^{h} (1 + Σ_{k=1}^{h−i} c_k)², c = c_1..c_{h−1} (see the file comment). */
export function linearTotalVariance(sigma2: number, c: readonly number[], h: number): number {
  let v = 0;
  let cum = 0; // Σ_{k=1}^{h−i} c_k, grown as i falls from h to 1
  for (let i = h; i >= 1; i--) {
    if (i < h) cum += c[h - i - 1];
    v += (1 + cum) ** 2;
  }
  return sigma2 * v;
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

function fromPaths(spec: EtsSpec, par: Smoothing, fit: Fit, h: number, levels: readonly number[], origin: Parameters<typeof samplePaths>[2]): TotalForecast {
  const paths = samplePaths(spec, par, origin, fit.sigma2, h);
  const sums = new Array<number>(PATHS).fill(0);
  for (let i = 0; i < h; i++) for (let p = 0; p < PATHS; p++) sums[p] += paths[i * PATHS + p];
  sums.sort((a, b) => a - b);
  const b = sampleBounds(sums, levels);
  const lower: Record<string, number> = {};
  const upper: Record<string, number> = {};
  levels.forEach((lv, l) => {
    lower[String(lv)] = b.lower[l];
    upper[String(lv)] = b.upper[l];
  });
  const mean = pointForecasts(spec, par, origin, h).reduce((a, v) => a + v, 0);
  const avg = sums.reduce((a, v) => a + v, 0) / PATHS;
  const sd = Math.sqrt(sums.reduce((a, v) => a + (v - avg) ** 2, 0) / (PATHS - 1));
  return { mean, sd, lower, upper, how: `sum of ${PATHS} simulated sample paths of ETS(${spec.error},${spec.trend},${spec.season})` };
}

/**
 * Mean and bounds of the total of the next h values of a fitted method (see the file comment).
 * `futureX` as for the method's forecast (regression).
 * @throws ForecastInputError for a bad horizon or level (the method's own checks).
 */
export function forecastTotal(fit: Fit, method: Method, h: number, levels: readonly number[], futureX?: FutureX): TotalForecast {
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
    if (spec.error === "A" && hasClosedForm(spec)) {
      const mean = pointForecasts(spec, par, origin, h).reduce((a, v) => a + v, 0);
      return fromNormal(mean, linearTotalVariance(fit.sigma2, errorWeights(spec, par, h), h), levels, `closed form for ETS(A,${spec.trend},${spec.season}) (Hyndman et al. 2008 ch. 6)`);
    }
    return fromPaths(spec, par, fit, h, levels, origin);
  }
  if (fit.method === "bass") {
    checkHorizon(method.id, h, levels);
    const periods = Array.from({ length: h }, (_, i) => fit.n + i + 1);
    return { ...bassForecastSum(asBassFit(fit), periods, levels), how: "Bass curve summed over the periods; period errors independent, parameter uncertainty by the delta method" };
  }
  const fc = method.forecast(fit, h, levels, futureX);
  const mean = fc.mean.reduce((a, v) => a + v, 0);
  const lag = (fit.state.lastValues as readonly number[] | undefined)?.length;
  if (lag !== undefined && typeof fit.state.driftSe === "number") {
    let walk = 0;
    let drift = 0;
    for (let i = 1; i <= h; i++) {
      walk += (Math.floor((h - i) / lag) + 1) ** 2;
      drift += Math.ceil(i / lag);
    }
    return fromNormal(mean, fit.sigma2 * walk + (fit.state.driftSe * drift) ** 2, levels, `closed form for a lag-${lag} random walk${fit.state.driftSe > 0 ? " with drift" : ""}`);
  }
  const v = fc.sd.map((s) => s * s);
  if (v.some((x) => !Number.isFinite(x))) throw new ForecastInputError(`${fit.method} gives no step variances, so it has no total`);
  const c = v.slice(1).map((x, k) => Math.sqrt(Math.max(x - v[k], 0) / v[0]));
  return fromNormal(mean, linearTotalVariance(v[0], c, h), levels, `${fit.method}'s step variances read as a linear innovations model (approximate)`);
}
