/**
 * Estimation of an additive-error member by least squares: its smoothing parameters and
 * initial states minimise the in-sample sum of squared one-step errors, which is the Gaussian
 * likelihood of the additive-error model (Hyndman, Koehler, Ord & Snyder 2008, ch. 5). The
 * named methods (ses, holt, damped-holt, holt-winters-additive, holt-winters-multiplicative),
 * Theta's SES and the A-error members of the ETS family are all fitted here. Pure TypeScript.
 *
 * Parameters are those of the error-correction form, as reported by R's `forecast::ets`:
 * β = α·β* and γ = (1 − α)·γ*, where β* and γ* are the smoothing constants of the classical
 * component form (R's `stats::HoltWinters`, NIST e-Handbook §6.4.3.3). For the additive
 * models the two forms give identical fitted values.
 *
 * The parts: ./recursions.ts (the loops), ./initial-states.ts (states for given parameters),
 * ./joint-search.ts (start candidates and the joint Levenberg–Marquardt search),
 * ./linear-algebra.ts.
 */
import { minimiseScalar } from "../optimise";
import { ForecastInputError } from "../types";
import { checkSeriesFor } from "../simple";
import { heuristicStates, loadStates, multWorkspace, solveStates, solveStatesMult, workspace, type Given, type Problem } from "./initial-states";
import { bestCandidates, refineJoint, startCandidates, type JointSpec } from "./joint-search";
import {
  etsKeys,
  ALPHA_LOWER,
  ALPHA_UPPER,
  BETA_LOWER,
  BETA_UPPER,
  GAMMA_LOWER,
  GAMMA_UPPER,
  PHI_LOWER,
  PHI_UPPER,
  type EtsModel,
} from "./model";
import { filter, type Shape } from "./recursions";
import { PATHS, type EtsState } from "./state-space";

/** Number of best start candidates from which the local search is run. */
const SEARCH_RUNS = 3;
/** Levenberg–Marquardt iterations from each start before the leader is chosen. */
const PROBE_ITERATIONS = 5;
/** Distance from a bound under which an estimate is reported as "at the bound". */
const BOUND_NOTE_TOL = 1e-4;

