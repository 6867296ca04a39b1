/**
 * The exponential-smoothing family in error-correction (innovations state space) form, the
 * estimation of its parameters and initial states, and its forecast distributions.
 *
 * Pure TypeScript: no framework, database or validation-library imports.
 *
 * Source for every recursion and variance here: Hyndman, R. J., Koehler, A. B., Ord, J. K. &
 * Snyder, R. D. (2008) "Forecasting with Exponential Smoothing: the state space approach",
 * Springer (tables 2.1 and 6.1, ch. 6 class 1), and Hyndman & Athanasopoulos, "Forecasting:
 * Principles and Practice" (FPP), ch. 7–8. The classical component forms are Brown (1959) /
 * Holt (1957) / Winters (1960) / Gardner & McKenzie (1985) (damped trend).
 *
 * Models (additive errors ε_t ~ N(0, σ²); ℓ level, b trend, s season, m season length):
 *   μ_t = q_t (+ s_{t−m} | · s_{t−m}),  q_t = ℓ_{t−1} + φ·b_{t−1}  (φ = 1 undamped, b = 0 no trend)
 *   ETS(A,N,N), (A,A,N), (A,Ad,N), (A,A,A):
 *     ℓ_t = q_t + α ε_t,  b_t = φ b_{t−1} + β ε_t,  s_t = s_{t−m} + γ ε_t
 *   ETS(A,A,M) (Holt-Winters multiplicative seasonality, additive errors):
 *     ℓ_t = q_t + α ε_t / s_{t−m},  b_t = b_{t−1} + β ε_t / s_{t−m},  s_t = s_{t−m} + γ ε_t / q_t
 *
 * Why A,A,M rather than M,A,M for the multiplicative method: estimation minimises the sum of
 * squared one-step errors, which is exactly the likelihood of the additive-error model; M,A,M
 * has the same point recursions but a different likelihood. Its prediction intervals come
 * from simulation with a deterministic random generator (there is no analytic variance for
 * A,A,M; R's forecast::ets simulates too).
 *
 * Parameters are those of the error-correction form, as reported by R's `forecast::ets`:
 * β = α·β* and γ = (1 − α)·γ*, where β* and γ* are the smoothing constants of the classical
 * component form (R's `stats::HoltWinters`, NIST e-Handbook §6.4.3.3). For the additive
 * models the two forms give identical fitted values.
 */
import { minimiseScalar } from "./optimise";
import { ForecastInputError, type Fit, type Forecast, type MethodId } from "./types";
import { normalQuantile } from "../stats/normal";
import { quantileOfSorted } from "../stats/quantile";
import { classicalDecomposition } from "./decompose";
import { normalStream, PATHS, PATH_RNG_START } from "./ets/state-space";

/** Trend component: none, additive, additive damped. */
export type TrendKind = "N" | "A" | "Ad";
/** Seasonal component: none, additive, multiplicative. */
export type SeasonKind = "N" | "A" | "M";

/** Which member of the family. Errors are always additive. */
export interface EtsModel {
  readonly trend: TrendKind;
  readonly season: SeasonKind;
}

/** Lower bound of alpha when estimated (R forecast::ets default). */
export const ALPHA_LOWER = 1e-4;
/** Upper bound of alpha when estimated (R forecast::ets default). */
export const ALPHA_UPPER = 0.9999;
/** Lower bound of beta when estimated; beta is also kept ≤ alpha (R forecast::ets "usual" bounds). */
export const BETA_LOWER = 1e-4;
/** Upper bound of beta when estimated. */
export const BETA_UPPER = 0.9999;
/** Lower bound of gamma when estimated; gamma is also kept ≤ 1 − alpha. */
export const GAMMA_LOWER = 1e-4;
/** Upper bound of gamma when estimated. */
export const GAMMA_UPPER = 0.9999;
/** Lower bound of phi when estimated (R forecast::ets default). */
export const PHI_LOWER = 0.8;
/** Upper bound of phi when estimated (R forecast::ets default). */
export const PHI_UPPER = 0.98;
/** Number of simulated paths for the intervals of the multiplicative-season model. */
export const SIMULATION_PATHS = PATHS;
/** Fixed rng start of the simulation, so that the same fit always gives the same intervals. */
export const SIMULATION_RNG_START = PATH_RNG_START;
/** Number of best start candidates from which the local search is run. */
const SEARCH_RUNS = 3;
/** Levenberg–Marquardt iterations from each start before the leader is chosen. */
const PROBE_ITERATIONS = 5;
/** Relative SSE gain of an accepted Levenberg–Marquardt step under which the joint search stops. */
const JOINT_TOL = 1e-10;
/** Relative SSE gain under which the inner Gauss–Newton iterations of A,A,M stop. */
const INNER_TOL = 1e-11;
/** Distance from a bound under which an estimate is reported as "at the bound". */
const BOUND_NOTE_TOL = 1e-4;

/** Names of the smoothing parameters and initial states a model accepts in `fixed`. */
export function etsKeys(model: EtsModel, m: number): { params: string[]; states: string[] } {
  const params = ["alpha"];
  const states = ["l0"];
  if (model.trend !== "N") {
    params.push("beta");
    states.push("b0");
  }
  if (model.season !== "N") {
    params.push("gamma");
    for (let i = 1; i <= m; i++) states.push(`s${i}`);
  }
  if (model.trend === "Ad") params.push("phi");
  return { params, states };
}

/** Number of parameters estimated when nothing is fixed: smoothing parameters + initial states (m − 1 free seasonal states). */
export function etsParameterCount(model: EtsModel, m: number): number {
  let k = 2; // alpha, l0
  if (model.trend !== "N") k += 2;
  if (model.trend === "Ad") k += 1;
  if (model.season !== "N") k += 1 + (m - 1);
  return k;
}

/**
 * Smallest series length accepted when everything is estimated: one more observation than
 * estimated parameters (so that σ² has a degree of freedom) and, for seasonal models, at
 * least two full seasons.
 */
export function etsMinLength(model: EtsModel, season: number): number {
  const m = model.season === "N" ? 1 : season;
  const k = etsParameterCount(model, m);
  return model.season === "N" ? k + 1 : Math.max(2 * m, k + 1);
}

/** Validate a series: non-empty, finite numbers. @throws ForecastInputError naming the position. */
export function checkSeries(y: readonly number[], what: string): void {
  if (!Array.isArray(y) || y.length === 0) throw new ForecastInputError(`${what}: the series is empty`);
  for (let i = 0; i < y.length; i++) {
    if (typeof y[i] !== "number" || !Number.isFinite(y[i])) {
      throw new ForecastInputError(`${what}: observation ${i + 1} is not a finite number (${String(y[i])})`);
    }
  }
}

/**
 * One pass of the recursions. `s` holds the m seasonal states in time order on entry
 * (s[j] is used for observation j) and is updated in place as a ring buffer: on exit
 * s[(n + j) mod m] is the seasonal state for step j + 1 ahead. Writes one-step fitted values
 * to `mu` (at `offset`) when given, and the final level and trend to `final`. When `y` is
 * null the observations are taken as zero (used for the linear responses). Returns the SSE.
 * No allocation.
 */
function filter(
  y: ArrayLike<number> | null,
  n: number,
  trendOn: boolean,
  season: 0 | 1 | 2,
  m: number,
  alpha: number,
  beta: number,
  gamma: number,
  phi: number,
  l0: number,
  b0: number,
  s: Float64Array,
  mu: Float64Array | null,
  offset: number,
  final: Float64Array | null,
): number {
  let l = l0;
  let b = trendOn ? b0 : 0;
  let sse = 0;
  let k = 0;
  for (let t = 0; t < n; t++) {
    const q = trendOn ? l + phi * b : l;
    const yt = y === null ? 0 : y[t];
    let f: number;
    let e: number;
    if (season === 0) {
      f = q;
      e = yt - f;
      l = q + alpha * e;
      if (trendOn) b = phi * b + beta * e;
    } else if (season === 1) {
      const sv = s[k];
      f = q + sv;
      e = yt - f;
      l = q + alpha * e;
      if (trendOn) b = phi * b + beta * e;
      s[k] = sv + gamma * e;
    } else {
      const sv = s[k];
      f = q * sv;
      e = yt - f;
      l = q + (alpha * e) / sv;
      if (trendOn) b = phi * b + (beta * e) / sv;
      s[k] = sv + (gamma * e) / q;
    }
    if (mu !== null) mu[offset + t] = f;
    sse += e * e;
    if (++k === m) k = 0;
  }
  if (final !== null) {
    final[0] = l;
    final[1] = b;
  }
  return sse;
}

/** Fixed parameters and initial states, already checked. */
interface Given {
  alpha?: number;
  beta?: number;
  gamma?: number;
  phi?: number;
  l0?: number;
  b0?: number;
  s?: number[];
}

