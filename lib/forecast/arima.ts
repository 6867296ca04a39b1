/**
 * Non-seasonal ARIMA(p, d, q) with an optional constant, by exact Gaussian maximum likelihood
 * (pure TypeScript; imports lib/stats and the shared Nelder–Mead minimiser).
 *
 * Model: with x_t = Δ^d y_t (d ≤ 2) and w_t = x_t − c,
 *   w_t = φ₁w_{t−1} + … + φ_p w_{t−p} + ε_t + θ₁ε_{t−1} + … + θ_q ε_{t−q},  ε_t ~ N(0, σ²),
 * R's sign convention (`stats::arima`). The constant c is the mean of y when d = 0 (R's
 * "intercept") and the drift of y when d = 1 (forecast's `Arima(include.drift = TRUE)`);
 * with d = 2 there is none.
 *
 * Likelihood: the ARMA part in Harvey's state-space form (state dimension r = max(p, q + 1)),
 * run through the Kalman filter started from the stationary covariance (the solution of
 * P = TPT' + RR'), as G. Gardner, A. C. Harvey and G. D. A. Phillips (1980), "Algorithm AS
 * 154", Applied Statistics 29(3), 311–322, and R's `arima(method = "ML")`. σ² is concentrated
 * out: σ̂² = (1/N)Σv_t²/F_t, −2 log L = N log σ̂² + Σ log F_t + N(1 + log 2π), N = n − d. With
 * d > 0 this equals R's diffuse-prior likelihood of y (the first d observations carry no
 * information about the ARMA part).
 *
 * Estimation: AR (and MA) coefficients are optimised through the partial-autocorrelation
 * reparametrisation of O. Barndorff-Nielsen and G. Schou (1973) / R. H. Jones (1980) (tanh
 * then Durbin–Levinson, R's `partrans`), so every trial point is stationary (invertible);
 * the constant is free. The minimiser is the shared bounded Nelder–Mead with restarts.
 *
 * Order selection (auto): d by repeated KPSS tests at 5% (D. Kwiatkowski, P. C. B. Phillips,
 * P. Schmidt and Y. Shin 1992, J. Econometrics 54, 159–178; lag truncation ⌊3√n/13⌋ and
 * critical value 0.463 as forecast::ndiffs via urca::ur.kpss), then every (p, q) with
 * p, q ≤ 3, with and without the constant when d ≤ 1, by AICc; models with an AR or MA root
 * of modulus below 1.01 are rejected (as forecast::auto.arima). This is the exhaustive
 * (non-stepwise) form of R. J. Hyndman and Y. Khandakar (2008), "Automatic time series
 * forecasting: the forecast package for R", J. Statistical Software 27(3), without seasonal
 * terms.
 *
 * Forecasts: ŵ_{n+j} = Z T^j a_n, integrated d times; variance
 * σ²[b_h P_n b_h' + Σ_{m<h} ψ*_m²] with ψ* the ψ-weights of the integrated process and b_h the
 * loading of the final state error — the finite-sample Kalman forecast variance. σ² here is
 * Σ(v²/F)/(N − k) (k estimated coefficients), as forecast::Arima and its forecasts use;
 * normal bounds, as forecast::forecast.Arima.
 */
import { minimise } from "./optimise";
import { neumaierSum } from "../stats/sum";
import { ols } from "./ols";

/** Largest AR and MA orders tried by automatic selection. */
export const MAX_AR = 3;
export const MAX_MA = 3;
/** Largest number of differences. */
export const MAX_D = 2;
/** KPSS 5% critical value for level stationarity (Kwiatkowski et al. 1992, table 1). */
export const KPSS_CRITICAL_5 = 0.463;
/** Smallest root modulus accepted by automatic selection (forecast::auto.arima uses 1.01). */
export const MIN_ROOT_MODULUS = 1.01;
/** Bound on the unconstrained (pre-tanh) coefficients: |PACF| ≤ tanh(7) ≈ 1 − 1.7e-6. */
const U_BOUND = 7;
/** Nelder–Mead settings for the likelihood: relative tolerance and restarts per start. */
const ARIMA_TOL = 1e-10;
const ARIMA_RESTARTS = 2;
/**
 * Quick fits (automatic selection's stepwise search, `quick`): one start (Hannan–Rissanen), no
 * restarts, relative tolerance 1e-8 — as R's auto.arima trades exactness for speed with its
 * approximation option (Hyndman & Khandakar 2008, §3.2).
 */
const QUICK_TOL = 1e-8;

/** Order and constant of an ARIMA model. */
export interface ArimaSpec {
  readonly p: number;
  readonly d: number;
  readonly q: number;
  /** Include the constant (mean for d = 0, drift for d = 1); must be false for d = 2. */
  readonly constant: boolean;
}

/** Coefficients held fixed during estimation (others are estimated). */
export interface ArimaFixed {
  readonly ar?: readonly (number | undefined)[];
  readonly ma?: readonly (number | undefined)[];
  readonly constant?: number;
}

