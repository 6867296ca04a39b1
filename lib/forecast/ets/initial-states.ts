/**
 * The initial states of the additive-error members for given smoothing parameters: exact least
 * squares for the linear members (the states "concentrated out"), Levenberg–Marquardt for
 * A,A,M, and the heuristic start values of R's ets. Also the estimation problem that the
 * searches share (data, shape, values held, which initial states are free). Pure TypeScript.
 *
 * Source: Hyndman, Koehler, Ord & Snyder (2008), "Forecasting with Exponential Smoothing",
 * Springer, §2.6.1 (start values) and ch. 5 (estimation); Marquardt (1963).
 */
import { classicalDecomposition } from "../decompose";
import { ols } from "../ols";
import { choleskySolve, dampedSystem } from "./linear-algebra";
import { filter, type Shape } from "./recursions";
import type { EtsState, Smoothing } from "./state-space";

/** Relative SSE gain under which the inner Gauss–Newton iterations of A,A,M stop. */
const INNER_TOL = 1e-11;

/** Fixed parameters and initial states, already checked. */
export interface Given {
  alpha?: number;
  beta?: number;
  gamma?: number;
  phi?: number;
  l0?: number;
  b0?: number;
  s?: number[];
}

/**
 * One estimation problem: the series, the member's shape, the values held, and which initial
 * states are free. The free states form the vector z = (l0, b0, s1…s(m−1)) (those free, in
 * this order); s_m follows from the seasonal states' sum, 0 (additive) or m (multiplicative).
 */
export interface Problem {
  readonly y: Float64Array;
  readonly shape: Shape;
  readonly given: Given;
  readonly freeL0: boolean;
  readonly freeB0: boolean;
  readonly freeS: boolean;
  /** Length of z. */
  readonly nStates: number;
}

/** A state object with a ring of m seasonal states, all zero. */
export function emptyState(m: number): EtsState {
  return { level: 0, trend: 0, ring: new Float64Array(m), k: 0 };
}

/**
 * Loads the initial states into `st`: the free ones from z, the held ones from the problem;
 * the seasonal states sum to 0 (additive season) or m (multiplicative). Sets st.k = 0.
 */