function readFixed(what: string, model: EtsModel, m: number, fixed: Readonly<Record<string, number>> | undefined): Given {
  const g: Given = {};
  if (!fixed) return g;
  const { params, states } = etsKeys(model, m);
  const allowed = new Set([...params, ...states]);
  for (const [key, value] of Object.entries(fixed)) {
    if (!allowed.has(key)) {
      throw new ForecastInputError(
        `${what}: unknown fixed parameter "${key}"; this method accepts ${[...params, ...states.slice(0, 3)].join(", ")}${states.length > 3 ? ", …" : ""}`,
      );
    }
    if (typeof value !== "number" || !Number.isFinite(value)) {
      throw new ForecastInputError(`${what}: fixed ${key} must be a finite number`);
    }
  }
  for (const key of ["alpha", "beta", "gamma"] as const) {
    if (key in fixed) {
      const v = fixed[key];
      if (v < 0 || v > 1) throw new ForecastInputError(`${what}: fixed ${key} must be between 0 and 1 (got ${v})`);
      g[key] = v;
    }
  }
  if ("phi" in fixed) {
    const v = fixed.phi;
    if (!(v > 0 && v <= 1)) throw new ForecastInputError(`${what}: fixed phi must be in (0, 1] (got ${v})`);
    g.phi = v;
  }
  if ("l0" in fixed) g.l0 = fixed.l0;
  if ("b0" in fixed) g.b0 = fixed.b0;
  if (model.season !== "N") {
    const given = states.filter((k) => k.startsWith("s") && k in fixed);
    if (given.length > 0 && given.length < m) {
      throw new ForecastInputError(`${what}: give all ${m} initial seasonal states s1…s${m} or none`);
    }
    if (given.length === m) {
      g.s = [];
      for (let i = 1; i <= m; i++) g.s.push(fixed[`s${i}`]);
    }
  }
  return g;
}

/** Plain result of {@link fitEts}. */
export interface EtsFitResult {
  readonly model: EtsModel;
  readonly m: number;
  readonly alpha: number;
  readonly beta: number;
  readonly gamma: number;
  readonly phi: number;
  readonly l0: number;
  readonly b0: number;
  /** Initial seasonal states in time order: initialSeason[j] is used for observation j + 1. */
  readonly initialSeason: number[];
  readonly level: number;
  readonly trend: number;
  /** Seasonal states for steps 1..m ahead. */
  readonly season: number[];
  readonly fitted: number[];
  readonly residuals: number[];
  readonly sse: number;
  readonly sigma2: number;
  /** Number of estimated parameters and initial states. */
  readonly estimated: number;
  /** Objective evaluations used by the optimiser (for benchmarking). */
  readonly evaluations: number;
  readonly notes: string[];
}

/** Scratch space for one fit, allocated once and reused by every objective evaluation. */
interface Workspace {
  /** Centred observations y − c and the centring constant c. */
  yc: Float64Array;
  c: number;
  /** Four seasonal rings of length m: base, l0 response, b0 response, slot-0 response. */
  rings: Float64Array;
  e0: Float64Array;
  rl: Float64Array;
  rb: Float64Array;
  r0: Float64Array;
  corrL: Float64Array;
  corrB: Float64Array;
  corrE: Float64Array;
  uu: Float64Array;
  a: Float64Array;
  rhs: Float64Array;
  z: Float64Array;
}

/**
 * Fit one member of the family: estimate every smoothing parameter and initial state not in
 * `fixed`, by minimising the in-sample sum of squared one-step errors (equivalently, the
 * Gaussian likelihood of the additive-error model), within the bounds above.
 *
 * Estimation (all deterministic):
 * 1. Start candidates for the smoothing parameters (R ets's heuristic start plus a small grid,
 *    see startCandidates) are scored. For the additive models the one-step errors are linear
 *    in the initial states given the parameters, so each candidate is scored with its exact
 *    least-squares states (the states are "concentrated out", see solveStates). For A,A,M
 *    each is scored at classical-decomposition start states (as R's ets, heuristicStates).
 * 2. From the best SEARCH_RUNS candidates (with least-squares states; for A,A,M from a
 *    Gauss–Newton solve of the states, solveStatesMult) a joint Levenberg–Marquardt search
 *    over parameters and states runs PROBE_ITERATIONS iterations; the leader is then run to
 *    convergence (refineJoint). Exact derivatives come from the recursions themselves.
 * 3. For the additive models the states are finally re-solved exactly by least squares at
 *    the chosen parameters. With a single free parameter (e.g. SES), a grid + Brent search on
 *    the concentrated SSE replaces steps 1–2.
 * Warm start: when `warmStart` gives a finite value for every free parameter and free initial
 * state (the keys of `fixed`; extra keys are ignored), steps 1–2 are replaced by one joint
 * Levenberg–Marquardt search run to convergence from that point (parameters clamped into
 * their bounds). Automatic selection passes the estimates of the same model at its forecast
 * origins, which are fits to a prefix of y and hence close to the optimum. The search falls
 * back to steps 1–2 when the start gives a non-finite SSE. Ignored with a single free
 * parameter.
 * Parameters stay in R ets's "usual" region: alpha, phi in their boxes, beta and gamma
 * searched as fractions of [1e-4, min(0.9999, alpha)] and [1e-4, min(0.9999, 1 − alpha)].
 * Estimated seasonal states are constrained to sum to 0 (additive) or m (multiplicative),
 * as in R's ets. A note is kept for every estimate that ends on a bound.
 *
 * σ² = SSE / (n − k), k = number of estimated parameters and states (R forecast::ets's choice).
 * Input: finite y (checked), integer season m ≥ 2 for seasonal models, n ≥ max(2m, k + 1).
 * @throws ForecastInputError for empty/non-finite input, a bad season, too short a series,
 *   out-of-range or unknown fixed values, non-positive data for the multiplicative model.
 */