/** A fitted ARIMA model: plain data. */
export interface ArimaFit {
  readonly spec: ArimaSpec;
  readonly ar: readonly number[];
  readonly ma: readonly number[];
  /** The constant c (0 when not included). */
  readonly constant: number;
  /**
   * Innovation variance used for intervals: Σ(v_t²/F_t)/(N − k), k the number of estimated
   * coefficients, as forecast::Arima reports it (stats::arima's ML value is {@link sigma2Ml}).
   */
  readonly sigma2: number;
  /** Maximum-likelihood innovation variance (1/N)Σ v_t²/F_t (stats::arima's `sigma2`). */
  readonly sigma2Ml: number;
  readonly loglik: number;
  readonly aic: number;
  readonly aicc: number;
  readonly bic: number;
  /** Number of observations in the likelihood, N = n − d. */
  readonly nUsed: number;
  /** Number of estimated coefficients plus one for σ² (fixed ones do not count, as R). */
  readonly npar: number;
  /** One-step prediction errors of y (NaN for the first d). */
  readonly residuals: readonly number[];
  /** One-step predictions of y (NaN for the first d). */
  readonly fitted: readonly number[];
  /** Filtered ARMA state a_{n|n} and its covariance P_{n|n}/σ² (row-major r × r). */
  readonly state: readonly number[];
  readonly stateCov: readonly number[];
  /** The last d observations of y (oldest first), needed to integrate forecasts. */
  readonly lastValues: readonly number[];
  readonly converged: boolean;
}

// ---------------------------------------------------------------------------------------
// Parameter transforms

/** R's `partrans`: unconstrained values → coefficients of a stationary AR polynomial. */
export function toStationary(u: readonly number[]): number[] {
  const p = u.length;
  const out = u.map(Math.tanh);
  const work = [...out];
  for (let j = 1; j < p; j++) {
    const a = out[j];
    for (let k = 0; k < j; k++) work[k] -= a * out[j - k - 1];
    for (let k = 0; k < j; k++) out[k] = work[k];
  }
  return out;
}

/**
 * Inverse of {@link toStationary}: the partial autocorrelations of AR coefficients (reverse
 * Durbin–Levinson). A stationary polynomial gives values strictly inside (−1, 1).
 */
export function partialAutocorrelations(phi: readonly number[]): number[] {
  const p = phi.length;
  const a = [...phi];
  const pacf = new Array<number>(p).fill(0);
  for (let j = p - 1; j >= 0; j--) {
    const k = a[j];
    pacf[j] = k;
    if (Math.abs(k) >= 1) return pacf.map((v, i) => (i <= j ? (i === j ? k : NaN) : v));
    const prev = new Array<number>(j);
    for (let i = 0; i < j; i++) prev[i] = (a[i] + k * a[j - 1 - i]) / (1 - k * k);
    for (let i = 0; i < j; i++) a[i] = prev[i];
  }
  return pacf;
}

/** Whether 1 − φ₁z − … − φ_p z^p has all roots outside the unit circle. */
export function isStationary(phi: readonly number[]): boolean {
  return partialAutocorrelations(phi).every((v) => Math.abs(v) < 1);
}

/**
 * Smallest modulus of the roots of 1 + c₁z + … + c_k z^k (Durand–Kerner iteration; k ≤ 6).
 * Returns Infinity for a polynomial of degree 0.
 */
export function minRootModulus(coef: readonly number[]): number {
  let k = coef.length;
  while (k > 0 && coef[k - 1] === 0) k--;
  if (k === 0) return Infinity;
  // monic form: z^k + (c_{k−1}/c_k) z^{k−1} + … + 1/c_k
  const a = [1, ...coef.slice(0, k)].map((v) => v / coef[k - 1]); // a[i] multiplies z^i
  let re = Array.from({ length: k }, (_, i) => Math.cos((2 * Math.PI * i) / k + 0.4) * (1 + 0.1 * i));
  let im = Array.from({ length: k }, (_, i) => Math.sin((2 * Math.PI * i) / k + 0.4) * (1 + 0.1 * i));
  for (let iter = 0; iter < 500; iter++) {
    let change = 0;
    const nre = [...re];
    const nim = [...im];
    for (let i = 0; i < k; i++) {
      // p(z) by Horner
      let pr = 1;
      let pi = 0;
      for (let j = k - 1; j >= 0; j--) {
        const tr = pr * re[i] - pi * im[i] + a[j];
        const ti = pr * im[i] + pi * re[i];
        pr = tr;
        pi = ti;
      }
      let dr = 1;
      let di = 0;
      for (let j = 0; j < k; j++) {
        if (j === i) continue;
        const xr = re[i] - re[j];
        const xi = im[i] - im[j];
        const tr = dr * xr - di * xi;
        const ti = dr * xi + di * xr;
        dr = tr;
        di = ti;
      }
      const den = dr * dr + di * di;
      const qr = (pr * dr + pi * di) / den;
      const qi = (pi * dr - pr * di) / den;
      nre[i] = re[i] - qr;
      nim[i] = im[i] - qi;
      change = Math.max(change, Math.hypot(qr, qi));
    }
    re = nre;
    im = nim;
    if (change < 1e-14) break;
  }
  return Math.min(...re.map((r, i) => Math.hypot(r, im[i])));
}

