/**
 * The Bass diffusion model of new-product adoption (docs/methods.md §19). Pure TypeScript.
 *
 * With p the coefficient of innovation, q of imitation and m the market potential, the share of
 * the market that has adopted by time t (in periods since launch) is
 *   F(t) = (1 − e^{−(p+q)t}) / (1 + (q/p)·e^{−(p+q)t})            (Bass 1969, Management Science 15(5))
 * and adoptions in period t are m·(F(t) − F(t−1)), the discrete form fitted by nonlinear least
 * squares in Srinivasan & Mason (1986, Marketing Science 5(2)). The peak of the adoption density
 * is at t* = ln(q/p)/(p + q) when q > p (otherwise adoption falls from launch).
 *
 * Policy: every function here takes finite numbers; p must be > 0, q ≥ 0, m > 0 and t ≥ 0,
 * otherwise a RangeError says which value is wrong. A history must be non-negative adoptions per
 * period with at least MIN_PERIODS values and a positive total.
 */
import { studentTQuantile } from "../stats/student-t";

/** Fewest periods a fit accepts: three parameters and two degrees of freedom for the error. */
export const MIN_PERIODS = 5;

/** Periods before the peak below which a fit is unstable (common practice, about 5–6). */
export const STABLE_PERIODS_BEFORE_PEAK = 6;

/** Bass parameters: innovation p, imitation q, market potential m. */
export interface BassParameters {
  readonly p: number;
  readonly q: number;
  readonly m: number;
}

function checkPq(p: number, q: number): void {
  if (!(Number.isFinite(p) && p > 0)) throw new RangeError(`Bass: p must be a positive number (got ${p})`);
  if (!(Number.isFinite(q) && q >= 0)) throw new RangeError(`Bass: q must be a non-negative number (got ${q})`);
}

/**
 * F(t), the cumulative share adopted by time t (closed form above).
 * @throws RangeError for p ≤ 0, q < 0, t < 0 or a non-finite value.
 */
export function bassShare(t: number, p: number, q: number): number {
  checkPq(p, q);
  if (!(Number.isFinite(t) && t >= 0)) throw new RangeError(`Bass: t must be ≥ 0 (got ${t})`);
  const e = Math.exp(-(p + q) * t);
  return (1 - e) / (1 + (q / p) * e);
}

/** F(t) and its partial derivatives in p and q (quotient rule on the closed form). */
function shareWithGradient(t: number, p: number, q: number): [number, number, number] {
  const s = p + q;
  const e = Math.exp(-s * t);
  const num = 1 - e;
  const den = 1 + (q / p) * e;
  const dNum = t * e; // ∂(1 − e)/∂p = ∂/∂q = t·e
  const dDenP = (-q / (p * p)) * e - (q / p) * t * e;
  const dDenQ = e / p - (q / p) * t * e;
  const f = num / den;
  return [f, (dNum * den - num * dDenP) / (den * den), (dNum * den - num * dDenQ) / (den * den)];
}

/**
 * Expected adoptions in periods from..to (1-based, since launch): m·(F(t) − F(t−1)) each.
 * @throws RangeError for bad parameters or from < 1, to < from.
 */
export function bassAdoptions(par: BassParameters, from: number, to: number): number[] {
  checkPq(par.p, par.q);
  if (!(Number.isInteger(from) && Number.isInteger(to) && from >= 1 && to >= from)) {
    throw new RangeError(`Bass: periods must run from 1 upward (got ${from}..${to})`);
  }
  const out: number[] = [];
  let prev = bassShare(from - 1, par.p, par.q);
  for (let t = from; t <= to; t++) {
    const f = bassShare(t, par.p, par.q);
    out.push(par.m * (f - prev));
    prev = f;
  }
  return out;
}

/** Peak time t* = ln(q/p)/(p+q); 0 when q ≤ p (adoption is highest at launch). */
export function bassPeak(p: number, q: number): number {
  checkPq(p, q);
  return q > p ? Math.log(q / p) / (p + q) : 0;
}