export function fitEts(
  what: string,
  model: EtsModel,
  y: readonly number[],
  season: number,
  fixed?: Readonly<Record<string, number>>,
  warmStart?: Readonly<Record<string, number>>,
): EtsFitResult {
  checkSeries(y, what);
  const seasonal = model.season !== "N";
  const n = y.length;
  let m = 1;
  if (seasonal) {
    if (!Number.isInteger(season) || season < 2) {
      throw new ForecastInputError(`${what}: needs a season length of at least 2 (got ${season})`);
    }
    m = season;
    if (n < 2 * m) throw new ForecastInputError(`${what}: season length ${m} needs at least ${2 * m} observations (got ${n})`);
  }
  if (model.season === "M") {
    for (let i = 0; i < n; i++) {
      if (!(y[i] > 0)) {
        throw new ForecastInputError(
          `${what}: multiplicative seasonality needs every observation above zero (observation ${i + 1} is ${y[i]})`,
        );
      }
    }
  }
  const g = readFixed(what, model, m, fixed);
  const trendOn = model.trend !== "N";
  const damped = model.trend === "Ad";
  const seasonCode: 0 | 1 | 2 = model.season === "N" ? 0 : model.season === "A" ? 1 : 2;

  // Free smoothing parameters, in the order alpha, beta, gamma, phi.
  const freeNames: ("alpha" | "beta" | "gamma" | "phi")[] = [];
  if (g.alpha === undefined) freeNames.push("alpha");
  if (trendOn && g.beta === undefined) freeNames.push("beta");
  if (seasonal && g.gamma === undefined) freeNames.push("gamma");
  if (damped && g.phi === undefined) freeNames.push("phi");
  const freeL0 = g.l0 === undefined;
  const freeB0 = trendOn && g.b0 === undefined;
  const freeS = seasonal && g.s === undefined;
  const nStates = (freeL0 ? 1 : 0) + (freeB0 ? 1 : 0) + (freeS ? m - 1 : 0);
  const k = freeNames.length + nStates;
  if (n < k + 1) {
    throw new ForecastInputError(`${what}: needs at least ${k + 1} observations to estimate ${k} parameters (got ${n})`);
  }
  const notes: string[] = [];
  let evaluations = 0;

  // Box bounds for the free parameters; partners that are fixed tighten them.
  const lowerOf = { alpha: ALPHA_LOWER, beta: BETA_LOWER, gamma: GAMMA_LOWER, phi: PHI_LOWER };
  const upperOf = { alpha: ALPHA_UPPER, beta: BETA_UPPER, gamma: GAMMA_UPPER, phi: PHI_UPPER };
  if (g.alpha !== undefined) {
    upperOf.beta = Math.min(upperOf.beta, g.alpha);
    upperOf.gamma = Math.min(upperOf.gamma, 1 - g.alpha);
  }
  if (g.beta !== undefined) lowerOf.alpha = Math.max(lowerOf.alpha, g.beta);
  if (g.gamma !== undefined) upperOf.alpha = Math.min(upperOf.alpha, 1 - g.gamma);
  for (const name of freeNames) {
    if (upperOf[name] < lowerOf[name]) {
      notes.push(`${name} has no admissible value given the fixed parameters; held at ${lowerOf[name]}`);
      upperOf[name] = lowerOf[name];
    }
  }
  const iAlpha = freeNames.indexOf("alpha");
  const iBeta = freeNames.indexOf("beta");
  const iGamma = freeNames.indexOf("gamma");
  const iPhi = freeNames.indexOf("phi");
  const par = new Float64Array(4); // alpha, beta, gamma, phi
  // The optimiser sees a box: alpha and phi directly, beta and gamma as fractions u, v ∈ [0, 1]
  // of their admissible ranges [1e-4, min(0.9999, alpha)] and [1e-4, min(0.9999, 1 − alpha)].
  // This is exactly R ets's "usual" region, without non-box constraints.
  const betaHi = (alpha: number): number => Math.max(lowerOf.beta, Math.min(upperOf.beta, alpha));
  const gammaHi = (alpha: number): number => Math.max(lowerOf.gamma, Math.min(upperOf.gamma, 1 - alpha));
  const readPar = (v: ArrayLike<number>): boolean => {
    const alpha = iAlpha >= 0 ? v[iAlpha] : g.alpha!;
    par[0] = alpha;
    par[1] = trendOn ? (iBeta >= 0 ? lowerOf.beta + v[iBeta] * (betaHi(alpha) - lowerOf.beta) : g.beta!) : 0;
    par[2] = seasonal ? (iGamma >= 0 ? lowerOf.gamma + v[iGamma] * (gammaHi(alpha) - lowerOf.gamma) : g.gamma!) : 0;
    par[3] = damped ? (iPhi >= 0 ? v[iPhi] : g.phi!) : 1;
    return true;
  };
  const lower = freeNames.map((nm) => (nm === "beta" || nm === "gamma" ? 0 : lowerOf[nm]));
  const upper = freeNames.map((nm) => (nm === "beta" || nm === "gamma" ? 1 : upperOf[nm]));
  const noteBounds = (x: readonly number[]): void => {
    for (let i = 0; i < freeNames.length; i++) {
      const nm = freeNames[i];
      if (nm === "beta" || nm === "gamma") {
        const hiValue = nm === "beta" ? betaHi(par[0]) : gammaHi(par[0]);
        if (x[i] < BOUND_NOTE_TOL) notes.push(`${nm} at its lower bound ${lowerOf[nm]}`);
        else if (x[i] > 1 - BOUND_NOTE_TOL) {
          notes.push(
            hiValue === upperOf[nm]
              ? `${nm} at its upper bound ${upperOf[nm]}`
              : nm === "beta"
                ? "beta at its bound beta ≤ alpha"
                : "gamma at its bound gamma ≤ 1 − alpha",
          );
        }
      } else {
        noteBound(notes, nm, x[i], lower[i], upper[i]);
      }
    }
  };

  // Warm start in the search coordinates (see readPar), or null when `warmStart` lacks a free value.
  const warm = ((): { x: number[]; z: Float64Array } | null => {
    const start = warmStart;
    if (!start || freeNames.length < 2) return null;
    const keys: string[] = [...freeNames];
    if (freeL0) keys.push("l0");
    if (freeB0) keys.push("b0");
    if (freeS) for (let i = 1; i < m; i++) keys.push(`s${i}`);
    for (const key of keys) if (typeof start[key] !== "number" || !Number.isFinite(start[key])) return null;
    const clamp = (v: number, lo: number, hi: number) => Math.min(hi, Math.max(lo, v));
    const alpha = iAlpha >= 0 ? clamp(start.alpha, lowerOf.alpha, upperOf.alpha) : g.alpha!;
    const frac = (v: number, lo: number, hi: number) => (hi > lo ? clamp((v - lo) / (hi - lo), 0, 1) : 0);
    const x = freeNames.map((nm) =>
      nm === "alpha"
        ? alpha
        : nm === "beta"
          ? frac(start.beta, lowerOf.beta, betaHi(alpha))
          : nm === "gamma"
            ? frac(start.gamma, lowerOf.gamma, gammaHi(alpha))
            : clamp(start.phi, lowerOf.phi, upperOf.phi),
    );
    const z = new Float64Array(nStates);
    for (let j = 0; j < nStates; j++) z[j] = start[keys[freeNames.length + j]];
    return { x, z };
  })();

  const jointSpec = (): JointSpec => ({
    nPar: freeNames.length,
    iAlpha,
    iBeta,
    iGamma,
    iPhi,
    lower,
    upper,
    betaLo: lowerOf.beta,
    betaUp: upperOf.beta,
    gammaLo: lowerOf.gamma,
    gammaUp: upperOf.gamma,
    alphaFixed: g.alpha ?? NaN,
    betaFixed: g.beta ?? 0,
    gammaFixed: g.gamma ?? (model.season === "M" ? NaN : 0),
    phiFixed: g.phi ?? 1,
  });

  const yArr = Float64Array.from(y);
  let ybar = 0;
  for (let t = 0; t < n; t++) ybar += yArr[t];
  ybar /= n;
  const ws: Workspace = {
    yc: yArr.map((v) => v - ybar),
    c: ybar,
    rings: new Float64Array(4 * m),
    e0: new Float64Array(n),
    rl: new Float64Array(n),
    rb: new Float64Array(n),
    r0: new Float64Array(n),
    corrL: new Float64Array(m),
    corrB: new Float64Array(m),
    corrE: new Float64Array(m),
    uu: new Float64Array(m * m),
    a: new Float64Array(nStates * nStates),
    rhs: new Float64Array(nStates),
    z: new Float64Array(nStates),
  };
  let bestL0 = g.l0 ?? 0;
  let bestB0 = g.b0 ?? 0;
  let bestS: Float64Array = g.s ? Float64Array.from(g.s) : new Float64Array(m);
  let bestPar: Float64Array;

  if (model.season !== "M") {
    // ---- Additive models: states by least squares for given parameters; parameters by search. ----
    const concentrated = (v: ArrayLike<number>): number => {
      if (!readPar(v)) return Infinity;
      return solveStates(n, trendOn, seasonCode, m, par, g, freeL0, freeB0, freeS, nStates, ws);
    };
    let best = { x: [] as number[], value: Infinity };
    if (freeNames.length === 1) {
      // One parameter: grid + Brent (fewer evaluations than a simplex).
      const arg = new Float64Array(1);
      const r = minimiseScalar((v) => ((arg[0] = v), concentrated(arg)), lower[0], upper[0], { tol: 1e-9 });
      evaluations += r.evaluations;
      best = { x: [r.x], value: r.value };
    } else if (freeNames.length > 1 && warm !== null && Number.isFinite(concentrated(warm.x))) {
      // Warm start: one joint search from the given point, run to convergence.
      const r = refineJoint(yArr, n, m, trendOn, seasonCode, g, freeL0, freeB0, freeS, nStates, jointSpec(), warm.x, warm.z);
      evaluations += r.iterations + 1;
      best = { x: r.x, value: r.sse };
    } else if (freeNames.length > 1) {
      // Several parameters: score the start candidates with their exact least-squares states,
      // then refine the best ones jointly (parameters and states) by Levenberg–Marquardt.
      const pick = bestCandidates(concentrated, startCandidates(freeNames, lowerOf, upperOf, m), SEARCH_RUNS);
      evaluations += pick.evaluations;
      const spec = jointSpec();
      // A few iterations from each start, then the leader is run to convergence.
      const z0 = new Float64Array(nStates);
      let lead: { x: number[]; z: Float64Array; sse: number } | null = null;
      for (const x0 of pick.starts) {
        if (!Number.isFinite(concentrated(x0))) continue;
        z0.set(ws.z);
        if (freeL0) z0[0] += ws.c; // states of the centred data → raw data
        const r = refineJoint(yArr, n, m, trendOn, seasonCode, g, freeL0, freeB0, freeS, nStates, spec, x0, z0, PROBE_ITERATIONS);
        evaluations += r.iterations;
        if (lead === null || r.sse < lead.sse) lead = r;
      }
      if (lead !== null) {
        const r = refineJoint(yArr, n, m, trendOn, seasonCode, g, freeL0, freeB0, freeS, nStates, spec, lead.x, lead.z);
        evaluations += r.iterations;
        best = { x: r.x, value: r.sse };
      }
    } else {
      best = { x: [], value: concentrated([]) };
    }
    readPar(best.x);
    bestPar = Float64Array.from(par);
    solveStates(n, trendOn, seasonCode, m, par, g, freeL0, freeB0, freeS, nStates, ws);
    let j = 0;
    if (freeL0) bestL0 = ws.z[j++] + ws.c;
    if (freeB0) bestB0 = ws.z[j++];
    if (freeS) {
      let sum = 0;
      for (let i = 0; i < m - 1; i++) {
        bestS[i] = ws.z[j + i];
        sum += ws.z[j + i];
      }
      bestS[m - 1] = -sum;
    }
    // Record bound hits.
    noteBounds(best.x);
  } else {
    // ---- A,A,M: states by Gauss–Newton (Levenberg–Marquardt) for each trial of the parameters. ----
    const init = heuristicStates(y, m, trendOn, "multiplicative");
    const start = new Float64Array(nStates);
    {
      let j = 0;
      if (freeL0) start[j++] = init.l0;
      if (freeB0) start[j++] = init.b0;
      if (freeS) for (let i = 0; i < m - 1; i++) start[j + i] = init.s[i];
    }
    const mws = multWorkspace(n, m, nStates);
    mws.z.set(start);
    const objective = (v: Float64Array): number => {
      if (!readPar(v)) return Infinity;
      let sse = solveStatesMult(yArr, n, trendOn, m, par, g, freeL0, freeB0, freeS, nStates, mws);
      if (!Number.isFinite(sse)) {
        mws.z.set(start);
        sse = solveStatesMult(yArr, n, trendOn, m, par, g, freeL0, freeB0, freeS, nStates, mws);
      }
      return Number.isFinite(sse) ? sse : Infinity;
    };
    let best = { x: [] as number[], value: Infinity };
    let bestZ: Float64Array = Float64Array.from(start);
    const spec = jointSpec();
    if (warm !== null) {
      // Warm start: one joint search from the given point, run to convergence.
      const r = refineJoint(yArr, n, m, trendOn, 2, g, freeL0, freeB0, freeS, nStates, spec, warm.x, warm.z);
      evaluations += r.iterations;
      if (Number.isFinite(r.sse)) {
        best = { x: r.x, value: r.sse };
        bestZ = r.z;
      }
    }
    if (!Number.isFinite(best.value)) {
      // No usable warm start: score the start candidates, probe the best, run the leader.
      const pick = bestCandidates(
        // Candidates are scored at the start states (one pass each); the best are refined jointly.
        (v) => {
          if (!readPar(v)) return Infinity;
          loadStates(start, g, trendOn, m, freeL0, freeB0, freeS, mws.s, LB);
          const r = filter(yArr, n, trendOn, 2, m, par[0], par[1], par[2], par[3], LB[0], LB[1], mws.s, null, 0, null);
          return Number.isFinite(r) ? r : Infinity;
        },
        startCandidates(freeNames, lowerOf, upperOf, m),
        SEARCH_RUNS,
      );
      evaluations += pick.evaluations;
      let lead: { x: number[]; z: Float64Array; sse: number } | null = null;
      for (const x0 of pick.starts) {
        // States for this start, then a few joint Levenberg–Marquardt iterations over parameters and states.
        mws.z.set(start);
        if (!Number.isFinite(objective(Float64Array.from(x0)))) continue;
        const r = refineJoint(yArr, n, m, trendOn, 2, g, freeL0, freeB0, freeS, nStates, spec, x0, mws.z, PROBE_ITERATIONS);
        evaluations += r.iterations;
        if (lead === null || r.sse < lead.sse) lead = r;
      }
      if (lead !== null) {
        // The leader is run to convergence.
        const r = refineJoint(yArr, n, m, trendOn, 2, g, freeL0, freeB0, freeS, nStates, spec, lead.x, lead.z);
        evaluations += r.iterations;
        best = { x: r.x, value: r.sse };
        bestZ = r.z;
      }
    }
    if (!Number.isFinite(best.value)) {
      throw new ForecastInputError(`${what}: the multiplicative model could not be fitted to this series`);
    }
    const stateVec = bestZ;
    readPar(best.x);
    bestPar = Float64Array.from(par);
    let j = 0;
    if (freeL0) bestL0 = stateVec[j++];
    if (freeB0) bestB0 = stateVec[j++];
    if (freeS) {
      let sum = 0;
      for (let i = 0; i < m - 1; i++) {
        bestS[i] = stateVec[j + i];
        sum += stateVec[j + i];
      }
      bestS[m - 1] = m - sum;
    }
    noteBounds(best.x);
  }

  // Final pass with the chosen parameters and states.
  const initialSeason = Array.from(bestS);
  const ring = Float64Array.from(bestS);
  const mu = new Float64Array(n);
  const fin = new Float64Array(2);
  const sse = filter(yArr, n, trendOn, seasonCode, m, bestPar[0], bestPar[1], bestPar[2], bestPar[3], bestL0, trendOn ? bestB0 : 0, ring, mu, 0, fin);
  const fitted = Array.from(mu);
  const residuals = fitted.map((f, t) => y[t] - f);
  const seasonNext: number[] = [];
  if (seasonal) for (let j = 0; j < m; j++) seasonNext.push(ring[(n + j) % m]);
  const df = n - k;
  const sigma2 = sse / df;
  if (sse === 0) notes.push("the fit is exact (e.g. a constant series): the intervals have zero width");
  if (model.season === "M") notes.push(`prediction intervals are simulated (${SIMULATION_PATHS} paths; no analytic variance for this model)`);
  return {
    model,
    m,
    alpha: bestPar[0],
    beta: bestPar[1],
    gamma: bestPar[2],
    phi: bestPar[3],
    l0: bestL0,
    b0: trendOn ? bestB0 : 0,
    initialSeason: seasonal ? initialSeason : [],
    level: fin[0],
    trend: fin[1],
    season: seasonNext,
    fitted,
    residuals,
    sse,
    sigma2,
    estimated: k,
    evaluations,
    notes,
  };
}