/**
 * Maps stationary coefficients to the optimiser's unconstrained scale (atanh of the partial
 * autocorrelations); zeros when they are not strictly inside the stationary region (after a
 * shrink to |pacf| ≤ 0.95 for a safe start).
 */
function toUnconstrained(phi: readonly number[]): number[] {
  const pacf = partialAutocorrelations(phi);
  if (!pacf.every((v) => Number.isFinite(v) && Math.abs(v) < 1)) return phi.map(() => 0);
  return pacf.map((v) => Math.atanh(Math.max(-0.95, Math.min(0.95, v))));
}

/**
 * Starting values by the Hannan–Rissanen regressions (E. J. Hannan and J. Rissanen 1982,
 * "Recursive estimation of mixed autoregressive-moving average order", Biometrika 69(1),
 * 81–94): a long AR fitted by OLS gives residuals ε̂, then x_t is regressed on p lags of x
 * and q lags of ε̂. Only used to start the likelihood search; zeros when the data are too
 * short or the regressions fail.
 */
function hannanRissanen(x: readonly number[], p: number, q: number): { ar: number[]; ma: number[] } {
  const zeros = { ar: new Array<number>(p).fill(0), ma: new Array<number>(q).fill(0) };
  if (p === 0 && q === 0) return zeros;
  const n = x.length;
  const m = Math.min(Math.max(p, q) + 4, Math.floor(n / 4));
  try {
    let eps = new Array<number>(n).fill(0);
    if (q > 0) {
      if (m < 1 || n - m < 2 * m + 2) return zeros;
      const cols = Array.from({ length: m }, (_, k) => x.slice(m - k - 1, n - k - 1));
      const fit = ols(x.slice(m), cols, { intercept: false });
      eps = [...new Array<number>(m).fill(0), ...fit.residuals];
    }
    const lag = Math.max(p, q > 0 ? m + q : 0);
    if (n - lag < p + q + 2) return zeros;
    const cols = [
      ...Array.from({ length: p }, (_, k) => x.slice(lag - k - 1, n - k - 1)),
      ...Array.from({ length: q }, (_, k) => eps.slice(lag - k - 1, n - k - 1)),
    ];
    const fit = ols(x.slice(lag), cols, { intercept: false });
    return { ar: fit.coefficients.slice(0, p), ma: fit.coefficients.slice(p) };
  } catch {
    return zeros;
  }
}

// ---------------------------------------------------------------------------------------
// State space and Kalman filter

interface Ssm {
  readonly r: number;
  /** First column of T (φ padded with zeros); T has ones on the superdiagonal. */
  readonly phi: Float64Array;
  /** R = (1, θ₁, …, θ_{r−1}). */
  readonly rv: Float64Array;
}

function makeSsm(ar: readonly number[], ma: readonly number[]): Ssm {
  const r = Math.max(ar.length, ma.length + 1);
  const phi = new Float64Array(r);
  ar.forEach((v, i) => (phi[i] = v));
  const rv = new Float64Array(r);
  rv[0] = 1;
  ma.forEach((v, i) => (rv[i + 1] = v));
  return { r, phi, rv };
}

/** (T M)[i][j] for row-major r × r M: row i of T has φ_i in column 0 and 1 in column i + 1. */
function tTimes(s: Ssm, m: Float64Array, out: Float64Array): void {
  const r = s.r;
  for (let i = 0; i < r; i++) {
    for (let j = 0; j < r; j++) {
      out[i * r + j] = s.phi[i] * m[j] + (i + 1 < r ? m[(i + 1) * r + j] : 0);
    }
  }
}

/** T P T' + R R' (P symmetric, row-major). */
function predictCov(s: Ssm, p: Float64Array, tmp: Float64Array, out: Float64Array): void {
  const r = s.r;
  tTimes(s, p, tmp); // tmp = T P
  // out = tmp T' : out[i][j] = Σ_k tmp[i][k] T[j][k] = tmp[i][0] φ_j + tmp[i][j+1]
  for (let i = 0; i < r; i++) {
    for (let j = 0; j < r; j++) {
      out[i * r + j] = tmp[i * r] * s.phi[j] + (j + 1 < r ? tmp[i * r + j + 1] : 0) + s.rv[i] * s.rv[j];
    }
  }
}