export function loadStates(problem: Problem, z: ArrayLike<number>, st: EtsState): void {
  const { shape, given: g, freeL0, freeB0, freeS } = problem;
  const { trendOn, m } = shape;
  const seasonTotal = shape.season === 2 ? m : 0;
  const s = st.ring;
  let j = 0;
  st.level = freeL0 ? z[j++] : g.l0!;
  st.trend = trendOn ? (freeB0 ? z[j++] : g.b0!) : 0;
  st.k = 0;
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

/** Scratch space of {@link solveStates}, allocated once per fit and reused by every evaluation. */
export interface Workspace {
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
  /** The solution: free states of the centred data (l0 − c, b0, s1…s(m−1)). */
  z: Float64Array;
}

/** The scratch space of {@link solveStates} for a problem. */
export function workspace(problem: Problem): Workspace {
  const { y, nStates } = problem;
  const { m } = problem.shape;
  const n = y.length;
  let ybar = 0;
  for (let t = 0; t < n; t++) ybar += y[t];
  ybar /= n;
  return {
    yc: y.map((v) => v - ybar),
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
export function solveStates(problem: Problem, par: Smoothing, ws: Workspace): number {
  const { yc, e0, rl, rb, r0, corrL, corrB, corrE, uu, a, rhs, z } = ws;
  const { shape, given: g, freeL0, freeB0, freeS, nStates: p } = problem;
  const { trendOn, season, m } = shape;
  const n = problem.y.length;
  const { alpha, beta, gamma, phi } = par;
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
    // Lagged cross-products with the unconstrained seasonal columns U_j(t) = r0(t − j), two lags
    // per sweep over time (each sum still in time order; those of a response that is not free
    // are not used and set to 0).
    let j = 0;
    for (; j + 1 < m; j += 2) {
      const u = r0[0];
      let cl0 = 0;
      let cb0 = 0;
      let ce0 = 0;
      cl0 += u * rl[j];
      cb0 += u * rb[j];
      ce0 += u * e0[j];
      let cl1 = 0;
      let cb1 = 0;
      let ce1 = 0;
      for (let t = j + 1; t < n; t++) {
        const l = rl[t];
        const b = rb[t];
        const e = e0[t];
        const u0 = r0[t - j];
        const u1 = r0[t - j - 1];
        cl0 += u0 * l;
        cb0 += u0 * b;
        ce0 += u0 * e;
        cl1 += u1 * l;
        cb1 += u1 * b;
        ce1 += u1 * e;
      }
      corrL[j] = freeL0 ? cl0 : 0;
      corrB[j] = freeB0 ? cb0 : 0;
      corrE[j] = ce0;
      corrL[j + 1] = freeL0 ? cl1 : 0;
      corrB[j + 1] = freeB0 ? cb1 : 0;
      corrE[j + 1] = ce1;
    }
    for (; j < m; j++) {
      let cl = 0;
      let cb = 0;
      let ce = 0;
      for (let t = j; t < n; t++) {
        const u = r0[t - j];
        cl += u * rl[t];
        cb += u * rb[t];
        ce += u * e0[t];
      }
      corrL[j] = freeL0 ? cl : 0;
      corrB[j] = freeB0 ? cb : 0;
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
export interface MultWorkspace {
  /** The free states: start on entry, solution on return. */
  z: Float64Array;
  zTrial: Float64Array;
  st: EtsState;
  dl: Float64Array;
  db: Float64Array;
  ds: Float64Array;
  jrow: Float64Array;
  a: Float64Array;
  rhs: Float64Array;
  step: Float64Array;
  chol: Float64Array;
}

/** The scratch space of {@link solveStatesMult} for a problem. */
export function multWorkspace(problem: Problem): MultWorkspace {
  const m = problem.shape.m;
  const p = problem.nStates;
  return {
    z: new Float64Array(p),
    zTrial: new Float64Array(p),
    st: emptyState(m),
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

/**
 * Least-squares initial states of A,A,M for given parameters, by Levenberg–Marquardt
 * (Gauss–Newton with adaptive damping; Marquardt 1963) with exact derivatives of the
 * one-step fitted values propagated through the recursions. Starts from ws.z (warm start),
 * leaves the solution there and returns its SSE (Infinity on failure). No allocation.
 */
export function solveStatesMult(problem: Problem, par: Smoothing, ws: MultWorkspace): number {
  const { y, shape, freeL0, freeB0, freeS, nStates: p } = problem;
  const { trendOn, m } = shape;
  const n = y.length;
  const { alpha, beta, gamma, phi } = par;
  const { z, zTrial, st, dl, db, ds, jrow, a, rhs, step, chol } = ws;
  const s = st.ring;
  loadStates(problem, z, st);
  let sse = filter(y, shape, par, st, null);
  if (!Number.isFinite(sse)) return Infinity;
  if (p === 0) return sse;
  let lambda = 1e-6;
  for (let iter = 0; iter < 50; iter++) {
    // Derivative pass: J'J and J'e.
    loadStates(problem, z, st);
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
    let l = st.level;
    let b = st.trend;
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
        loadStates(problem, zTrial, st);
        const trial = filter(y, shape, par, st, null);
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

/** OLS line through (1, y_1) … (k, y_k) (../ols.ts): intercept at t = 0 and slope; flat through y_1 when k < 3. */
function olsLine(y: readonly number[], k: number): { a: number; b: number } {
  if (k < 3) return { a: y[0], b: 0 };
  const [a, b] = ols(y.slice(0, k), [Array.from({ length: k }, (_, t) => t + 1)]).coefficients;
  return { a, b };
}