function noteBound(notes: string[], name: string, v: number, lo: number, hi: number): void {
  if (hi === lo) return;
  if (v - lo < BOUND_NOTE_TOL) notes.push(`${name} at its lower bound ${lo}`);
  else if (hi - v < BOUND_NOTE_TOL) notes.push(`${name} at its upper bound ${hi}`);
}

/**
 * Candidate start points for the smoothing parameters: R ets's heuristic start, a livelier
 * one, and a small deterministic grid (alpha 0.02/0.1/0.3/0.6/0.9/0.99 × beta and gamma at
 * 5%, 50% or 95% of their admissible range × phi 0.82/0.9/0.97). The objective is evaluated
 * at each and the local search runs from the best ones, which guards against local minima
 * (the least-squares objective of these models can have several).
 */
function startCandidates(
  names: readonly ("alpha" | "beta" | "gamma" | "phi")[],
  lowerOf: Record<string, number>,
  upperOf: Record<string, number>,
  m: number,
): number[][] {
  const clampTo = (nm: string, v: number) => Math.min(upperOf[nm], Math.max(lowerOf[nm], v));
  const make = (a: number, bFrac: number, gFrac: number, p: number): number[] =>
    names.map((nm) => {
      if (nm === "alpha") return clampTo("alpha", a);
      // beta and gamma are fractions of their admissible ranges (see readPar in fitEts).
      if (nm === "beta") return bFrac;
      if (nm === "gamma") return gFrac;
      return clampTo("phi", p);
    });
  // Hyndman et al. 2008 §5.2 / R ets: alpha = lower + 0.2(upper − lower)/m, beta = 0.1 of its range,
  // gamma = 0.05 of its range, phi = 0.99 of its range.
  const out: number[][] = [
    make(lowerOf.alpha + (0.2 * (upperOf.alpha - lowerOf.alpha)) / m, 0.1, 0.05, lowerOf.phi + 0.99 * (upperOf.phi - lowerOf.phi)),
    make(0.5, 0.2, 0.2, 0.9),
  ];
  const hasB = names.includes("beta");
  const hasG = names.includes("gamma");
  const hasP = names.includes("phi");
  for (const a of [0.02, 0.1, 0.3, 0.6, 0.9, 0.99]) {
    for (const bf of hasB ? [0.05, 0.5, 0.95] : [0.1]) {
      for (const gf of hasG ? [0.05, 0.5, 0.95] : [0.1]) {
        for (const p of hasP ? [0.82, 0.9, 0.97] : [0.9]) out.push(make(a, bf, gf, p));
      }
    }
  }
  return out;
}

/** The `count` best candidates by objective value (evaluated once each). */
function bestCandidates(
  f: (x: Float64Array) => number,
  candidates: readonly number[][],
  count: number,
): { starts: number[][]; evaluations: number } {
  const scored = candidates.map((c) => ({ c, v: f(Float64Array.from(c)) }));
  scored.sort((p, q) => p.v - q.v);
  return { starts: scored.slice(0, count).map((s) => s.c), evaluations: candidates.length };
}

/**
 * Least-squares initial states for given smoothing parameters (additive models). Fills
 * ws.z with the free states (l0 − c, b0, s1..s_{m−1}) and returns the minimal SSE, or
 * Infinity if the normal equations cannot be solved. No allocation.
 *
 * The additive models are linear and time-invariant in (y, initial state), so the one-step
 * errors are e = e⁰ − X·z, with e⁰ the errors with the free states at zero and X the fitted
 * values' responses to unit initial states (observations at zero). The data are centred
 * first (a constant is absorbed by the level, so the SSE is unchanged) to keep the normal
 * equations well conditioned. A unit seasonal state in slot j leaves everything untouched
 * until observation j and then acts like a unit in slot 0, so the m seasonal responses are
 * shifts of one response r⁰: the Gram matrix comes from lagged products of r⁰ in O(n·m)
 * instead of O(n·m²).
 */