/** Stationary covariance (per unit σ²): solves P = TPT' + RR' as an r² linear system. */
export function stationaryCovariance(ar: readonly number[], ma: readonly number[]): number[] {
  const s = makeSsm(ar, ma);
  const r = s.r;
  const n = r * r;
  // Build (I − T⊗T) vec(P) = vec(RR') in row-major vec: P[i][j] ↔ i·r + j.
  const tij = (i: number, j: number) => (j === 0 ? s.phi[i] : 0) + (j === i + 1 ? 1 : 0);
  const a = new Float64Array(n * n);
  const b = new Float64Array(n);
  for (let i = 0; i < r; i++) {
    for (let j = 0; j < r; j++) {
      const row = i * r + j;
      a[row * n + row] += 1;
      for (let k = 0; k < r; k++) {
        const tik = tij(i, k);
        if (tik === 0) continue;
        for (let l = 0; l < r; l++) {
          const tjl = tij(j, l);
          if (tjl === 0) continue;
          a[row * n + k * r + l] -= tik * tjl;
        }
      }
      b[row] = s.rv[i] * s.rv[j];
    }
  }
  return solveLinear(a, b, n);
}

/** Gaussian elimination with partial pivoting (a is n × n row-major, overwritten). */
function solveLinear(a: Float64Array, b: Float64Array, n: number): number[] {
  for (let c = 0; c < n; c++) {
    let piv = c;
    for (let i = c + 1; i < n; i++) if (Math.abs(a[i * n + c]) > Math.abs(a[piv * n + c])) piv = i;
    if (piv !== c) {
      for (let j = 0; j < n; j++) {
        const t = a[c * n + j];
        a[c * n + j] = a[piv * n + j];
        a[piv * n + j] = t;
      }
      const t = b[c];
      b[c] = b[piv];
      b[piv] = t;
    }
    const d = a[c * n + c];
    for (let i = c + 1; i < n; i++) {
      const f = a[i * n + c] / d;
      if (f === 0) continue;
      for (let j = c; j < n; j++) a[i * n + j] -= f * a[c * n + j];
      b[i] -= f * b[c];
    }
  }
  const x = new Array<number>(n).fill(0);
  for (let i = n - 1; i >= 0; i--) {
    let s = b[i];
    for (let j = i + 1; j < n; j++) s -= a[i * n + j] * x[j];
    x[i] = s / a[i * n + i];
  }
  return x;
}

interface FilterResult {
  ssq: number;
  sumlog: number;
  innovations: number[];
  a: Float64Array;
  p: Float64Array;
}

/**
 * Kalman filter of the ARMA model over w, from the stationary prior. With `states`, the
 * filtered state a_{t|t} after each observation is appended to it.
 */
function kalman(w: readonly number[], ar: readonly number[], ma: readonly number[], keep: boolean, states?: number[][]): FilterResult | null {
  const s = makeSsm(ar, ma);
  const r = s.r;
  const p = Float64Array.from(stationaryCovariance(ar, ma));
  if (!p.every(Number.isFinite) || !(p[0] > 0)) return null;
  const a = new Float64Array(r);
  const tmp = new Float64Array(r * r);
  const aNext = new Float64Array(r);
  const innovations: number[] = [];
  let ssq = 0;
  let sumlog = 0;
  // Once the predicted covariance stops changing (to 1e-13 relative) the filter has reached its
  // steady state: the gain and F are then reused, which saves the O(r²) covariance work.
  let steady = false;
  const pPrev = new Float64Array(r * r);
  const gain = new Float64Array(r);
  let fSteady = 0;
  const filtered = new Float64Array(r * r);
  for (let t = 0; t < w.length; t++) {
    if (t > 0) {
      for (let i = 0; i < r; i++) aNext[i] = s.phi[i] * a[0] + (i + 1 < r ? a[i + 1] : 0);
      a.set(aNext);
      if (!steady) {
        pPrev.set(p);
        predictCov(s, filtered, tmp, p);
        let change = 0;
        for (let i = 0; i < r * r; i++) change = Math.max(change, Math.abs(p[i] - pPrev[i]));
        if (t > 1 && change <= 1e-13 * p[0]) {
          steady = true;
          fSteady = p[0];
          for (let i = 0; i < r; i++) gain[i] = p[i * r] / fSteady;
        }
      }
    }
    const f = steady ? fSteady : p[0];
    const v = w[t] - a[0];
    if (!(f > 0)) return null;
    ssq += (v * v) / f;
    sumlog += Math.log(f);
    if (keep) innovations.push(v);
    if (steady) {
      for (let i = 0; i < r; i++) a[i] += gain[i] * v;
      states?.push(Array.from(a));
      continue;
    }
    // update: a += P[:,0] v / f ; P_filtered = P − P[:,0] P[0,:] / f
    for (let i = 0; i < r; i++) tmp[i] = p[i * r];
    for (let i = 0; i < r; i++) a[i] += (tmp[i] * v) / f;
    for (let i = 0; i < r; i++) for (let j = 0; j < r; j++) filtered[i * r + j] = p[i * r + j] - (tmp[i] * tmp[j]) / f;
    states?.push(Array.from(a));
  }
  // filtered covariance at the end (steady state: from the steady predicted P)
  if (steady) {
    for (let i = 0; i < r; i++) for (let j = 0; j < r; j++) filtered[i * r + j] = p[i * r + j] - (p[i * r] * p[j * r]) / fSteady;
  }
  return { ssq, sumlog, innovations, a, p: filtered };
}

