/**
 * Maximum-likelihood estimation of one ETS member in state-space form (any error type), for
 * the multiplicative-error members: the additive-error ones are fitted by ./least-squares.ts,
 * whose least squares is their likelihood.
 *
 * The parameters and the initial states ℓ0, b0, s1…s(m−1) (s_m makes the seasonal states sum to
 * 0 or m) minimise the −2 log-likelihood n·log Σ ε_t² + 2 Σ log|f_t| of Hyndman et al. (2008)
 * §5.1 (σ² concentrated out), in R's "usual" region: alpha ∈ [1e-4, 0.9999],
 * beta ∈ [1e-4, alpha], gamma ∈ [1e-4, 1 − alpha], phi ∈ [0.8, 0.98]; multiplicative seasonal
 * states stay above 0. Two searches: Nelder–Mead (lib/forecast/optimise.ts) as in R's
 * forecast::ets ({@link fitStateSpace}), and for the M-season members with every value free the
 * joint Levenberg–Marquardt search on the likelihood as a sum of squares
 * ({@link fitSeasonalByJointSearch}). Both start from `start` (the caller passes a fit with
 * additive errors and the same point recursions).
 * σ² = Σ ε_t² / (n − k), k the number of estimated parameters and states (R's ets).
 */
import { minimise } from "../optimise";
import { etsKeys, ALPHA_LOWER, ALPHA_UPPER, BETA_LOWER, BETA_UPPER, GAMMA_LOWER, GAMMA_UPPER, PHI_LOWER, PHI_UPPER } from "./model";
import { ForecastInputError } from "../types";
import { JOINT_ITERATIONS, refineJoint } from "./joint-search";
import type { Problem } from "./initial-states";
import { aicc, filterSeries, likelihood, makeState, type EtsSpec, type EtsState, type Filtered, type Smoothing } from "./state-space";

/** Objective evaluations allowed to the whole search, both stages (R's ets: Nelder–Mead with maxit 2,000, counted in evaluations). */
const FULL_SEARCH_BUDGET = 2000;
/** Relative tolerance of the search, R's ets (its Nelder–Mead's reltol, sqrt of the machine epsilon). */
const R_TOL = Math.sqrt(Number.EPSILON);

/** Everything a fitted member carries (plain data). */
export interface StateSpaceFit {
  readonly spec: EtsSpec;
  readonly par: Smoothing;
  /** Initial states: level, trend and the m seasonal states in the order used (s1 for y1). */
  readonly initial: { readonly l0: number; readonly b0: number; readonly s: readonly number[] };
  readonly filtered: Filtered;
  readonly sigma2: number;
  /** Estimated parameters and initial states (the k of σ² and of AICc, σ² excluded). */
  readonly estimated: number;
  /** AICc (Infinity when the series is too short for it). */
  readonly aicc: number;
  /** R's reported log-likelihood, −lik/2 (constants dropped, as R's ets). */
  readonly loglik: number;
}

/** Runs a member with every parameter and initial state given; σ² and AICc with `estimated` free values. */
export function evaluate(
  spec: EtsSpec,
  y: readonly number[],
  par: Smoothing,
  initial: StateSpaceFit["initial"],
  estimated: number,
): StateSpaceFit {
  const filtered = filterSeries(spec, par, makeState(initial.l0, initial.b0, initial.s), y);
  const n = y.length;
  return {
    spec,
    par,
    initial,
    filtered,
    sigma2: filtered.sumSq / Math.max(n - estimated, 1),
    estimated,
    aicc: aicc(filtered.lik, estimated, n),
    loglik: -filtered.lik / 2,
  };
}

/**
 * Fits a member by maximum likelihood from `start` (every parameter and initial state, keys as
 * in etsKeys, ./model.ts); values in `fixed` are held. Needs y > 0 for an M error or M season.
 * @throws ForecastInputError for non-positive data with a multiplicative part, or too few observations.
 */
