/**
 * The search over the smoothing parameters of an additive-error member: start candidates, and
 * the joint Levenberg–Marquardt least squares over parameters and initial states from the
 * best of them. Pure TypeScript.
 *
 * Sources: Levenberg (1944), Marquardt (1963); start values as R's forecast::ets (Hyndman,
 * Koehler, Ord & Snyder 2008 §5.2) plus a small grid.
 */
import { choleskySolve, dampedSystem } from "./linear-algebra";
import { emptyState, loadStates, type Problem } from "./initial-states";
import { filter, jointPass, jointPassNonSeasonal, type ChainFactors, type DerivativeWork, type SearchLayout } from "./recursions";
import { likelihood, type EtsSpec } from "./state-space";

/** Relative SSE gain of an accepted Levenberg–Marquardt step under which the joint search stops. */
const JOINT_TOL = 1e-10;
/** Most Levenberg–Marquardt iterations of one joint search run to convergence. */
export const JOINT_ITERATIONS = 400;

/** How the free smoothing parameters map onto the search box (see readPar in fitEts, ./least-squares.ts). */
export interface JointSpec {
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
 * Candidate start points for the smoothing parameters: R ets's heuristic start, a livelier
 * one, and a small deterministic grid (alpha 0.02/0.1/0.3/0.6/0.9/0.99 × beta and gamma at
 * 5%, 50% or 95% of their admissible range × phi 0.82/0.9/0.97). The objective is evaluated
 * at each and the local search runs from the best ones, which guards against local minima
 * (the least-squares objective of these models can have several).
 */
export function startCandidates(
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
export function bestCandidates(
  f: (x: Float64Array) => number,
  candidates: readonly number[][],
  count: number,
): { starts: number[][]; evaluations: number } {
  const scored = candidates.map((c) => ({ c, v: f(Float64Array.from(c)) }));
  scored.sort((p, q) => p.v - q.v);
  return { starts: scored.slice(0, count).map((s) => s.c), evaluations: candidates.length };
}

/**
 * Joint least squares over the smoothing parameters (in their box coordinates: alpha, phi,
 * and beta and gamma as fractions of their admissible ranges) and the free initial states,
 * by Levenberg–Marquardt (Levenberg 1944; Marquardt 1963) with exact derivatives of the
 * one-step fitted values propagated through the recursions, and an active set for the
 * parameters on their bounds (projected steps). Starts from (x0, z0) on the raw data;
 * returns the best point found. Seasonal states, when free, are constrained to sum to 0
 * (additive) or m (multiplicative).
 *
 * `relative` (an M season only): the same search for the member with multiplicative errors and
 * the same point recursions, on its likelihood (jointPass's least-squares form of it); `sse`
 * is then exp(lik/n) = Σ ε_t²·g² (g the geometric mean of the fitted values, lik of
 * ./state-space.ts), and seasonal states that are not all above zero are refused.
 */
export function refineJoint(
  problem: Problem,
  spec: JointSpec,
  x0: readonly number[],
  z0: ArrayLike<number>,
  maxIter = JOINT_ITERATIONS,
  relative = false,
): { x: number[]; z: Float64Array; sse: number; iterations: number } {
  const { y, shape, freeL0, freeB0, freeS, nStates: p } = problem;
  const { trendOn, season, m } = shape;
  const n = y.length;
  const { nPar, iAlpha, iBeta, iGamma, iPhi, lower, upper } = spec;
  const P = nPar + p;
  const w = new Float64Array(P);
  for (let i = 0; i < nPar; i++) w[i] = x0[i];
  for (let i = 0; i < p; i++) w[nPar + i] = z0[i];
  const wTrial = new Float64Array(P);
  const zView = w.subarray(nPar);
  const zTrialView = wTrial.subarray(nPar);
  const layout: SearchLayout = { P, iAlpha, iBeta, iGamma, iPhi };
  const d: DerivativeWork = {
    meanLog: new Float64Array(relative ? P : 0),
    dl: new Float64Array(P),
    db: new Float64Array(P),
    ds: new Float64Array(m * P),
    jrow: new Float64Array(P),
    a: new Float64Array(P * P),
    rhs: new Float64Array(P),
    jcols: new Float64Array(season === 0 ? 0 : n * P),
    ecol: new Float64Array(season === 0 ? 0 : n),
  };
  const { dl, db, ds, a, rhs } = d;
  const chol = new Float64Array(P * P);
  const step = new Float64Array(P);
  const st = emptyState(m);
  // Current raw parameters and chain-rule factors.
  const now = { alpha: 0, beta: 0, gamma: 0, phi: 1 };
  const chain: ChainFactors = { betaAlpha: 0, betaU: 0, gammaAlpha: 0, gammaV: 0 };
  const mapPar = (v: Float64Array): void => {
    const alpha = iAlpha >= 0 ? v[iAlpha] : spec.alphaFixed;
    now.alpha = alpha;
    const bHi = Math.max(spec.betaLo, Math.min(spec.betaUp, alpha));
    chain.betaU = bHi - spec.betaLo;
    chain.betaAlpha = iBeta >= 0 && alpha < spec.betaUp && alpha > spec.betaLo ? v[iBeta] : 0;
    now.beta = trendOn ? (iBeta >= 0 ? spec.betaLo + v[iBeta] * chain.betaU : spec.betaFixed) : 0;
    const gHi = Math.max(spec.gammaLo, Math.min(spec.gammaUp, 1 - alpha));
    chain.gammaV = gHi - spec.gammaLo;
    chain.gammaAlpha = iGamma >= 0 && 1 - alpha < spec.gammaUp && 1 - alpha > spec.gammaLo ? -v[iGamma] : 0;
    now.gamma = season !== 0 ? (iGamma >= 0 ? spec.gammaLo + v[iGamma] * chain.gammaV : spec.gammaFixed) : 0;
    now.phi = iPhi >= 0 ? v[iPhi] : spec.phiFixed;
  };
  const mError: EtsSpec = { error: "M", trend: trendOn ? "A" : "N", season: "M", m };
  const work = emptyState(m);
  const sseAt = (v: Float64Array, zv: Float64Array): number => {
    mapPar(v);
    loadStates(problem, zv, st);
    if (relative) {
      for (let i = 0; i < m; i++) if (!(st.ring[i] > 0)) return Infinity;
      return Math.exp(likelihood(mError, now, st, y, work) / n);
    }
    const r = filter(y, shape, now, st, null);
    return Number.isFinite(r) ? r : Infinity;
  };
  let sse = sseAt(w, zView);
  let lambda = 1e-4;
  let iterations = 0;
  for (let iter = 0; iter < maxIter && Number.isFinite(sse); iter++) {
    iterations++;
    // Derivative pass at w: J'J and J'e.
    mapPar(w);
    loadStates(problem, zView, st);
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
    if (season === 0) jointPassNonSeasonal(y, shape, layout, now, chain, st, d);
    else jointPass(y, shape, layout, now, chain, st, d, relative);
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