/** Δ^d y (length n − d). */
export function difference(y: readonly number[], d: number): number[] {
  let x = [...y];
  for (let k = 0; k < d; k++) x = x.slice(1).map((v, i) => v - x[i]);
  return x;
}

// ---------------------------------------------------------------------------------------
// Fitting

/**
 * Fits ARIMA(p, d, q) (± constant) by exact maximum likelihood; see the module comment.
 *
 * Input: y finite with n − d > npar + 1 (so AICc is defined); p, q ≤ 6; d ∈ {0, 1, 2};
 * `fixed` may hold any coefficient (then not estimated; fixed AR/MA must be stationary /
 * invertible). `quick`: one start, no restarts, tolerance 1e-8 (see QUICK_TOL).
 * @throws RangeError for an unusable order, too few observations, a series that is constant
 *   after differencing, or a non-stationary fixed AR (or non-invertible fixed MA) part.
 */
export function fitArima(y: readonly number[], spec: ArimaSpec, fixed: ArimaFixed = {}, quick = false): ArimaFit {
  const { p, d, q } = spec;
  if (![p, d, q].every((v) => Number.isInteger(v) && v >= 0) || p > 6 || q > 6 || d > MAX_D) {
    throw new RangeError(`arima: order (p, d, q) = (${p}, ${d}, ${q}) is not supported (p, q ≤ 6, d ≤ ${MAX_D})`);
  }
  if (spec.constant && d > 1) throw new RangeError("arima: a constant with d = 2 would be a quadratic trend; not supported");
  const x = difference(y, d);
  const N = x.length;
  const fixedAr = Array.from({ length: p }, (_, i) => fixed.ar?.[i]);
  const fixedMa = Array.from({ length: q }, (_, i) => fixed.ma?.[i]);
  const fixedC = spec.constant ? fixed.constant : 0;
  const nFree = fixedAr.filter((v) => v === undefined).length + fixedMa.filter((v) => v === undefined).length + (spec.constant && fixedC === undefined ? 1 : 0);
  // estimated coefficients + σ², as R (coefficients held fixed do not count)
  const npar = nFree + 1;
  if (N - npar - 1 <= 0) {
    throw new RangeError(`arima: ARIMA(${p},${d},${q}) needs more than ${npar + 1 + d} observations, got ${y.length}`);
  }
  if (fixedAr.every((v) => v !== undefined) && p > 0 && !isStationary(fixedAr as number[])) {
    throw new RangeError("arima: the fixed AR coefficients are not stationary");
  }
  if (fixedMa.every((v) => v !== undefined) && q > 0 && !isStationary((fixedMa as number[]).map((v) => -v))) {
    throw new RangeError("arima: the fixed MA coefficients are not invertible");
  }
  const partlyFixedAr = fixedAr.some((v) => v !== undefined) && fixedAr.some((v) => v === undefined);
  const partlyFixedMa = fixedMa.some((v) => v !== undefined) && fixedMa.some((v) => v === undefined);

  // Decode the optimiser's vector: AR and MA through the stationarity transform when all are
  // free; with some held fixed, coefficients are used directly (and checked).
  const decode = (v: ArrayLike<number>): { ar: number[]; ma: number[]; c: number } | null => {
    let k = 0;
    let ar: number[];
    let ma: number[];
    if (partlyFixedAr) ar = fixedAr.map((f) => (f === undefined ? v[k++] : f));
    else if (fixedAr.every((f) => f !== undefined)) ar = fixedAr as number[];
    else ar = toStationary(Array.from({ length: p }, () => v[k++]));
    if (partlyFixedMa) ma = fixedMa.map((f) => (f === undefined ? v[k++] : f));
    else if (fixedMa.every((f) => f !== undefined)) ma = fixedMa as number[];
    else ma = toStationary(Array.from({ length: q }, () => v[k++])).map((c) => -c);
    const c = spec.constant ? (fixedC === undefined ? v[k++] : fixedC) : 0;
    if ((partlyFixedAr && !isStationary(ar)) || (partlyFixedMa && !isStationary(ma.map((m) => -m)))) return null;
    return { ar, ma, c };
  };
  const objective = (v: ArrayLike<number>): number => {
    const par = decode(v);
    if (!par) return Infinity;
    const w = x.map((xv) => xv - par.c);
    const kf = kalman(w, par.ar, par.ma, false);
    if (!kf) return Infinity;
    return 0.5 * (Math.log(kf.ssq / N) + kf.sumlog / N);
  };

  if (x.every((v) => v === x[0])) {
    throw new RangeError(
      `arima: the series${d > 0 ? ` differenced ${d} time(s)` : ""} is constant, so ARIMA has nothing to estimate; use naive or drift`,
    );
  }
  const meanX = neumaierSum(x) / N;
  const start = hannanRissanen(x.map((v) => v - meanX), p, q);
  const sdX = Math.sqrt(neumaierSum(x.map((v) => (v - meanX) ** 2)) / Math.max(N - 1, 1)) || 1;
  const x0: number[] = [];
  const lower: number[] = [];
  const upper: number[] = [];
  const step: number[] = [];
  // Two starts, because the ARMA likelihood can have several local optima: the Hannan–
  // Rissanen estimates and the origin (white noise); the better end point is kept.
  const arStart = !partlyFixedAr ? toUnconstrained(start.ar) : start.ar;
  const maStart = !partlyFixedMa ? toUnconstrained(start.ma.map((v) => -v)) : start.ma;
  const x1: number[] = [];
  const addCoef = (free: boolean, transformed: boolean, init: number) => {
    if (!free) return;
    x0.push(init);
    x1.push(0);
    lower.push(transformed ? -U_BOUND : -10);
    upper.push(transformed ? U_BOUND : 10);
    step.push(0.3);
  };
  fixedAr.forEach((f, i) => addCoef(f === undefined, !partlyFixedAr, arStart[i] ?? 0));
  fixedMa.forEach((f, i) => addCoef(f === undefined, !partlyFixedMa, maStart[i] ?? 0));
  if (spec.constant && fixedC === undefined) {
    x0.push(meanX);
    x1.push(meanX);
    lower.push(-Infinity);
    upper.push(Infinity);
    step.push(Math.max(sdX / Math.sqrt(N), 1e-8 * (Math.abs(meanX) + 1)));
  }
  let best = x0;
  let converged = true;
  if (nFree > 0) {
    const starts = quick || x0.every((v, i) => v === x1[i]) ? [x0] : [x0, x1];
    let bestValue = Infinity;
    for (const st of starts) {
      const res = minimise((v) => objective(v), st, { lower, upper, step, tol: quick ? QUICK_TOL : ARIMA_TOL, restarts: quick ? 0 : ARIMA_RESTARTS });
      if (res.value < bestValue) {
        bestValue = res.value;
        best = res.x;
        converged = res.converged;
      }
    }
  }
  const par = decode(best);
  if (!par) throw new RangeError("arima: no admissible parameters found");
  const w = x.map((xv) => xv - par.c);
  const kf = kalman(w, par.ar, par.ma, true);
  if (!kf) throw new RangeError("arima: the likelihood could not be evaluated at the estimate");
  const sigma2Ml = kf.ssq / N;
  const loglik = -0.5 * (N * Math.log(sigma2Ml) + kf.sumlog + N + N * Math.log(2 * Math.PI));
  const aic = -2 * loglik + 2 * npar;
  const residuals = y.map((_, t) => (t < d ? NaN : kf.innovations[t - d]));
  return {
    spec,
    ar: par.ar,
    ma: par.ma,
    constant: par.c,
    sigma2: kf.ssq / (N - nFree),
    sigma2Ml,
    loglik,
    aic,
    aicc: aic + (2 * npar * (npar + 1)) / (N - npar - 1),
    bic: aic + npar * (Math.log(N) - 2),
    nUsed: N,
    npar,
    residuals,
    fitted: y.map((v, t) => v - residuals[t]),
    state: Array.from(kf.a),
    stateCov: Array.from(kf.p),
    lastValues: y.slice(y.length - d),
    converged,
  };
}