export function fitStateSpace(
  spec: EtsSpec,
  y: readonly number[],
  start: Readonly<Record<string, number>>,
  fixed: Readonly<Record<string, number>> = {},
): StateSpaceFit {
  const n = y.length;
  if ((spec.error === "M" || spec.season === "M") && y.some((v) => !(v > 0))) {
    throw new ForecastInputError(`ETS(${spec.error},${spec.trend},${spec.season}) needs every observation above zero`);
  }
  const { params, states } = etsKeys(spec, spec.m);
  const seasonal = spec.season !== "N";
  const m = seasonal ? spec.m : 1;
  // Free values: parameters, l0, b0, s1…s(m−1); s_m follows from the sum constraint unless all are fixed.
  const seasonKeys = seasonal ? states.filter((k) => k.startsWith("s")) : [];
  const seasonFixed = seasonKeys.length > 0 && seasonKeys.every((k) => k in fixed);
  const free = [...params, ...states].filter((k) => !(k in fixed) && !(seasonal && k === `s${m}` && !seasonFixed));
  if (seasonal && !seasonFixed && seasonKeys.some((k) => k in fixed)) {
    throw new ForecastInputError(`give all ${m} initial seasonal states s1…s${m} or none`);
  }
  const estimated = free.length;
  if (n < estimated + 1) throw new ForecastInputError(`needs at least ${estimated + 1} observations to estimate ${estimated} values (got ${n})`);
  const seasonTotal = spec.season === "M" ? m : 0;
  const get = (x: ArrayLike<number>, key: string): number => {
    const i = free.indexOf(key);
    return i >= 0 ? x[i] : (fixed[key] ?? start[key]);
  };
  // beta and gamma are searched as fractions of their ranges [1e-4, alpha] and [1e-4, 1 − alpha].
  const decode = (x: ArrayLike<number>): { par: Smoothing; initial: StateSpaceFit["initial"] } => {
    const alpha = get(x, "alpha");
    const frac = (key: string, hi: number, lo: number) =>
      free.includes(key) ? lo + x[free.indexOf(key)] * Math.max(hi - lo, 0) : fixed[key];
    const beta = spec.trend === "N" ? 0 : frac("beta", Math.min(alpha, 0.9999), BETA_LOWER);
    const gamma = seasonal ? frac("gamma", Math.min(1 - alpha, 0.9999), GAMMA_LOWER) : 0;
    const phi = spec.trend === "Ad" ? get(x, "phi") : 1;
    const s: number[] = [];
    if (seasonal) {
      for (let i = 1; i < m; i++) s.push(get(x, `s${i}`));
      s.push(seasonFixed ? fixed[`s${m}`] : seasonTotal - s.reduce((a, b) => a + b, 0));
    }
    return { par: { alpha, beta, gamma, phi }, initial: { l0: get(x, "l0"), b0: spec.trend === "N" ? 0 : get(x, "b0"), s } };
  };
  const toSearch = (key: string): number => {
    const alpha = fixed.alpha ?? start.alpha;
    const clamp = (v: number) => Math.min(1, Math.max(0, v));
    if (key === "beta") return clamp((start.beta - BETA_LOWER) / Math.max(Math.min(alpha, 0.9999) - BETA_LOWER, 1e-12));
    if (key === "gamma") return clamp((start.gamma - GAMMA_LOWER) / Math.max(Math.min(1 - alpha, 0.9999) - GAMMA_LOWER, 1e-12));
    if (key === "alpha") return Math.min(ALPHA_UPPER, Math.max(ALPHA_LOWER, start.alpha));
    if (key === "phi") return Math.min(PHI_UPPER, Math.max(PHI_LOWER, start.phi));
    return start[key];
  };
  const x0 = free.map(toSearch);
  const lower = free.map((k) => (k === "alpha" ? ALPHA_LOWER : k === "phi" ? PHI_LOWER : k === "beta" || k === "gamma" ? 0 : -Infinity));
  const upper = free.map((k) => (k === "alpha" ? ALPHA_UPPER : k === "phi" ? PHI_UPPER : k === "beta" || k === "gamma" ? 1 : Infinity));
  const work = makeState(0, 0, new Float64Array(m));
  const init = makeState(0, 0, new Float64Array(m));
  // The objective: decode's arithmetic with the positions of the free values looked up once and
  // nothing allocated per call (the same operations in the same order as decode).
  const at = (key: string) => free.indexOf(key);
  const held = (key: string) => fixed[key] ?? start[key];
  const [iAlpha, iBeta, iGamma, iPhi, iL0, iB0] = ["alpha", "beta", "gamma", "phi", "l0", "b0"].map(at);
  const [cAlpha, cPhi, cL0, cB0] = ["alpha", "phi", "l0", "b0"].map(held);
  const iSeason = Int32Array.from({ length: Math.max(m - 1, 0) }, (_, i) => at(`s${i + 1}`));
  const cSeason = Float64Array.from({ length: Math.max(m - 1, 0) }, (_, i) => held(`s${i + 1}`));
  const trended = spec.trend !== "N";
  const trial = { alpha: 0, beta: 0, gamma: 0, phi: 1 };
  const objective = (x: ArrayLike<number>): number => {
    const alpha = iAlpha >= 0 ? x[iAlpha] : cAlpha;
    trial.alpha = alpha;
    trial.beta = !trended ? 0 : iBeta >= 0 ? BETA_LOWER + x[iBeta] * Math.max(Math.min(alpha, 0.9999) - BETA_LOWER, 0) : fixed.beta;
    trial.gamma = !seasonal ? 0 : iGamma >= 0 ? GAMMA_LOWER + x[iGamma] * Math.max(Math.min(1 - alpha, 0.9999) - GAMMA_LOWER, 0) : fixed.gamma;
    trial.phi = spec.trend === "Ad" ? (iPhi >= 0 ? x[iPhi] : cPhi) : 1;
    if (seasonal) {
      let sum = 0;
      for (let i = 0; i < m - 1; i++) {
        const v = iSeason[i] >= 0 ? x[iSeason[i]] : cSeason[i];
        init.ring[i] = v;
        sum += v;
      }
      init.ring[m - 1] = seasonFixed ? fixed[`s${m}`] : seasonTotal - sum;
      if (spec.season === "M") for (let i = 0; i < m; i++) if (!(init.ring[i] > 0)) return Infinity;
    }
    init.level = iL0 >= 0 ? x[iL0] : cL0;
    init.trend = !trended ? 0 : iB0 >= 0 ? x[iB0] : cB0;
    return likelihood(spec, trial, init, y, work);
  };
  if (!Number.isFinite(objective(x0)) && x0.some((v) => !Number.isFinite(v))) {
    throw new ForecastInputError(`ETS(${spec.error},${spec.trend},${spec.season}): no finite start`);
  }
  let best = x0;
  if (free.length > 0 && x0.every(Number.isFinite)) {
    // Initial simplex: a tenth of each parameter's box, and of each state's size.
    const step = free.map((k, i) => (Number.isFinite(upper[i]) ? 0.1 * (upper[i] - lower[i]) : Math.max(0.1 * Math.abs(x0[i]), 1e-3)));
    // Stage 1 (seasonal members): the smoothing parameters, l0 and b0 with the seasonal states
    // held at their start; stage 2: everything, from there, with a budget (Nelder–Mead is slow
    // in many dimensions; the start is already close in the seasonal states).
    const inner = free.map((k, i) => (/^s\d+$/.test(k) ? -1 : i)).filter((i) => i >= 0);
    let used = 0;
    if (inner.length < free.length && inner.length > 0) {
      const full = Float64Array.from(x0);
      const sub = (v: Float64Array): number => {
        inner.forEach((i, j) => (full[i] = v[j]));
        return objective(full);
      };
      const r = minimise(sub, inner.map((i) => x0[i]), { lower: inner.map((i) => lower[i]), upper: inner.map((i) => upper[i]), step: inner.map((i) => step[i]), maxIter: FULL_SEARCH_BUDGET, restarts: 0, tol: R_TOL });
      best = [...x0];
      inner.forEach((i, j) => (best[i] = r.x[j]));
      used = r.evaluations;
    }
    best = minimise(objective, best, { lower, upper, step, maxIter: Math.max(FULL_SEARCH_BUDGET - used, 1), restarts: 0, tol: R_TOL }).x;
  }
  const { par, initial } = decode(best);
  return evaluate(spec, y, par, initial, estimated);
}