/**
 * The values held in `fixed`, checked: only the model's keys (etsKeys), finite numbers,
 * alpha/beta/gamma in [0, 1], phi in (0, 1], all m seasonal states or none.
 * @throws ForecastInputError naming the key.
 */
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
  checkSeriesFor(what, y, 1);
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
  const par = { alpha: 0, beta: 0, gamma: 0, phi: 0 }; // the trial point, set by readPar
  // The optimiser sees a box: alpha and phi directly, beta and gamma as fractions u, v ∈ [0, 1]
  // of their admissible ranges [1e-4, min(0.9999, alpha)] and [1e-4, min(0.9999, 1 − alpha)].
  // This is exactly R ets's "usual" region, without non-box constraints.
  const betaHi = (alpha: number): number => Math.max(lowerOf.beta, Math.min(upperOf.beta, alpha));
  const gammaHi = (alpha: number): number => Math.max(lowerOf.gamma, Math.min(upperOf.gamma, 1 - alpha));
  const readPar = (v: ArrayLike<number>): boolean => {
    const alpha = iAlpha >= 0 ? v[iAlpha] : g.alpha!;
    par.alpha = alpha;
    par.beta = trendOn ? (iBeta >= 0 ? lowerOf.beta + v[iBeta] * (betaHi(alpha) - lowerOf.beta) : g.beta!) : 0;
    par.gamma = seasonal ? (iGamma >= 0 ? lowerOf.gamma + v[iGamma] * (gammaHi(alpha) - lowerOf.gamma) : g.gamma!) : 0;
    par.phi = damped ? (iPhi >= 0 ? v[iPhi] : g.phi!) : 1;
    return true;
  };
  const lower = freeNames.map((nm) => (nm === "beta" || nm === "gamma" ? 0 : lowerOf[nm]));
  const upper = freeNames.map((nm) => (nm === "beta" || nm === "gamma" ? 1 : upperOf[nm]));
  const noteBounds = (x: readonly number[]): void => {
    for (let i = 0; i < freeNames.length; i++) {
      const nm = freeNames[i];
      if (nm === "beta" || nm === "gamma") {
        const hiValue = nm === "beta" ? betaHi(par.alpha) : gammaHi(par.alpha);
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
  const shape: Shape = { trendOn, season: seasonCode, m };
  const problem: Problem = { y: yArr, shape, given: g, freeL0, freeB0, freeS, nStates };
  let bestL0 = g.l0 ?? 0;
  let bestB0 = g.b0 ?? 0;
  let bestS: Float64Array = g.s ? Float64Array.from(g.s) : new Float64Array(m);
  let bestPar: typeof par;

  if (model.season !== "M") {
    // ---- Additive models: states by least squares for given parameters; parameters by search. ----
    const ws = workspace(problem);
    const concentrated = (v: ArrayLike<number>): number => {
      if (!readPar(v)) return Infinity;
      return solveStates(problem, par, ws);
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
      const r = refineJoint(problem, jointSpec(), warm.x, warm.z);
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
        const r = refineJoint(problem, spec, x0, z0, PROBE_ITERATIONS);
        evaluations += r.iterations;
        if (lead === null || r.sse < lead.sse) lead = r;
      }
      if (lead !== null) {
        const r = refineJoint(problem, spec, lead.x, lead.z);
        evaluations += r.iterations;
        best = { x: r.x, value: r.sse };
      }
    } else {
      best = { x: [], value: concentrated([]) };
    }
    readPar(best.x);
    bestPar = { ...par };
    solveStates(problem, par, ws);
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
    const mws = multWorkspace(problem);
    mws.z.set(start);
    const objective = (v: Float64Array): number => {
      if (!readPar(v)) return Infinity;
      let sse = solveStatesMult(problem, par, mws);
      if (!Number.isFinite(sse)) {
        mws.z.set(start);
        sse = solveStatesMult(problem, par, mws);
      }
      return Number.isFinite(sse) ? sse : Infinity;
    };
    let best = { x: [] as number[], value: Infinity };
    let bestZ: Float64Array = Float64Array.from(start);
    const spec = jointSpec();
    if (warm !== null) {
      // Warm start: one joint search from the given point, run to convergence.
      const r = refineJoint(problem, spec, warm.x, warm.z);
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
          loadStates(problem, start, mws.st);
          const r = filter(yArr, shape, par, mws.st, null);
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
        const r = refineJoint(problem, spec, x0, mws.z, PROBE_ITERATIONS);
        evaluations += r.iterations;
        if (lead === null || r.sse < lead.sse) lead = r;
      }
      if (lead !== null) {
        // The leader is run to convergence.
        const r = refineJoint(problem, spec, lead.x, lead.z);
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
    bestPar = { ...par };
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
  const origin: EtsState = { level: bestL0, trend: trendOn ? bestB0 : 0, ring: Float64Array.from(bestS), k: 0 };
  const mu = new Float64Array(n);
  const sse = filter(yArr, shape, bestPar, origin, mu); // leaves origin at the forecast origin
  const fitted = Array.from(mu);
  const residuals = fitted.map((f, t) => y[t] - f);
  const seasonNext: number[] = [];
  if (seasonal) for (let j = 0; j < m; j++) seasonNext.push(origin.ring[(origin.k + j) % m]);
  const df = n - k;
  const sigma2 = sse / df;
  if (sse === 0) notes.push("the fit is exact (e.g. a constant series): the intervals have zero width");
  if (model.season === "M") notes.push(`prediction intervals are simulated (${PATHS} paths; no analytic variance for this model)`);
  return {
    model,
    m,
    alpha: bestPar.alpha,
    beta: bestPar.beta,
    gamma: bestPar.gamma,
    phi: bestPar.phi,
    l0: bestL0,
    b0: trendOn ? bestB0 : 0,
    initialSeason: seasonal ? initialSeason : [],
    level: origin.level,
    trend: origin.trend,
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