function solveStates(
  n: number,
  trendOn: boolean,
  season: 0 | 1 | 2,
  m: number,
  par: Float64Array,
  g: Given,
  freeL0: boolean,
  freeB0: boolean,
  freeS: boolean,
  p: number,
  ws: Workspace,
): number {
  const { yc, e0, rl, rb, r0, corrL, corrB, corrE, uu, a, rhs, z } = ws;
  const alpha = par[0];
  const beta = par[1];
  const gamma = par[2];
  const phi = par[3];
  // One fused pass: base run on centred data (fixed states at their values, the level shifted
  // by −c, free states at zero) and the responses to unit l0, b0 and slot-0 seasonal states.
  const seasonal = season !== 0;
  const rings = ws.rings;
  if (seasonal) {
    rings.fill(0);
    if (!freeS) for (let i = 0; i < m; i++) rings[i] = g.s![i];
    rings[3 * m] = 1;
  }
  const phiT = trendOn ? phi : 0;
  let lB = freeL0 ? 0 : g.l0! - ws.c;
  let bB = freeB0 || !trendOn ? 0 : g.b0!;
  let lL = 1;
  let bL = 0;
  let lT = 0;
  let bT = 1;
  let lS = 0;
  let bS = 0;
  let ee = 0;
  let ll = 0;
  let lb = 0;
  let bb = 0;
  let le = 0;
  let be = 0;
  let k = 0;
  for (let t = 0; t < n; t++) {
    let sv = seasonal ? rings[k] : 0;
    let q = lB + phiT * bB;
    const eB = yc[t] - (q + sv);
    lB = q + alpha * eB;
    bB = phiT * bB + beta * eB;
    if (seasonal) {
      rings[k] = sv + gamma * eB;
      e0[t] = eB;
    }
    ee += eB * eB;
    let fL = 0;
    if (freeL0) {
      sv = seasonal ? rings[m + k] : 0;
      q = lL + phiT * bL;
      fL = q + sv;
      lL = q - alpha * fL;
      bL = phiT * bL - beta * fL;
      if (seasonal) {
        rings[m + k] = sv - gamma * fL;
        rl[t] = fL;
      }
      ll += fL * fL;
      le += fL * eB;
    }
    if (freeB0) {
      sv = seasonal ? rings[2 * m + k] : 0;
      q = lT + phiT * bT;
      const fT = q + sv;
      lT = q - alpha * fT;
      bT = phiT * bT - beta * fT;
      if (seasonal) {
        rings[2 * m + k] = sv - gamma * fT;
        rb[t] = fT;
      }
      bb += fT * fT;
      be += fT * eB;
      lb += fL * fT;
    }
    if (freeS) {
      sv = rings[3 * m + k];
      q = lS + phiT * bS;
      const fS = q + sv;
      lS = q - alpha * fS;
      bS = phiT * bS - beta * fS;
      rings[3 * m + k] = sv - gamma * fS;
      r0[t] = fS;
    }
    if (++k === m) k = 0;
  }
  if (p === 0) return ee;
  const ns = freeS ? m - 1 : 0;
  const off = (freeL0 ? 1 : 0) + (freeB0 ? 1 : 0);
  if (freeS) {
    // Lagged cross-products with the unconstrained seasonal columns U_j(t) = r0(t − j).
    for (let j = 0; j < m; j++) {
      let cl = 0;
      let cb = 0;
      let ce = 0;
      for (let t = j; t < n; t++) {
        const u = r0[t - j];
        if (freeL0) cl += u * rl[t];
        if (freeB0) cb += u * rb[t];
        ce += u * e0[t];
      }
      corrL[j] = cl;
      corrB[j] = cb;
      corrE[j] = ce;
    }
    // U_i·U_j (i ≤ j) = Σ_{u=0}^{n−1−j} r0(u)·r0(u + j − i).
    for (let d = 0; d < m; d++) {
      let acc = 0;
      const stop = n - 1 - d;
      const recordFrom = n - m;
      let u = 0;
      for (; u < recordFrom && u <= stop; u++) acc += r0[u] * r0[u + d];
      for (; u <= stop; u++) {
        acc += r0[u] * r0[u + d];
        const j = n - 1 - u; // this prefix ends at u = n − 1 − j
        if (j >= d && j < m) uu[(j - d) * m + j] = acc;
      }
      if (n - 1 - d < recordFrom) {
        // Only when n < m + d, which the length checks exclude; kept for safety.
        for (let j = d; j < m; j++) uu[(j - d) * m + j] = acc;
      }
    }
  }
  // Assemble the normal equations in the constrained basis X_sj = U_j − U_{m−1}.
  const M = m - 1;
  let col = 0;
  if (freeL0) {
    a[0] = ll;
    rhs[0] = le;
    if (freeB0) {
      a[1] = lb;
      a[p] = lb;
    }
    for (let j = 0; j < ns; j++) {
      const v = corrL[j] - corrL[M];
      a[off + j] = v;
      a[(off + j) * p] = v;
    }
    col++;
  }
  if (freeB0) {
    a[col * p + col] = bb;
    rhs[col] = be;
    for (let j = 0; j < ns; j++) {
      const v = corrB[j] - corrB[M];
      a[col * p + off + j] = v;
      a[(off + j) * p + col] = v;
    }
  }
  for (let i = 0; i < ns; i++) {
    rhs[off + i] = corrE[i] - corrE[M];
    for (let j = i; j < ns; j++) {
      const v = uu[i * m + j] - uu[i * m + M] - uu[j * m + M] + uu[M * m + M];
      a[(off + i) * p + off + j] = v;
      a[(off + j) * p + off + i] = v;
    }
  }
  let maxDiag = 0;
  for (let i = 0; i < p; i++) if (a[i * p + i] > maxDiag) maxDiag = a[i * p + i];
  const ridge = 1e-12 * maxDiag + 1e-300;
  for (let i = 0; i < p; i++) {
    a[i * p + i] += ridge;
    z[i] = rhs[i];
  }
  if (!choleskySolve(a, z, p)) return Infinity;
  // SSE(z) = e⁰·e⁰ − z·(X'e⁰) at the least-squares solution.
  let explained = 0;
  for (let i = 0; i < p; i++) explained += z[i] * rhs[i];
  const sse = Math.max(ee - explained, 0);
  return Number.isFinite(sse) ? sse : Infinity;
}

/** Scratch space of {@link solveStatesMult}. */
interface MultWorkspace {
  z: Float64Array;
  zTrial: Float64Array;
  s: Float64Array;
  dl: Float64Array;
  db: Float64Array;
  ds: Float64Array;
  jrow: Float64Array;
  a: Float64Array;
  rhs: Float64Array;
  step: Float64Array;
  chol: Float64Array;
}

function multWorkspace(n: number, m: number, p: number): MultWorkspace {
  return {
    z: new Float64Array(p),
    zTrial: new Float64Array(p),
    s: new Float64Array(m),
    dl: new Float64Array(p),
    db: new Float64Array(p),
    ds: new Float64Array(m * p),
    jrow: new Float64Array(p),
    a: new Float64Array(p * p),
    rhs: new Float64Array(p),
    step: new Float64Array(p),
    chol: new Float64Array(p * p),
  };
}

/** Load the states of vector z (free ones) and the fixed ones; returns [l0, b0] through `out`. */
function loadStates(
  z: Float64Array,
  g: Given,
  trendOn: boolean,
  m: number,
  freeL0: boolean,
  freeB0: boolean,
  freeS: boolean,
  s: Float64Array,
  out: Float64Array,
  seasonTotal = m,
): void {
  let j = 0;
  out[0] = freeL0 ? z[j++] : g.l0!;
  out[1] = trendOn ? (freeB0 ? z[j++] : g.b0!) : 0;
  if (freeS) {
    let sum = 0;
    for (let i = 0; i < m - 1; i++) {
      s[i] = z[j + i];
      sum += z[j + i];
    }
    s[m - 1] = seasonTotal - sum;
  } else if (g.s) {
    for (let i = 0; i < m; i++) s[i] = g.s[i];
  }
}

const LB = new Float64Array(2);

/**
 * Least-squares initial states of A,A,M for given parameters, by Levenberg–Marquardt
 * (Gauss–Newton with adaptive damping; Marquardt 1963) with exact derivatives of the
 * one-step fitted values propagated through the recursions. Starts from ws.z (warm start),
 * leaves the solution there and returns its SSE (Infinity on failure). No allocation.
 */
function solveStatesMult(
  y: Float64Array,
  n: number,
  trendOn: boolean,
  m: number,
  par: Float64Array,
  g: Given,
  freeL0: boolean,
  freeB0: boolean,
  freeS: boolean,
  p: number,
  ws: MultWorkspace,
): number {
  const alpha = par[0];
  const beta = par[1];
  const gamma = par[2];
  const phi = par[3];
  const { z, zTrial, s, dl, db, ds, jrow, a, rhs, step, chol } = ws;
  loadStates(z, g, trendOn, m, freeL0, freeB0, freeS, s, LB);
  let sse = filter(y, n, trendOn, 2, m, alpha, beta, gamma, phi, LB[0], LB[1], s, null, 0, null);
  if (!Number.isFinite(sse)) return Infinity;
  if (p === 0) return sse;
  let lambda = 1e-6;
  for (let iter = 0; iter < 50; iter++) {
    // Derivative pass: J'J and J'e.
    loadStates(z, g, trendOn, m, freeL0, freeB0, freeS, s, LB);
    dl.fill(0);
    db.fill(0);
    ds.fill(0);
    {
      let j = 0;
      if (freeL0) dl[j++] = 1;
      if (freeB0) db[j++] = 1;
      if (freeS) {
        for (let i = 0; i < m - 1; i++) {
          ds[i * p + j + i] = 1;
          ds[(m - 1) * p + j + i] = -1;
        }
      }
    }
    a.fill(0);
    rhs.fill(0);
    let l = LB[0];
    let b = LB[1];
    let k = 0;
    for (let t = 0; t < n; t++) {
      const q = trendOn ? l + phi * b : l;
      const sv = s[k];
      const yt = y[t];
      const e = yt - q * sv;
      const ysv2 = yt / (sv * sv);
      const yq2 = yt / (q * q);
      const ko = k * p;
      for (let j = 0; j < p; j++) {
        const dq = trendOn ? dl[j] + phi * db[j] : dl[j];
        const dsv = ds[ko + j];
        jrow[j] = dq * sv + q * dsv;
        dl[j] = (1 - alpha) * dq - alpha * ysv2 * dsv;
        if (trendOn) db[j] = phi * db[j] - beta * (ysv2 * dsv + dq);
        ds[ko + j] = (1 - gamma) * dsv - gamma * yq2 * dq;
      }
      for (let i = 0; i < p; i++) {
        const ji = jrow[i];
        rhs[i] += ji * e;
        const oi = i * p;
        for (let j = i; j < p; j++) a[oi + j] += ji * jrow[j];
      }
      l = q + (alpha * e) / sv;
      if (trendOn) b = phi * b + (beta * e) / sv;
      s[k] = sv + (gamma * e) / q;
      if (++k === m) k = 0;
    }
    let improved = false;
    for (let attempt = 0; attempt < 12; attempt++) {
      // Solve (A + λ·diag(A)) step = rhs by Cholesky.
      dampedSystem(a, rhs, lambda, p, chol, step);
      if (choleskySolve(chol, step, p)) {
        for (let i = 0; i < p; i++) zTrial[i] = z[i] + step[i];
        loadStates(zTrial, g, trendOn, m, freeL0, freeB0, freeS, s, LB);
        const trial = filter(y, n, trendOn, 2, m, alpha, beta, gamma, phi, LB[0], LB[1], s, null, 0, null);
        if (trial <= sse) {
          const gain = sse - trial;
          z.set(zTrial);
          sse = trial;
          lambda = Math.max(lambda * 0.1, 1e-12);
          improved = gain > INNER_TOL * sse;
          break;
        }
      }
      lambda = lambda === 0 ? 1e-6 : lambda * 10;
    }
    if (!improved) break;
  }
  return sse;
}

/** How the free smoothing parameters map onto the search box (see readPar in fitEts). */
interface JointSpec {
  nPar: number;
  iAlpha: number;
  iBeta: number;
  iGamma: number;
  iPhi: number;
  lower: readonly number[];
  upper: readonly number[];
  betaLo: number;
  betaUp: number;
  gammaLo: number;
  gammaUp: number;
  alphaFixed: number;
  betaFixed: number;
  gammaFixed: number;
  phiFixed: number;
}