/** The state object at the forecast origin of a fit (a copy, safe to change). */
export function originState(fit: StateSpaceFit): EtsState {
  const f = fit.filtered.final;
  return { level: f.level, trend: f.trend, ring: Float64Array.from(f.ring), k: f.k };
}

/**
 * Maximum likelihood of an M-error member with an M season, every value estimated, by the joint
 * Levenberg–Marquardt search of the least-squares members (./joint-search.ts, `relative`) on
 * the likelihood written as a sum of squares (n·log Σ ε_t² + 2 Σ log f_t = n·log Σ (g·ε_t)², g
 * the geometric mean of the fitted values f_t), with exact derivatives through the recursions,
 * in the same region as {@link fitStateSpace} (beta and gamma as fractions of their ranges;
 * seasonal states above zero, summing to m). It starts from `start` (every value: the family's
 * choice passes the fitted A,·,A of the same trend with its seasonal states as ratios, ./family.ts;
 * fitMember the least-squares A,·,M, which has the same point recursions) and runs to
 * convergence: Nelder–Mead over the 14–17 values of a monthly member used up R's budget of 2,000
 * evaluations on more than half of M3's monthly series without converging (docs/methods.md §2e). Undefined when the start or the end has no finite likelihood, or
 * the search was still improving after JOINT_ITERATIONS steps (the caller then uses
 * {@link fitStateSpace}).
 */