/** Row t−1 of the Jacobian of m·(F(t) − F(t−1)) in (p, q, m), and the model value. */
function jacobianRow(t: number, p: number, q: number, m: number): [number, number, number, number] {
  const [f1, fp1, fq1] = shareWithGradient(t, p, q);
  const [f0, fp0, fq0] = shareWithGradient(t - 1, p, q);
  return [m * (f1 - f0), m * (fp1 - fp0), m * (fq1 - fq0), f1 - f0];
}

/** Solves the 3×3 system a·x = b by Gaussian elimination with partial pivoting; null if singular. */
function solve3(a: number[][], b: number[]): number[] | null {
  const m = a.map((row, i) => [...row, b[i]]);
  for (let c = 0; c < 3; c++) {
    let piv = c;
    for (let r = c + 1; r < 3; r++) if (Math.abs(m[r][c]) > Math.abs(m[piv][c])) piv = r;
    if (!(Math.abs(m[piv][c]) > 0)) return null;
    [m[c], m[piv]] = [m[piv], m[c]];
    for (let r = c + 1; r < 3; r++) {
      const k = m[r][c] / m[c][c];
      for (let j = c; j < 4; j++) m[r][j] -= k * m[c][j];
    }
  }
  const x = [0, 0, 0];
  for (let r = 2; r >= 0; r--) {
    let v = m[r][3];
    for (let j = r + 1; j < 3; j++) v -= m[r][j] * x[j];
    x[r] = v / m[r][r];
  }
  return x;
}

function inverse3(a: number[][]): number[][] | null {
  const cols = [0, 1, 2].map((k) => solve3(a, [0, 1, 2].map((i) => (i === k ? 1 : 0))));
  if (cols.some((c) => c === null || c.some((v) => !Number.isFinite(v)))) return null;
  return [0, 1, 2].map((i) => [0, 1, 2].map((j) => (cols[j] as number[])[i]));
}

/** A fitted Bass model: estimates, their covariance and the fit's residual variance. */
export interface BassFit extends BassParameters {
  /** Residual variance s² = SSE/(n − 3). */
  readonly sigma2: number;
  readonly sse: number;
  readonly n: number;
  /** Covariance of (p, q, m): s²·(JᵀJ)⁻¹ at the estimates, as R's `vcov(nls(...))`. */
  readonly covariance: readonly (readonly number[])[];
  /** Standard errors of p, q, m. */
  readonly se: BassParameters;
  /** Expected adoptions in the fitted periods. */
  readonly fitted: readonly number[];
  /** Estimated peak period t* and how many observed periods lie before it. */
  readonly peak: number;
  readonly periodsBeforePeak: number;
  /** Notes for people: instability cautions, start values used. */
  readonly notes: readonly string[];
}

function sse(y: readonly number[], p: number, q: number, m: number): number {
  let s = 0;
  let prev = 0;
  for (let t = 1; t <= y.length; t++) {
    const f = bassShare(t, p, q);
    s += (y[t - 1] - m * (f - prev)) ** 2;
    prev = f;
  }
  return s;
}

/**
 * Start values from Bass's (1969) own estimator: ordinary least squares of
 * y_t = a + b·Y_{t−1} + c·Y_{t−1}² (Y cumulative), m = (−b − √(b² − 4ac))/(2c), p = a/m,
 * q = −c·m; null when the regression gives no valid (p, q, m).
 */
function bassOlsStart(y: readonly number[]): BassParameters | null {
  const n = y.length;
  const rows: number[][] = [];
  let cum = 0;
  for (let t = 0; t < n; t++) {
    rows.push([1, cum, cum * cum]);
    cum += y[t];
  }
  const xtx = [0, 1, 2].map((i) => [0, 1, 2].map((j) => rows.reduce((s, r) => s + r[i] * r[j], 0)));
  const xty = [0, 1, 2].map((i) => rows.reduce((s, r, t) => s + r[i] * y[t], 0));
  const beta = solve3(xtx, xty);
  if (!beta) return null;
  const [a, b, c] = beta;
  const disc = b * b - 4 * a * c;
  if (!(c < 0 && disc >= 0)) return null;
  const m = (-b - Math.sqrt(disc)) / (2 * c);
  const p = a / m;
  const q = -c * m;
  return m > 0 && p > 0 && q >= 0 && Number.isFinite(m + p + q) ? { p, q, m } : null;
}