/**
 * The Levenberg–Marquardt system (A + λ·diag(A))·step = rhs (Marquardt 1963): copies the upper
 * triangle of `a` (row-major p×p) into the full symmetric `chol`, scales its diagonal by 1 + λ,
 * and puts `rhs` into `step`, ready for {@link choleskySolve}.
 */
function dampedSystem(a: Float64Array, rhs: Float64Array, lambda: number, p: number, chol: Float64Array, step: Float64Array): void {
  for (let i = 0; i < p; i++) {
    for (let j = i; j < p; j++) {
      const v = a[i * p + j];
      chol[i * p + j] = v;
      chol[j * p + i] = v;
    }
    chol[i * p + i] = a[i * p + i] * (1 + lambda) + 1e-300;
    step[i] = rhs[i];
  }
}

/**
 * Solves C·x = b in place by Cholesky factorisation (Golub & Van Loan, Matrix Computations,
 * §4.2): `c` holds the symmetric p×p matrix row-major and is overwritten by its lower factor;
 * `x` holds b on entry and the solution on return. Returns false, leaving `x` partly
 * overwritten, when C is not positive definite. O(p³); no allocation.
 */
function choleskySolve(c: Float64Array, x: Float64Array, p: number): boolean {
  for (let j = 0; j < p; j++) {
    let d = c[j * p + j];
    for (let k = 0; k < j; k++) d -= c[j * p + k] * c[j * p + k];
    if (!(d > 0)) return false;
    const ljj = Math.sqrt(d);
    c[j * p + j] = ljj;
    for (let i = j + 1; i < p; i++) {
      let v = c[i * p + j];
      for (let k = 0; k < j; k++) v -= c[i * p + k] * c[j * p + k];
      c[i * p + j] = v / ljj;
    }
  }
  for (let i = 0; i < p; i++) {
    let v = x[i];
    for (let k = 0; k < i; k++) v -= c[i * p + k] * x[k];
    x[i] = v / c[i * p + i];
  }
  for (let i = p - 1; i >= 0; i--) {
    let v = x[i];
    for (let k = i + 1; k < p; k++) v -= c[k * p + i] * x[k];
    x[i] = v / c[i * p + i];
  }
  return true;
}

/**
 * One derivative pass of {@link refineJoint}: accumulates J'J (upper triangle) into `a` and
 * J'e into `rhs`, J being the derivatives of the one-step fitted values with respect to the
 * search variables. The rows of J and the errors are first stored (column-major in `jcols`,
 * n·P values, and in `ecol`, n values); the products are then formed as dot products over
 * time, each summed in time order as a running update would. A separate top-level function
 * (no captured variables) so that the engine compiles its loops tightly. Returns the SSE.
 */
function jointPass(
  y: Float64Array,
  n: number,
  m: number,
  trendOn: boolean,
  season: 0 | 1 | 2,
  P: number,
  iAlpha: number,
  iBeta: number,
  iGamma: number,
  iPhi: number,
  alpha: number,
  beta: number,
  gamma: number,
  phi: number,
  cBA: number,
  cBU: number,
  cGA: number,
  cGV: number,
  l0: number,
  b0: number,
  ring: Float64Array,
  dl: Float64Array,
  db: Float64Array,
  ds: Float64Array,
  jrow: Float64Array,
  a: Float64Array,
  rhs: Float64Array,
  jcols: Float64Array,
  ecol: Float64Array,
): number {
  let l = l0;
  let b = b0;
  let k = 0;
  let sse = 0;
  for (let t = 0; t < n; t++) {
    const q = trendOn ? l + phi * b : l;
    const sv = season === 0 ? 0 : ring[k];
    const ko = k * P;
    let e: number;
    if (season === 2) {
      e = y[t] - q * sv;
      const invS = 1 / sv;
      const invQ = 1 / q;
      const eS2 = e * invS * invS;
      const eQ2 = e * invQ * invQ;
      for (let j = 0; j < P; j++) {
        const dq = trendOn ? dl[j] + phi * db[j] + (j === iPhi ? b : 0) : dl[j];
        const dsv = ds[ko + j];
        const df = dq * sv + q * dsv;
        const common = -df * invS - eS2 * dsv;
        dl[j] = dq + alpha * common;
        if (trendOn) db[j] = phi * db[j] + beta * common;
        ds[ko + j] = dsv + gamma * (-df * invQ - eQ2 * dq);
        jrow[j] = df;
      }
      // Direct terms of the parameter directions (∂/∂α, ∂/∂β, ∂/∂γ, ∂/∂φ of the updates).
      if (iAlpha >= 0) dl[iAlpha] += e * invS;
      if (iBeta >= 0) db[iBeta] += e * invS;
      if (iGamma >= 0) ds[ko + iGamma] += e * invQ;
      if (iPhi >= 0) db[iPhi] += b;
      l = q + alpha * e * invS;
      if (trendOn) b = phi * b + beta * e * invS;
      ring[k] = sv + gamma * e * invQ;
    } else {
      e = y[t] - (q + sv);
      for (let j = 0; j < P; j++) {
        const dq = trendOn ? dl[j] + phi * db[j] + (j === iPhi ? b : 0) : dl[j];
        const dsv = season === 0 ? 0 : ds[ko + j];
        const df = dq + dsv;
        dl[j] = dq - alpha * df;
        if (trendOn) db[j] = phi * db[j] - beta * df;
        if (season !== 0) ds[ko + j] = dsv - gamma * df;
        jrow[j] = df;
      }
      // Direct terms of the parameter directions (∂/∂α, ∂/∂β, ∂/∂γ, ∂/∂φ of the updates).
      if (iAlpha >= 0) dl[iAlpha] += e;
      if (iBeta >= 0) db[iBeta] += e;
      if (iGamma >= 0) ds[ko + iGamma] += e;
      if (iPhi >= 0) db[iPhi] += b;
      l = q + alpha * e;
      if (trendOn) b = phi * b + beta * e;
      if (season !== 0) ring[k] = sv + gamma * e;
    }
    // Chain rule from (alpha, beta, gamma) to the box coordinates.
    if (iAlpha >= 0) {
      let v = jrow[iAlpha];
      if (iBeta >= 0) v += cBA * jrow[iBeta];
      if (iGamma >= 0) v += cGA * jrow[iGamma];
      jrow[iAlpha] = v;
    }
    if (iBeta >= 0) jrow[iBeta] *= cBU;
    if (iGamma >= 0) jrow[iGamma] *= cGV;
    sse += e * e;
    ecol[t] = e;
    for (let j = 0, o = t; j < P; j++, o += n) jcols[o] = jrow[j];
    if (++k === m) k = 0;
  }
  for (let i = 0; i < P; i++) {
    const ci = i * n;
    let r = 0;
    for (let t = 0; t < n; t++) r += jcols[ci + t] * ecol[t];
    rhs[i] = r;
    const oi = i * P;
    let j = i;
    for (; j + 3 < P; j += 4) {
      // Four columns per sweep over time (each sum still runs in time order).
      const c0 = j * n;
      const c1 = c0 + n;
      const c2 = c1 + n;
      const c3 = c2 + n;
      let v0 = 0;
      let v1 = 0;
      let v2 = 0;
      let v3 = 0;
      for (let t = 0; t < n; t++) {
        const x = jcols[ci + t];
        v0 += x * jcols[c0 + t];
        v1 += x * jcols[c1 + t];
        v2 += x * jcols[c2 + t];
        v3 += x * jcols[c3 + t];
      }
      a[oi + j] = v0;
      a[oi + j + 1] = v1;
      a[oi + j + 2] = v2;
      a[oi + j + 3] = v3;
    }
    for (; j < P; j++) {
      const cj = j * n;
      let v = 0;
      for (let t = 0; t < n; t++) v += jcols[ci + t] * jcols[cj + t];
      a[oi + j] = v;
    }
  }
  return sse;
}

/**
 * {@link jointPass} for the non-seasonal models (A,N,N / A,A,N / A,Ad,N), without the
 * seasonal branches. Returns the SSE.
 */
function jointPassNonSeasonal(
  y: Float64Array,
  n: number,
  trendOn: boolean,
  P: number,
  iAlpha: number,
  iBeta: number,
  iPhi: number,
  alpha: number,
  beta: number,
  phi: number,
  cBA: number,
  cBU: number,
  l0: number,
  b0: number,
  dl: Float64Array,
  db: Float64Array,
  jrow: Float64Array,
  a: Float64Array,
  rhs: Float64Array,
): number {
  a.fill(0);
  rhs.fill(0);
  let l = l0;
  let b = trendOn ? b0 : 0;
  let sse = 0;
  const phiT = trendOn ? phi : 0;
  for (let t = 0; t < n; t++) {
    const q = l + phiT * b;
    const e = y[t] - q;
    for (let j = 0; j < P; j++) {
      const dq = dl[j] + phiT * db[j];
      dl[j] = dq - alpha * dq;
      db[j] = phiT * db[j] - beta * dq;
      jrow[j] = dq;
    }
    if (iPhi >= 0) {
      // q depends on φ directly: ∂q/∂φ = b.
      jrow[iPhi] += b;
      dl[iPhi] += (1 - alpha) * b;
      db[iPhi] += b - beta * b;
    }
    if (iAlpha >= 0) dl[iAlpha] += e;
    if (iBeta >= 0) db[iBeta] += e;
    if (iAlpha >= 0 && iBeta >= 0) jrow[iAlpha] += cBA * jrow[iBeta];
    if (iBeta >= 0) jrow[iBeta] *= cBU;
    sse += e * e;
    for (let i = 0; i < P; i++) {
      const ji = jrow[i];
      rhs[i] += ji * e;
      const oi = i * P;
      for (let j = i; j < P; j++) a[oi + j] += ji * jrow[j];
    }
    l = q + alpha * e;
    b = phiT * b + beta * e;
  }
  return sse;
}