export function fitSeasonalByJointSearch(spec: EtsSpec, y: readonly number[], start: Readonly<Record<string, number>>): StateSpaceFit | undefined {
  const m = spec.m;
  if (spec.error !== "M" || spec.season !== "M" || !(m >= 2)) return undefined;
  const trendOn = spec.trend !== "N";
  const damped = spec.trend === "Ad";
  const names = ["alpha", ...(trendOn ? ["beta"] : []), "gamma", ...(damped ? ["phi"] : [])];
  const nStates = (trendOn ? 2 : 1) + m - 1;
  const clamp = (v: number, lo: number, hi: number) => Math.min(hi, Math.max(lo, v));
  const betaHi = (alpha: number) => Math.max(BETA_LOWER, Math.min(BETA_UPPER, alpha));
  const gammaHi = (alpha: number) => Math.max(GAMMA_LOWER, Math.min(GAMMA_UPPER, 1 - alpha));
  const alpha0 = clamp(start.alpha, ALPHA_LOWER, ALPHA_UPPER);
  const frac = (v: number, lo: number, hi: number) => (hi > lo ? clamp((v - lo) / (hi - lo), 0, 1) : 0);
  const x0 = names.map((k) =>
    k === "alpha" ? alpha0 : k === "beta" ? frac(start.beta, BETA_LOWER, betaHi(alpha0)) : k === "gamma" ? frac(start.gamma, GAMMA_LOWER, gammaHi(alpha0)) : clamp(start.phi, PHI_LOWER, PHI_UPPER),
  );
  const z0 = [start.l0, ...(trendOn ? [start.b0] : []), ...Array.from({ length: m - 1 }, (_, i) => start[`s${i + 1}`])];
  if (![...x0, ...z0].every(Number.isFinite)) return undefined;
  const problem: Problem = { y: Float64Array.from(y), shape: { trendOn, season: 2, m }, given: {}, freeL0: true, freeB0: trendOn, freeS: true, nStates };
  const r = refineJoint(
    problem,
    {
      nPar: names.length,
      iAlpha: 0,
      iBeta: names.indexOf("beta"),
      iGamma: names.indexOf("gamma"),
      iPhi: names.indexOf("phi"),
      lower: names.map((k) => (k === "alpha" ? ALPHA_LOWER : k === "phi" ? PHI_LOWER : 0)),
      upper: names.map((k) => (k === "alpha" ? ALPHA_UPPER : k === "phi" ? PHI_UPPER : 1)),
      betaLo: BETA_LOWER,
      betaUp: BETA_UPPER,
      gammaLo: GAMMA_LOWER,
      gammaUp: GAMMA_UPPER,
      alphaFixed: NaN,
      betaFixed: 0,
      gammaFixed: NaN,
      phiFixed: 1,
    },
    x0,
    z0,
    JOINT_ITERATIONS,
    true,
  );
  // Not finite, or still improving when the iterations ran out (a slow crawl along a valley).
  if (!Number.isFinite(r.sse) || r.iterations >= JOINT_ITERATIONS) return undefined;
  const at = (k: string) => r.x[names.indexOf(k)];
  const alpha = at("alpha");
  const par: Smoothing = {
    alpha,
    beta: trendOn ? BETA_LOWER + at("beta") * (betaHi(alpha) - BETA_LOWER) : 0,
    gamma: GAMMA_LOWER + at("gamma") * (gammaHi(alpha) - GAMMA_LOWER),
    phi: damped ? at("phi") : 1,
  };
  const s = Array.from(r.z.subarray(trendOn ? 2 : 1));
  s.push(m - s.reduce((a, b) => a + b, 0));
  const fit = evaluate(spec, y, par, { l0: r.z[0], b0: trendOn ? r.z[1] : 0, s }, names.length + nStates);
  return Number.isFinite(fit.aicc) ? fit : undefined;
}