/**
 * Levenberg–Marquardt from one start (Marquardt 1963, SIAM J. Appl. Math. 11(2)): steps solve
 * (JᵀJ + λ·diag(JᵀJ))δ = Jᵀr, accepted when the SSE falls and (p, q, m) stay valid.
 */
function levenbergMarquardt(y: readonly number[], start: BassParameters): { par: BassParameters; sse: number } {
  let { p, q, m } = start;
  let cur = sse(y, p, q, m);
  let lambda = 1e-3;
  for (let iter = 0; iter < 500; iter++) {
    const jtj = [[0, 0, 0], [0, 0, 0], [0, 0, 0]];
    const jtr = [0, 0, 0];
    for (let t = 1; t <= y.length; t++) {
      const [g, dp, dq, dm] = jacobianRow(t, p, q, m);
      const row = [dp, dq, dm];
      const r = y[t - 1] - g;
      for (let i = 0; i < 3; i++) {
        jtr[i] += row[i] * r;
        for (let j = 0; j < 3; j++) jtj[i][j] += row[i] * row[j];
      }
    }
    let improved = false;
    while (lambda < 1e12) {
      const a = jtj.map((row, i) => row.map((v, j) => (i === j ? v * (1 + lambda) : v)));
      const d = solve3(a, jtr);
      if (d) {
        const np = p + d[0];
        const nq = q + d[1];
        const nm = m + d[2];
        if (np > 0 && nq >= 0 && nm > 0) {
          const next = sse(y, np, nq, nm);
          if (next < cur) {
            const rel = (cur - next) / Math.max(cur, 1e-300);
            const small = Math.abs(d[0]) <= 1e-12 * p && Math.abs(d[1]) <= 1e-12 * Math.max(q, 1e-12) && Math.abs(d[2]) <= 1e-12 * m;
            p = np;
            q = nq;
            m = nm;
            cur = next;
            lambda = Math.max(lambda / 10, 1e-12);
            improved = true;
            if (rel < 1e-15 || small) return { par: { p, q, m }, sse: cur };
            break;
          }
        }
      }
      lambda *= 10;
    }
    if (!improved) break;
  }
  return { par: { p, q, m }, sse: cur };
}

/**
 * Fits the Bass model to adoptions per period (period 1 = the first period after launch) by
 * nonlinear least squares on the discrete form m·(F(t) − F(t−1)) (Srinivasan & Mason 1986),
 * from Bass's OLS start and from p = 0.03, q = 0.38 (typical values, Sultan, Farley & Lehmann
 * 1990) with m = 1.1, 2 and 4 times the total so far; the smallest SSE wins. Standard errors
 * are the usual asymptotic ones, s²(JᵀJ)⁻¹ (Seber & Wild 1989, §2.1), as R's `nls` reports.
 * @throws RangeError for fewer than MIN_PERIODS values, a negative or non-finite value, or a
 *   zero total.
 */