/**
 * Joint least squares over the smoothing parameters (in their box coordinates: alpha, phi,
 * and beta and gamma as fractions of their admissible ranges) and the free initial states,
 * by Levenberg–Marquardt (Levenberg 1944; Marquardt 1963) with exact derivatives of the
 * one-step fitted values propagated through the recursions, and an active set for the
 * parameters on their bounds (projected steps). Starts from (x0, z0) on the raw data;
 * returns the best point found. Seasonal states, when free, are constrained to sum to 0
 * (additive) or m (multiplicative).
 */
function refineJoint(
  y: Float64Array,
  n: number,
  m: number,
  trendOn: boolean,
  season: 0 | 1 | 2,
  g: Given,
  freeL0: boolean,
  freeB0: boolean,
  freeS: boolean,
  p: number,
  spec: JointSpec,
  x0: readonly number[],
  z0: ArrayLike<number>,
  maxIter = 400,
): { x: number[]; z: Float64Array; sse: number; iterations: number } {
  const { nPar, iAlpha, iBeta, iGamma, iPhi, lower, upper } = spec;
  const P = nPar + p;
  const total = season === 2 ? m : 0;
  const w = new Float64Array(P);
  for (let i = 0; i < nPar; i++) w[i] = x0[i];
  for (let i = 0; i < p; i++) w[nPar + i] = z0[i];
  const wTrial = new Float64Array(P);
  const zView = w.subarray(nPar);
  const zTrialView = wTrial.subarray(nPar);
  const dl = new Float64Array(P);
  const db = new Float64Array(P);
  const ds = new Float64Array(m * P);
  const jrow = new Float64Array(P);
  const jcols = new Float64Array(season === 0 ? 0 : n * P);
  const ecol = new Float64Array(season === 0 ? 0 : n);
  const a = new Float64Array(P * P);
  const rhs = new Float64Array(P);
  const chol = new Float64Array(P * P);
  const step = new Float64Array(P);
  const ring = new Float64Array(m);
  const lb = new Float64Array(2);
  // Current raw parameters and chain-rule factors.
  let alphaNow = 0;
  let betaNow = 0;
  let gammaNow = 0;
  let phiNow = 1;
  let dBetaDAlpha = 0;
  let dBetaDu = 0;
  let dGammaDAlpha = 0;
  let dGammaDv = 0;
  const mapPar = (v: Float64Array): void => {
    const alpha = iAlpha >= 0 ? v[iAlpha] : spec.alphaFixed;
    alphaNow = alpha;
    const bHi = Math.max(spec.betaLo, Math.min(spec.betaUp, alpha));
    dBetaDu = bHi - spec.betaLo;
    dBetaDAlpha = iBeta >= 0 && alpha < spec.betaUp && alpha > spec.betaLo ? v[iBeta] : 0;
    betaNow = trendOn ? (iBeta >= 0 ? spec.betaLo + v[iBeta] * dBetaDu : spec.betaFixed) : 0;
    const gHi = Math.max(spec.gammaLo, Math.min(spec.gammaUp, 1 - alpha));
    dGammaDv = gHi - spec.gammaLo;
    dGammaDAlpha = iGamma >= 0 && 1 - alpha < spec.gammaUp && 1 - alpha > spec.gammaLo ? -v[iGamma] : 0;
    gammaNow = season !== 0 ? (iGamma >= 0 ? spec.gammaLo + v[iGamma] * dGammaDv : spec.gammaFixed) : 0;
    phiNow = iPhi >= 0 ? v[iPhi] : spec.phiFixed;
  };
  const sseAt = (v: Float64Array, zv: Float64Array): number => {
    mapPar(v);
    loadStates(zv, g, trendOn, m, freeL0, freeB0, freeS, ring, lb, total);
    const r = filter(y, n, trendOn, season, m, alphaNow, betaNow, gammaNow, phiNow, lb[0], lb[1], ring, null, 0, null);
    return Number.isFinite(r) ? r : Infinity;
  };
  let sse = sseAt(w, zView);
  let lambda = 1e-4;
  let iterations = 0;
  for (let iter = 0; iter < maxIter && Number.isFinite(sse); iter++) {
    iterations++;
    // Derivative pass at w: J'J and J'e.
    mapPar(w);
    loadStates(zView, g, trendOn, m, freeL0, freeB0, freeS, ring, lb, total);
    dl.fill(0);
    db.fill(0);
    ds.fill(0);
    {
      let j = nPar;
      if (freeL0) dl[j++] = 1;
      if (freeB0) db[j++] = 1;
      if (freeS) {
        for (let i = 0; i < m - 1; i++) {
          ds[i * P + j + i] = 1;
          ds[(m - 1) * P + j + i] = -1;
        }
      }
    }
    if (season === 0) {
      jointPassNonSeasonal(y, n, trendOn, P, iAlpha, iBeta, iPhi, alphaNow, betaNow, phiNow, dBetaDAlpha, dBetaDu, lb[0], lb[1], dl, db, jrow, a, rhs);
    } else {
      jointPass(y, n, m, trendOn, season, P, iAlpha, iBeta, iGamma, iPhi, alphaNow, betaNow, gammaNow, phiNow,
        dBetaDAlpha, dBetaDu, dGammaDAlpha, dGammaDv, lb[0], lb[1], ring, dl, db, ds, jrow, a, rhs, jcols, ecol);
    }
    let accepted = false;
    let gain = 0;
    for (let attempt = 0; attempt < 16; attempt++) {
      dampedSystem(a, rhs, lambda, P, chol, step);
      // Active set: a parameter on its bound whose descent direction points outward is held.
      for (let i = 0; i < nPar; i++) {
        const atLo = w[i] <= lower[i] + 1e-15 && rhs[i] < 0;
        const atHi = w[i] >= upper[i] - 1e-15 && rhs[i] > 0;
        if (atLo || atHi || upper[i] === lower[i]) {
          for (let j = 0; j < P; j++) {
            chol[i * P + j] = 0;
            chol[j * P + i] = 0;
          }
          chol[i * P + i] = 1;
          step[i] = 0;
        }
      }
      if (choleskySolve(chol, step, P)) {
        for (let i = 0; i < P; i++) {
          let v = w[i] + step[i];
          if (i < nPar) v = Math.min(upper[i], Math.max(lower[i], v));
          wTrial[i] = v;
        }
        const trial = sseAt(wTrial, zTrialView);
        if (trial < sse) {
          gain = sse - trial;
          w.set(wTrial);
          sse = trial;
          lambda = Math.max(lambda * 0.3, 1e-12);
          accepted = true;
          break;
        }
      }
      lambda *= 10;
    }
    if (!accepted) break;
    if (gain <= JOINT_TOL * sse && lambda <= 1e-3) break;
  }
  return { x: Array.from(w.subarray(0, nPar)), z: Float64Array.from(zView), sse, iterations };
}

/**
 * Start values for the states (as R's `forecast:::initstate`): seasonal figures from a
 * classical decomposition when n ≥ 3m (otherwise from ratios to an OLS line), then an OLS
 * line through the first max(10, 2m) seasonally adjusted values gives l0 (intercept at
 * time 0) and b0 (slope). Hyndman et al. (2008) §2.6.1 describe this initialisation.
 * Multiplicative figures are floored at 0.01. Input: finite y with n ≥ 2m when m > 1
 * (otherwise the decomposition throws RangeError); used only as a starting point.
 */
export function heuristicStates(
  y: readonly number[],
  m: number,
  trendOn: boolean,
  type: "additive" | "multiplicative",
): { l0: number; b0: number; s: number[] } {
  const n = y.length;
  const mult = type === "multiplicative";
  let s: number[] = [];
  let ysa: number[] = [...y];
  if (m > 1) {
    if (n >= 3 * m) {
      s = classicalDecomposition(y, m, type).figure;
    } else {
      const { a, b } = olsLine(y, n);
      s = new Array<number>(m).fill(0);
      const c = new Array<number>(m).fill(0);
      for (let t = 0; t < n; t++) {
        const line = a + b * (t + 1);
        s[t % m] += mult ? (line !== 0 ? y[t] / line : 1) : y[t] - line;
        c[t % m]++;
      }
      for (let i = 0; i < m; i++) s[i] /= c[i];
      const avg = s.reduce((u, v) => u + v, 0) / m;
      s = s.map((v) => (mult ? (avg !== 0 ? v / avg : 1) : v - avg));
    }
    if (mult) s = s.map((v) => Math.max(v, 0.01));
    ysa = y.map((v, t) => (mult ? v / s[t % m] : v - s[t % m]));
  }
  const maxn = Math.min(Math.max(10, 2 * m), n);
  if (!trendOn) {
    let l0 = 0;
    for (let t = 0; t < maxn; t++) l0 += ysa[t];
    return { l0: l0 / maxn, b0: 0, s };
  }
  const { a, b } = olsLine(ysa, maxn);
  return { l0: a, b0: b, s };
}

/** OLS line through (1, y_1) … (k, y_k): intercept at t = 0 and slope. */
function olsLine(y: readonly number[], k: number): { a: number; b: number } {
  if (k < 2) return { a: y[0], b: 0 };
  const tbar = (k + 1) / 2;
  let ybar = 0;
  for (let t = 0; t < k; t++) ybar += y[t];
  ybar /= k;
  let sxy = 0;
  let sxx = 0;
  for (let t = 0; t < k; t++) {
    const dt = t + 1 - tbar;
    sxy += dt * (y[t] - ybar);
    sxx += dt * dt;
  }
  const b = sxy / sxx;
  return { a: ybar - b * tbar, b };
}