// ---------------------------------------------------------------------------------------
// Differencing test and automatic order selection

/**
 * KPSS level-stationarity statistic (Kwiatkowski et al. 1992): η = Σ S_t²/(n² s²(l)) with S
 * the partial sums of y − ȳ and s²(l) the Newey–West (Bartlett) long-run variance with lag
 * l = ⌊3√n/13⌋ (forecast::ndiffs' choice, via urca::ur.kpss).
 * @throws RangeError for fewer than 3 values.
 */
export function kpssStatistic(y: readonly number[]): number {
  const n = y.length;
  if (n < 3) throw new RangeError("kpssStatistic: needs at least 3 values");
  const m = neumaierSum(y) / n;
  const e = y.map((v) => v - m);
  let s = 0;
  const s2terms: number[] = [];
  for (const v of e) {
    s += v;
    s2terms.push(s * s);
  }
  const num = neumaierSum(s2terms) / (n * n);
  const lmax = Math.trunc((3 * Math.sqrt(n)) / 13);
  let den = neumaierSum(e.map((v) => v * v)) / n;
  for (let k = 1; k <= lmax; k++) {
    const c: number[] = [];
    for (let t = k; t < n; t++) c.push(e[t] * e[t - k]);
    den += (2 / n) * (1 - k / (lmax + 1)) * neumaierSum(c);
  }
  return num / den;
}

/** Number of differences by repeated KPSS tests at 5% (as forecast::ndiffs), at most MAX_D. */
export function chooseDifferences(y: readonly number[]): number {
  let x = [...y];
  let d = 0;
  const constant = (v: readonly number[]) => v.every((z) => z === v[0]);
  if (constant(x)) return 0;
  while (d < MAX_D && x.length >= 3 && kpssStatistic(x) > KPSS_CRITICAL_5) {
    d++;
    x = difference(x, 1);
    if (constant(x)) return d;
  }
  return d;
}