export function fitBass(y: readonly number[]): BassFit {
  if (y.length < MIN_PERIODS) throw new RangeError(`Bass: needs at least ${MIN_PERIODS} periods of adoptions (got ${y.length})`);
  y.forEach((v, i) => {
    if (!(Number.isFinite(v) && v >= 0)) throw new RangeError(`Bass: adoptions must be non-negative numbers (period ${i + 1} is ${v})`);
  });
  const total = y.reduce((a, v) => a + v, 0);
  if (!(total > 0)) throw new RangeError("Bass: the adoptions add up to zero, so there is nothing to fit");
  const starts: BassParameters[] = [1.1, 2, 4].map((k) => ({ p: 0.03, q: 0.38, m: k * total }));
  const ols = bassOlsStart(y);
  if (ols) starts.unshift(ols);
  let best = levenbergMarquardt(y, starts[0]);
  for (const s of starts.slice(1)) {
    const r = levenbergMarquardt(y, s);
    if (r.sse < best.sse) best = r;
  }
  const { p, q, m } = best.par;
  const n = y.length;
  const sigma2 = best.sse / (n - 3);
  const jtj = [[0, 0, 0], [0, 0, 0], [0, 0, 0]];
  const fitted: number[] = [];
  for (let t = 1; t <= n; t++) {
    const [g, dp, dq, dm] = jacobianRow(t, p, q, m);
    fitted.push(g);
    const row = [dp, dq, dm];
    for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) jtj[i][j] += row[i] * row[j];
  }
  const inv = inverse3(jtj);
  const covariance = inv ? inv.map((row) => row.map((v) => v * sigma2)) : [[NaN, NaN, NaN], [NaN, NaN, NaN], [NaN, NaN, NaN]];
  const peak = bassPeak(p, q);
  const periodsBeforePeak = Math.min(n, Math.floor(peak));
  const notes: string[] = [];
  if (periodsBeforePeak < STABLE_PERIODS_BEFORE_PEAK) {
    notes.push(
      `the history has ${periodsBeforePeak} period${periodsBeforePeak === 1 ? "" : "s"} before the fitted peak (period ${peak.toFixed(1)}); ` +
        `a diffusion fit on fewer than about ${STABLE_PERIODS_BEFORE_PEAK} is unstable (common practice), so read p, q and m with their standard errors`,
    );
  }
  if (peak > n) {
    notes.push(`the history ends before the fitted peak (period ${peak.toFixed(1)}), so the peak and the market potential m are extrapolated`);
  }
  if (!inv) notes.push("the fit's parameters are not separately identified (singular JᵀJ); no standard errors");
  return {
    p,
    q,
    m,
    sigma2,
    sse: best.sse,
    n,
    covariance,
    se: { p: Math.sqrt(covariance[0][0]), q: Math.sqrt(covariance[1][1]), m: Math.sqrt(covariance[2][2]) },
    fitted,
    peak,
    periodsBeforePeak,
    notes,
  };
}

/** Mean, sd and bounds by level of one forecast quantity. */
export interface BassQuantity {
  readonly mean: number;
  readonly sd: number;
  readonly lower: Record<string, number>;
  readonly upper: Record<string, number>;
}

/**
 * The forecast of a sum of future adoptions Σ_{t∈T} m(F(t) − F(t−1)) from a fit, with its
 * prediction interval: variance |T|·s² (independent period errors) + gᵀCg (parameter
 * uncertainty by the delta method, g the gradient of the sum, C the fit's covariance), bounds
 * from Student's t with n − 3 degrees of freedom (Seber & Wild 1989, §5.1), the lower one held at
 * 0 since adoptions cannot be negative. `periods` are 1-based periods since launch.
 */
export function bassForecastSum(fit: BassFit, periods: readonly number[], levels: readonly number[]): BassQuantity {
  let mean = 0;
  const g = [0, 0, 0];
  for (const t of periods) {
    const [v, dp, dq, dm] = jacobianRow(t, fit.p, fit.q, fit.m);
    mean += v;
    g[0] += dp;
    g[1] += dq;
    g[2] += dm;
  }
  let paramVar = 0;
  for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) paramVar += g[i] * fit.covariance[i][j] * g[j];
  const variance = periods.length * fit.sigma2 + (Number.isFinite(paramVar) ? paramVar : 0);
  const sd = Math.sqrt(variance);
  const lower: Record<string, number> = {};
  const upper: Record<string, number> = {};
  for (const lv of levels) {
    const k = studentTQuantile(0.5 + lv / 200, fit.n - 3) * sd;
    lower[String(lv)] = Math.max(0, mean - k);
    upper[String(lv)] = mean + k;
  }
  return { mean, sd, lower, upper };
}
