/**
 * The recursions of the additive-error members (the named exponential-smoothing methods) as
 * tight loops over a series: one pass giving the sum of squared one-step errors, and the
 * passes that also carry the derivatives of the one-step fitted values for the least-squares
 * searches. Each works on one state object (level, trend, seasonal ring; ./state-space.ts)
 * and one record of smoothing parameters; nothing is allocated. Pure TypeScript.
 *
 * Source: Hyndman, Koehler, Ord & Snyder (2008) "Forecasting with Exponential Smoothing: the
 * state space approach", Springer, table 2.1 (error-correction form). With
 * q_t = ℓ_{t−1} + φ·b_{t−1} (φ = 1 undamped, b = 0 without trend) and ε_t = y_t − μ_t:
 *   ETS(A,N,N), (A,A,N), (A,Ad,N), (A,A,A): μ_t = q_t (+ s_{t−m}),
 *     ℓ_t = q_t + α ε_t,  b_t = φ b_{t−1} + β ε_t,  s_t = s_{t−m} + γ ε_t
 *   ETS(A,A,M): μ_t = q_t·s_{t−m},
 *     ℓ_t = q_t + α ε_t / s_{t−m},  b_t = φ b_{t−1} + β ε_t / s_{t−m},  s_t = s_{t−m} + γ ε_t / q_t
 * The derivative passes differentiate these updates exactly (forward mode, in time order).
 */
import type { EtsState, Smoothing } from "./state-space";

/** Season of the loops: 0 none, 1 additive, 2 multiplicative. */
export type SeasonCode = 0 | 1 | 2;

/** The member as the loops see it: trend on or off, season code, season length (1 without). */
export interface Shape {
  readonly trendOn: boolean;
  readonly season: SeasonCode;
  readonly m: number;
}

/** Where each smoothing parameter sits in the search vector (−1 when held), and its length P. */
export interface SearchLayout {
  readonly P: number;
  readonly iAlpha: number;
  readonly iBeta: number;
  readonly iGamma: number;
  readonly iPhi: number;
}

/**
 * Chain-rule factors from (alpha, beta, gamma) to the search box, where beta and gamma are
 * searched as fractions u, v of their admissible ranges: ∂β/∂α, ∂β/∂u, ∂γ/∂α, ∂γ/∂v.
 */
export interface ChainFactors {
  betaAlpha: number;
  betaU: number;
  gammaAlpha: number;
  gammaV: number;
}

/**
 * Scratch of the derivative passes: the running derivatives of level (dl), trend (db) and
 * seasonal ring (ds, m·P) with respect to the P search variables, one row of the Jacobian
 * (jrow), the outputs J'J (a, upper triangle, P×P) and J'e (rhs), and for the seasonal pass the
 * stored Jacobian (jcols, column-major n·P), errors (ecol, n) and, for relative errors, the
 * gradient of the mean log fitted value (meanLog, P).
 */
export interface DerivativeWork {
  readonly meanLog: Float64Array;
  readonly dl: Float64Array;
  readonly db: Float64Array;
  readonly ds: Float64Array;
  readonly jrow: Float64Array;
  readonly a: Float64Array;
  readonly rhs: Float64Array;
  readonly jcols: Float64Array;
  readonly ecol: Float64Array;
}

/**
 * One pass of the recursions over y from the states in `st`, which it leaves at the forecast
 * origin: level and trend after the last observation, the ring updated in place (ring[k] is the
 * seasonal state for the next step). Writes the one-step fitted values to `mu` when given.
 * Returns the SSE (not finite when the recursions overflow or divide by zero). No allocation.
 */
export function filter(y: ArrayLike<number>, shape: Shape, par: Smoothing, st: EtsState, mu: Float64Array | null): number {
  const { trendOn, season, m } = shape;
  const { alpha, beta, gamma, phi } = par;
  const s = st.ring;
  const n = y.length;
  let l = st.level;
  let b = trendOn ? st.trend : 0;
  let sse = 0;
  let k = st.k;
  for (let t = 0; t < n; t++) {
    const q = trendOn ? l + phi * b : l;
    const yt = y[t];
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
    if (mu !== null) mu[t] = f;
    sse += e * e;
    if (++k === m) k = 0;
  }
  st.level = l;
  st.trend = b;
  st.k = k;
  return sse;
}

/**
 * One derivative pass of the joint search (./joint-search.ts) for the seasonal members:
 * accumulates J'J (upper triangle) into `d.a` and J'e into `d.rhs`, J being the derivatives of
 * the one-step fitted values with respect to the search variables. `d.dl`, `d.db`, `d.ds` hold
 * the derivatives of the initial states on entry. The rows of J and the errors are first stored
 * (column-major in `d.jcols`, and in `d.ecol`); the products are then formed as dot products
 * over time, each summed in time order as a running update would. The ring of `st` is
 * overwritten. Returns the SSE.
 *
 * With `relative` (multiplicative errors; the point recursions are the same), the products are
 * those of the least-squares form of the M-error likelihood instead: n·log Σ ε_t² + 2 Σ log f_t
 * = n·log Σ r_t², r_t = g·ε_t, ε_t = (y_t − f_t)/f_t, g the geometric mean of the f_t
 * (Hyndman et al. 2008 §5.1 with σ² concentrated out). Its Jacobian, with the common factor g
 * dropped (it cancels in the damped step), is ∂ε_t/∂w + ε_t·∂log g/∂w
 * = −(y_t/f_t²)·∂f_t/∂w + ε_t·(1/n) Σ_s (∂f_s/∂w)/f_s; J'e then holds −J'ε.
 */