/**
 * Build the project's `Fit` (lib/forecast/types.ts) from an ETS fit: parameters alpha
 * (beta, gamma, phi when the model has them) in the error-correction form; state holds the
 * final level, trend and next m seasonal states (what forecasting needs), the initial states
 * l0, b0, initialSeason, and `estimated` (the k of σ² = SSE/(n − k)). Never throws.
 */
export function toFit(method: MethodId, r: EtsFitResult): Fit {
  const parameters: Record<string, number> = { alpha: r.alpha };
  const state: Record<string, number | readonly number[]> = { level: r.level, l0: r.l0 };
  if (r.model.trend !== "N") {
    parameters.beta = r.beta;
    state.trend = r.trend;
    state.b0 = r.b0;
  }
  if (r.model.season !== "N") {
    parameters.gamma = r.gamma;
    state.season = r.season;
    state.initialSeason = r.initialSeason;
  }
  if (r.model.trend === "Ad") parameters.phi = r.phi;
  state.estimated = r.estimated;
  return {
    method,
    parameters,
    state,
    fitted: r.fitted,
    residuals: r.residuals,
    sigma2: r.sigma2,
    n: r.fitted.length,
    season: r.m,
    sse: r.sse,
    notes: r.notes,
  };
}

/** Validate a horizon and interval levels. @throws ForecastInputError. */
export function checkHorizon(what: string, h: number, levels: readonly number[]): void {
  if (!Number.isInteger(h) || h < 1) throw new ForecastInputError(`${what}: the horizon must be a whole number of steps, at least 1 (got ${h})`);
  if (h > MAX_HORIZON) throw new ForecastInputError(`${what}: the horizon ${h} is beyond the ${MAX_HORIZON} steps allowed`);
  for (const lv of levels) {
    if (typeof lv !== "number" || !(lv > 0 && lv < 100)) {
      throw new ForecastInputError(`${what}: interval levels must be percentages between 0 and 100 (got ${String(lv)})`);
    }
  }
}

/** Largest horizon accepted (an absurd horizon is refused rather than computed). */
export const MAX_HORIZON = 10000;

/**
 * Point forecasts and prediction intervals of a fitted ETS model.
 *
 * Means: ŷ_{n+h} = ℓ_n + φ_h b_n (+ s | · s) with φ_h = φ + … + φ^h (h when undamped) and the
 * seasonal state of the same position in the last season (Hyndman et al. 2008 table 2.1).
 * Additive models (class 1, Hyndman et al. 2008 ch. 6): var_h = σ²[1 + Σ_{j=1}^{h−1} c_j²],
 * c_j = α + β·φ_j·[trend] + γ·[j mod m = 0], bounds ŷ ± z_{(1+L/100)/2}·√var_h.
 * A,A,M: the bounds are sample quantiles (Hyndman & Fan type 7) of SIMULATION_PATHS paths of
 * the model with N(0, σ²) errors from a deterministic generator (mulberry32, Box–Muller;
 * rng start SIMULATION_RNG_START); `sd` is the standard deviation of the simulated paths.
 * With no levels asked, A,A,M skips the simulation and `sd` is NaN.
 * @throws ForecastInputError for a bad horizon or level.
 */
export function etsForecast(what: string, method: MethodId, model: EtsModel, fit: Fit, h: number, levels: readonly number[]): Forecast {
  checkHorizon(what, h, levels);
  const alpha = fit.parameters.alpha;
  const trendOn = model.trend !== "N";
  const beta = trendOn ? fit.parameters.beta : 0;
  const phi = model.trend === "Ad" ? fit.parameters.phi : 1;
  const seasonal = model.season !== "N";
  const gamma = seasonal ? fit.parameters.gamma : 0;
  const m = seasonal ? fit.season : 1;
  const level = fit.state.level as number;
  const trend = trendOn ? (fit.state.trend as number) : 0;
  const seasonNext = seasonal ? (fit.state.season as readonly number[]) : [];
  const mean: number[] = [];
  let phiSum = 0;
  let phiPow = 1;
  for (let i = 1; i <= h; i++) {
    phiPow *= phi;
    phiSum += phiPow;
    const q = level + phiSum * trend;
    if (!seasonal) mean.push(q);
    else if (model.season === "M") mean.push(q * seasonNext[(i - 1) % m]);
    else mean.push(q + seasonNext[(i - 1) % m]);
  }
  const lower: Record<string, number[]> = {};
  const upper: Record<string, number[]> = {};
  const sd: number[] = [];
  const sigma2 = Math.max(fit.sigma2, 0);
  if (model.season !== "M") {
    let acc = 1;
    let phiJ = 0;
    let pw = 1;
    for (let i = 1; i <= h; i++) {
      sd.push(Math.sqrt(sigma2 * acc));
      // c_i for the next step.
      pw *= phi;
      phiJ += pw;
      const c = alpha + (trendOn ? beta * phiJ : 0) + (seasonal && i % m === 0 ? gamma : 0);
      acc += c * c;
    }
    for (const lv of levels) {
      const z = normalQuantile(0.5 + lv / 200);
      lower[String(lv)] = mean.map((v, i) => v - z * sd[i]);
      upper[String(lv)] = mean.map((v, i) => v + z * sd[i]);
    }
  } else if (levels.length === 0) {
    // No interval asked (automatic selection scores point forecasts only): skip the simulation.
    for (let i = 0; i < h; i++) sd.push(Number.NaN);
  } else {
    const paths = simulateAam(level, trend, seasonNext, m, alpha, beta, gamma, phi, Math.sqrt(sigma2), h, SIMULATION_PATHS);
    for (const lv of levels) {
      lower[String(lv)] = [];
      upper[String(lv)] = [];
    }
    // Positions (0-based, ascending) of the order statistics the quantiles below read.
    const orderIndices = [
      ...new Set(
        levels.flatMap((lv) =>
          [0.5 - lv / 200, 0.5 + lv / 200].flatMap((p) => [Math.floor((SIMULATION_PATHS - 1) * p), Math.ceil((SIMULATION_PATHS - 1) * p)]),
        ),
      ),
    ].sort((a, b) => a - b);
    for (let i = 0; i < h; i++) {
      const col = paths.subarray(i * SIMULATION_PATHS, (i + 1) * SIMULATION_PATHS);
      let s1 = 0;
      for (let p = 0; p < col.length; p++) s1 += col[p];
      const avg = s1 / col.length;
      let s2 = 0;
      for (let p = 0; p < col.length; p++) s2 += (col[p] - avg) ** 2;
      sd.push(Math.sqrt(s2 / (col.length - 1)));
      let sorted: readonly number[];
      if (Number.isFinite(s1)) {
        // Type 7 quantiles read only the order statistics at ⌊(n − 1)p⌋ and ⌈(n − 1)p⌉: put just
        // those in their sorted places (same values as a full sort, in linear expected time).
        selectOrderStatistics(col, orderIndices);
        sorted = col as unknown as readonly number[];
      } else {
        col.sort(); // a non-finite path: the full sort orders NaN last
        sorted = Array.from(col);
      }
      for (const lv of levels) {
        lower[String(lv)].push(quantileOfSorted(sorted, 0.5 - lv / 200, 7));
        upper[String(lv)].push(quantileOfSorted(sorted, 0.5 + lv / 200, 7));
      }
    }
  }
  return { method, mean, levels: [...levels], lower, upper, sd };
}

/**
 * Rearranges finite values `a` in place so that a[k] holds the k-th smallest value (0-based)
 * for every k in `ks` (ascending, within range), with no larger value before and no smaller
 * one after each such position: the values a full sort would put there. Hoare's selection
 * (Hoare 1961, "Algorithm 65: Find", CACM 4(7); Wirth's formulation) on the part of the array
 * to the right of the previous position, O(n) expected per position; no allocation.
 */
function selectOrderStatistics(a: Float64Array, ks: readonly number[]): void {
  let from = 0;
  const last = a.length - 1;
  for (const k of ks) {
    let left = from;
    let right = last;
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
    from = k + 1;
  }
}

/**
 * Simulated future paths of ETS(A,A,M) (or A,Ad,M), stored step-major:
 * out[i·paths + p] is step i + 1 of path p. Each path runs the model's recursions with
 * ε ~ N(0, σ²) drawn by Box–Muller (Box & Muller 1958) from the mulberry32 generator, started
 * at SIMULATION_RNG_START, so the output is deterministic (Hyndman et al. 2008 §6.1: the
 * simulation route to forecast distributions of the nonlinear models).
 * Input: finite states and parameters, sigma ≥ 0, h ≥ 1, paths ≥ 1 (not checked; internal use).
 */
export function simulateAam(
  level: number,
  trend: number,
  seasonNext: readonly number[],
  m: number,
  alpha: number,
  beta: number,
  gamma: number,
  phi: number,
  sigma: number,
  h: number,
  paths: number,
): Float64Array {
  const out = new Float64Array(h * paths);
  const ring = new Float64Array(m);
  const gauss = normalStream(SIMULATION_RNG_START);
  for (let p = 0; p < paths; p++) {
    for (let j = 0; j < m; j++) ring[j] = seasonNext[j];
    let l = level;
    let b = trend;
    let k = 0;
    for (let i = 0; i < h; i++) {
      const q = l + phi * b;
      const sv = ring[k];
      const e = sigma * gauss();
      out[i * paths + p] = q * sv + e;
      l = q + (alpha * e) / sv;
      b = phi * b + (beta * e) / sv;
      ring[k] = sv + (gamma * e) / q;
      if (++k === m) k = 0;
    }
  }
  return out;
}