/** One candidate of automatic selection. */
export interface ArimaCandidate {
  readonly spec: ArimaSpec;
  /** AICc, or Infinity when the model failed or was rejected. */
  readonly aicc: number;
}

/**
 * Automatic ARIMA: d by {@link chooseDifferences} (unless given), then models compared by AICc,
 * fitted by {@link fitArima}; a model with an AR or MA root of modulus below
 * {@link MIN_ROOT_MODULUS} is rejected. Search:
 * - "exhaustive" (default): every (p, q) with p ≤ maxP, q ≤ maxQ, with and without the constant
 *   when d ≤ 1; ties go to the simpler model (grid order).
 * - "stepwise": Hyndman & Khandakar (2008), J. Statistical Software 27(3), §3.2, without seasonal
 *   terms: start from the best of ARIMA(2,d,2), (0,d,0), (1,d,0), (0,d,1) (with the constant when
 *   d ≤ 1) and (0,d,0) without it; then, while one of them is better, move to the best of the
 *   current model's neighbours: p ± 1, q ± 1, p and q ± 1 together, the constant toggled (d ≤ 1).
 *   Each model is fitted once.
 * `quick` fits every model with {@link fitArima}'s quick settings.
 * @throws RangeError when no candidate can be fitted.
 */
export function autoArima(
  y: readonly number[],
  options: { d?: number; maxP?: number; maxQ?: number; search?: "exhaustive" | "stepwise"; quick?: boolean } = {},
): { fit: ArimaFit; candidates: ArimaCandidate[] } {
  const d = options.d ?? chooseDifferences(y);
  const maxP = options.maxP ?? MAX_AR;
  const maxQ = options.maxQ ?? MAX_MA;
  const candidates: ArimaCandidate[] = [];
  const tried = new Map<string, ArimaFit | null>();
  let best: ArimaFit | null = null;
  let firstError = "";
  /** Fits a model once (later calls return the same result); null when it failed or was rejected. */
  const consider = (p: number, q: number, constant: boolean): ArimaFit | null => {
    const key = `${p},${q},${constant}`;
    if (tried.has(key)) return tried.get(key)!;
    const spec: ArimaSpec = { p, d, q, constant };
    let aicc = Infinity;
    let result: ArimaFit | null = null;
    try {
      const fit = fitArima(y, spec, {}, options.quick === true);
      const ok = minRootModulus(fit.ar.map((v) => -v)) >= MIN_ROOT_MODULUS && minRootModulus(fit.ma) >= MIN_ROOT_MODULUS;
      if (ok && Number.isFinite(fit.aicc)) {
        aicc = fit.aicc;
        result = fit;
        if (!best || aicc < best.aicc) best = fit;
      }
    } catch (e) {
      if (!firstError) firstError = e instanceof Error ? e.message : String(e);
    }
    tried.set(key, result);
    candidates.push({ spec, aicc });
    return result;
  };
  const constants = d <= 1 ? [true, false] : [false];
  if (options.search === "stepwise") {
    const c = d <= 1;
    for (const [p, q] of [[2, 2], [0, 0], [1, 0], [0, 1]]) if (p <= maxP && q <= maxQ) consider(p, q, c);
    if (c) consider(0, 0, false);
    for (;;) {
      const current: ArimaFit | null = best;
      if (!current) break;
      const { p, q, constant } = (current as ArimaFit).spec;
      const moves: [number, number, boolean][] = [];
      for (const [dp, dq] of [[-1, 0], [1, 0], [0, -1], [0, 1], [-1, -1], [1, 1]]) moves.push([p + dp, q + dq, constant]);
      if (d <= 1) moves.push([p, q, !constant]);
      for (const [mp, mq, mc] of moves) if (mp >= 0 && mq >= 0 && mp <= maxP && mq <= maxQ) consider(mp, mq, mc);
      if (best === current) break;
    }
  } else {
    for (let order = 0; order <= maxP + maxQ; order++) {
      for (let p = 0; p <= Math.min(order, maxP); p++) {
        const q = order - p;
        if (q > maxQ) continue;
        for (const constant of constants) consider(p, q, constant);
      }
    }
  }
  if (!best) {
    throw new RangeError(`arima: no ARIMA model could be fitted to this series${firstError ? ` (${firstError.replace(/^arima: /, "")})` : ""}`);
  }
  return { fit: best, candidates };
}

// ---------------------------------------------------------------------------------------
// Forecasting

/** Rows z_j = Z T^j (j = 0..h) of the ARMA state-space form, as vectors of length r. */
function powersOfT(s: Ssm, h: number): Float64Array[] {
  const r = s.r;
  const rows: Float64Array[] = [];
  let z = new Float64Array(r);
  z[0] = 1;
  rows.push(z);
  for (let j = 1; j <= h; j++) {
    const next = new Float64Array(r);
    // (z T)[k] = z[0]·T[0][k] + Σ_i z[i] T[i][k]; T[i][0] = φ_i, T[i][i+1] = 1
    for (let k = 0; k < r; k++) {
      let v = 0;
      if (k === 0) for (let i = 0; i < r; i++) v += z[i] * s.phi[i];
      else v += z[k - 1];
      next[k] = v;
    }
    rows.push(next);
    z = next;
  }
  return rows;
}