export function jointPass(y: Float64Array, shape: Shape, layout: SearchLayout, par: Smoothing, chain: ChainFactors, st: EtsState, d: DerivativeWork, relative = false): number {
  const { trendOn, season, m } = shape;
  const { P, iAlpha, iBeta, iGamma, iPhi } = layout;
  const { alpha, beta, gamma, phi } = par;
  const { betaAlpha: cBA, betaU: cBU, gammaAlpha: cGA, gammaV: cGV } = chain;
  const { dl, db, ds, jrow, a, rhs, jcols, ecol } = d;
  const ring = st.ring;
  const n = y.length;
  let l = st.level;
  let b = st.trend;
  let k = st.k;
  let sse = 0;
  const g = d.meanLog;
  if (relative) g.fill(0);
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
    if (relative) {
      // Row t of −(y_t/f_t²)·∂f_t/∂w (sign as J'e needs), and the running sums of (∂f_t/∂w)/f_t.
      const f = y[t] - e;
      const w = y[t] / (f * f);
      for (let j = 0, o = t; j < P; j++, o += n) {
        g[j] += jrow[j] / f;
        jcols[o] = w * jrow[j];
      }
      ecol[t] = e / f;
    } else {
      ecol[t] = e;
      for (let j = 0, o = t; j < P; j++, o += n) jcols[o] = jrow[j];
    }
    if (++k === m) k = 0;
  }
  if (relative) {
    // The gradient of log g, (1/n) Σ_t (∂f_t/∂w)/f_t, times ε_t, column by column.
    for (let j = 0, o = 0; j < P; j++) {
      const gj = g[j] / n;
      for (let t = 0; t < n; t++, o++) jcols[o] -= ecol[t] * gj;
    }
  }
  gramProducts(jcols, ecol, n, P, a, rhs);
  return sse;
}

/**
 * {@link jointPass} for the non-seasonal members (A,N,N / A,A,N / A,Ad,N), without the seasonal
 * branches, accumulating J'J and J'e as it goes (`d.jcols`, `d.ecol` and `d.ds` unused).
 * Leaves `st` unchanged. Returns the SSE.
 */
export function jointPassNonSeasonal(y: Float64Array, shape: Shape, layout: SearchLayout, par: Smoothing, chain: ChainFactors, st: EtsState, d: DerivativeWork): number {
  const { trendOn } = shape;
  const { P, iAlpha, iBeta, iPhi } = layout;
  const { alpha, beta, phi } = par;
  const { betaAlpha: cBA, betaU: cBU } = chain;
  const { dl, db, jrow, a, rhs } = d;
  const n = y.length;
  a.fill(0);
  rhs.fill(0);
  let l = st.level;
  let b = trendOn ? st.trend : 0;
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
 * J'J (upper triangle, row-major P×P, into `a`) and J'e (into `rhs`) from the Jacobian stored
 * column-major (`jcols`, n·P) and the errors (`ecol`, n). Every product is one sum over time in
 * time order; two rows and four columns are formed per sweep over time (fewer loads per product
 * than one row at a time, the same sums). No allocation.
 */
function gramProducts(jcols: Float64Array, ecol: Float64Array, n: number, P: number, a: Float64Array, rhs: Float64Array): void {
  let i = 0;
  for (; i + 1 < P; i += 2) {
    const ci = i * n;
    const cn = ci + n;
    // The two rows' J'e entries and their 2×2 block on the diagonal.
    let r0 = 0;
    let r1 = 0;
    let d00 = 0;
    let d01 = 0;
    let d11 = 0;
    for (let t = 0; t < n; t++) {
      const x = jcols[ci + t];
      const z = jcols[cn + t];
      const e = ecol[t];
      r0 += x * e;
      r1 += z * e;
      d00 += x * x;
      d01 += x * z;
      d11 += z * z;
    }
    rhs[i] = r0;
    rhs[i + 1] = r1;
    const oi = i * P;
    const on = oi + P;
    a[oi + i] = d00;
    a[oi + i + 1] = d01;
    a[on + i + 1] = d11;
    let j = i + 2;
    for (; j + 3 < P; j += 4) {
      const c0 = j * n;
      const c1 = c0 + n;
      const c2 = c1 + n;
      const c3 = c2 + n;
      let u0 = 0;
      let u1 = 0;
      let u2 = 0;
      let u3 = 0;
      let v0 = 0;
      let v1 = 0;
      let v2 = 0;
      let v3 = 0;
      for (let t = 0; t < n; t++) {
        const x = jcols[ci + t];
        const z = jcols[cn + t];
        const w0 = jcols[c0 + t];
        const w1 = jcols[c1 + t];
        const w2 = jcols[c2 + t];
        const w3 = jcols[c3 + t];
        u0 += x * w0;
        u1 += x * w1;
        u2 += x * w2;
        u3 += x * w3;
        v0 += z * w0;
        v1 += z * w1;
        v2 += z * w2;
        v3 += z * w3;
      }
      a[oi + j] = u0;
      a[oi + j + 1] = u1;
      a[oi + j + 2] = u2;
      a[oi + j + 3] = u3;
      a[on + j] = v0;
      a[on + j + 1] = v1;
      a[on + j + 2] = v2;
      a[on + j + 3] = v3;
    }
    for (; j < P; j++) {
      const cj = j * n;
      let u = 0;
      let v = 0;
      for (let t = 0; t < n; t++) {
        const w = jcols[cj + t];
        u += jcols[ci + t] * w;
        v += jcols[cn + t] * w;
      }
      a[oi + j] = u;
      a[on + j] = v;
    }
  }
  if (i < P) {
    // The last row alone (odd P).
    const ci = i * n;
    let r = 0;
    let d = 0;
    for (let t = 0; t < n; t++) {
      const x = jcols[ci + t];
      r += x * ecol[t];
      d += x * x;
    }
    rhs[i] = r;
    a[i * P + i] = d;
  }
}