/**
 * Point forecasts and forecast standard deviations for steps 1..h (see the module comment):
 * ŵ_{n+j} = Z T^j a_n; ŷ integrates c + ŵ d times from the last observations;
 * Var_h = σ²[b_h P_n b_h' + Σ_{m<h} ψ*_m²], ψ*_m = Σ_{k≤m} g_{m−k} ψ_k with ψ_k = Z T^k R the
 * ARMA ψ-weights and g the coefficients of (1 − B)^{−d}; b_h = Σ_{j=1..h} g_{h−j} Z T^j.
 */
export function forecastArima(
  fit: Pick<ArimaFit, "ar" | "ma" | "constant" | "sigma2" | "state" | "stateCov" | "lastValues"> & { readonly spec: Pick<ArimaSpec, "d"> },
  h: number,
): { mean: number[]; sd: number[] } {
  const { d } = fit.spec;
  const s = makeSsm(fit.ar, fit.ma);
  const r = s.r;
  const g = (k: number) => (d === 0 ? (k === 0 ? 1 : 0) : d === 1 ? 1 : k + 1);
  const rows = powersOfT(s, h);
  const psi = rows.map((row) => {
    let v = 0;
    for (let k = 0; k < r; k++) v += row[k] * s.rv[k];
    return v;
  });
  const a = fit.state;
  const pn = fit.stateCov;
  const delta = d === 0 ? [] : d === 1 ? [1] : [2, -1];
  const hist = [...fit.lastValues];
  const mean: number[] = [];
  const sd: number[] = [];
  const psiStar: number[] = [];
  for (let m = 0; m < h; m++) {
    let v = 0;
    for (let k = 0; k <= m; k++) v += g(m - k) * psi[k];
    psiStar.push(v);
  }
  for (let hh = 1; hh <= h; hh++) {
    let wHat = 0;
    for (let k = 0; k < r; k++) wHat += rows[hh][k] * a[k];
    let yHat = fit.constant + wHat;
    for (let i = 0; i < d; i++) yHat += delta[i] * hist[hist.length - 1 - i];
    hist.push(yHat);
    mean.push(yHat);
    const b = new Float64Array(r);
    for (let j = 1; j <= hh; j++) for (let k = 0; k < r; k++) b[k] += g(hh - j) * rows[j][k];
    let quad = 0;
    for (let i = 0; i < r; i++) for (let k = 0; k < r; k++) quad += b[i] * pn[i * r + k] * b[k];
    let sum = 0;
    for (let m = 0; m < hh; m++) sum += psiStar[m] * psiStar[m];
    sd.push(Math.sqrt(fit.sigma2 * (Math.max(quad, 0) + sum)));
  }
  return { mean, sd };
}

/**
 * In-sample forecasts from every origin with the fitted coefficients held: row t (t = 0..n−1)
 * holds the forecasts of y_t..y_{t+h−1} made from y_0..y_{t−1}, i.e. the point forecasts of
 * {@link forecastArima} from the Kalman filter's state a_{t−1−d|t−1−d} on Δ^d y − c (the prior
 * mean 0 when t = d), integrated from y_{t−d}..y_{t−1}; step 1 of row t ≥ d is the fitted value of y_t. Rows
 * t < d (too few values to integrate from) are NaN. Input: y the series the model was fitted to,
 * h ≥ 1. Cost O(n·h·r).
 */
export function arimaOriginForecasts(
  fit: Pick<ArimaFit, "ar" | "ma" | "constant"> & { readonly spec: Pick<ArimaSpec, "d"> },
  y: readonly number[],
  h: number,
): number[][] {
  const { d } = fit.spec;
  const s = makeSsm(fit.ar, fit.ma);
  const rows = powersOfT(s, h);
  const states: number[][] = [];
  kalman(difference(y, d).map((v) => v - fit.constant), fit.ar, fit.ma, false, states);
  const delta = d === 0 ? [] : d === 1 ? [1] : [2, -1];
  const out: number[][] = [];
  for (let t = 0; t < y.length; t++) {
    if (t < d) {
      out.push(new Array<number>(h).fill(NaN));
      continue;
    }
    const a = t - 1 - d >= 0 ? states[t - 1 - d] : new Array<number>(s.r).fill(0);
    const hist = y.slice(t - d, t);
    const row: number[] = [];
    for (let j = 1; j <= h; j++) {
      let v = fit.constant;
      for (let k = 0; k < s.r; k++) v += rows[j][k] * (a?.[k] ?? NaN);
      for (let i = 0; i < d; i++) v += delta[i] * hist[hist.length - 1 - i];
      hist.push(v);
      row.push(v);
    }
    out.push(row);
  }
  return out;
}
