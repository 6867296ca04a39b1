/**
 * Ordinary least squares by Householder QR (pure TypeScript; imports only lib/stats and the
 * engine's error type). A design that is rank-deficient or otherwise unusable throws
 * `ForecastInputError` naming the column.
 *
 * The design matrix X (n × p, with a leading column of ones when `intercept` is on) is
 * reduced to Q'X = [R; 0] by p Householder reflections applied in place, and Q'y is formed
 * alongside; β solves Rβ = (Q'y)₁..ₚ by back substitution. The normal equations X'X are
 * never formed, so the condition number is not squared (G. H. Golub 1965, "Numerical methods
 * for solving linear least squares problems", Numer. Math. 7, 206–216; Golub & Van Loan,
 * Matrix Computations, 4th ed., §5.2 and §5.3). Sums of squares come from the components of
 * Q'y: SSE = Σ_{i>p} (Q'y)_i², regression SS = Σ_{1<i≤p} (Q'y)_i² (with an intercept), which
 * avoids the cancellation in SST − SSE.
 *
 * Standard errors: se(β_j) = s·‖row j of R⁻¹‖ since (X'X)⁻¹ = R⁻¹R⁻ᵀ; s² = SSE/(n − p).
 * Prediction intervals (as R's `predict.lm(interval = "prediction")`): ŷ₀ ± t_{n−p,(1+L)/2}·
 * s·√(1 + x₀'(X'X)⁻¹x₀), the leverage computed as ‖R⁻ᵀx₀‖².
 */
import { neumaierSum } from "../stats/sum";
import { studentTQuantile } from "../stats/student-t";
import { ForecastInputError } from "./types";

/**
 * Relative size below which a column's remaining norm after the earlier reflections marks it
 * as a linear combination of the earlier columns (the 1e-7 tolerance of R's `lm`, LINPACK
 * dqrdc2, applied to the column's own norm).
 */
export const RANK_TOLERANCE = 1e-7;

/** Options for {@link ols}. */
export interface OlsOptions {
  /** Add a leading column of ones (default true). */
  readonly intercept?: boolean;
  /** Names of the columns of `columns`, used in messages and results (default x1, x2, …). */
  readonly names?: readonly string[];
}

/** Result of {@link ols}: plain data. Coefficient arrays are in design order (intercept first). */
export interface OlsResult {
  /** Names in design order ("(Intercept)" first when present). */
  readonly names: readonly string[];
  readonly coefficients: readonly number[];
  readonly standardErrors: readonly number[];
  /** t statistics β_j / se(β_j). */
  readonly tValues: readonly number[];
  readonly n: number;
  /** Number of coefficients p (including the intercept). */
  readonly p: number;
  readonly intercept: boolean;
  /** Residual degrees of freedom n − p. */
  readonly dfResidual: number;
  /** Residual standard deviation s = √(SSE/(n − p)). */
  readonly residualSd: number;
  /** Residual sum of squares. */
  readonly sse: number;
  /** Regression (model) sum of squares: about the mean with an intercept, else about 0. */
  readonly ssr: number;
  /** R² = SSR/(SSR + SSE) (centred with an intercept, uncentred without, as R). */
  readonly rSquared: number;
  readonly adjustedRSquared: number;
  /** F statistic (SSR/dfModel)/(SSE/dfResidual); NaN when the model has no regressor. */
  readonly f: number;
  readonly fitted: readonly number[];
  readonly residuals: readonly number[];
  /** Upper-triangular R (p × p, row-major, zeros below the diagonal). */
  readonly r: readonly number[];
}

/**
 * Fits y = Xβ + ε by least squares via Householder QR (see the module comment for the
 * method and its sources).
 *
 * Input: y of length n (finite), `columns` an array of p' explanatory columns each of length
 * n (finite); n must exceed the number of coefficients p = p' (+1 with an intercept).
 * @throws ForecastInputError naming the column when a value is not finite, a column has the wrong
 *   length, there are not more observations than coefficients, or a column is (numerically)
 *   a linear combination of the intercept and earlier columns (relative tolerance
 *   {@link RANK_TOLERANCE}).
 * @example ols([1, 3, 5, 7], [[0, 1, 2, 3]]).coefficients // [1, 2]
 */
export function ols(y: readonly number[], columns: readonly (readonly number[])[], options: OlsOptions = {}): OlsResult {
  const intercept = options.intercept ?? true;
  const n = y.length;
  const xNames = columns.map((_, j) => options.names?.[j] ?? `x${j + 1}`);
  const names = intercept ? ["(Intercept)", ...xNames] : xNames;
  const p = names.length;
  if (p === 0) throw new ForecastInputError("ols: the model has no intercept and no columns");
  y.forEach((v, i) => {
    if (!Number.isFinite(v)) throw new ForecastInputError(`ols: the response at row ${i + 1} is ${v}; values must be finite`);
  });
  columns.forEach((c, j) => {
    if (c.length !== n) {
      throw new ForecastInputError(`ols: column '${xNames[j]}' has ${c.length} values but the response has ${n}`);
    }
    c.forEach((v, i) => {
      if (!Number.isFinite(v)) throw new ForecastInputError(`ols: column '${xNames[j]}' at row ${i + 1} is ${v}; values must be finite`);
    });
  });
  if (n <= p) {
    throw new ForecastInputError(`ols: ${p} coefficients need more than ${p} observations, got ${n}`);
  }
  // Column-major working copy of X and of y.
  const a: Float64Array[] = [];
  if (intercept) a.push(new Float64Array(n).fill(1));
  for (const c of columns) a.push(Float64Array.from(c));
  const qty = Float64Array.from(y);
  const r = new Array<number>(p * p).fill(0);
  for (let j = 0; j < p; j++) {
    const col = a[j];
    const origNorm = scaledNorm(col, 0);
    const norm = scaledNorm(col, j);
    if (!(norm > RANK_TOLERANCE * origNorm) || origNorm === 0) {
      const what = intercept && j === 0 ? "the intercept" : `column '${names[j]}'`;
      const others = names.slice(0, j).filter((nm) => nm !== "(Intercept)");
      const against = intercept ? (others.length ? `the intercept and ${others.map((o) => `'${o}'`).join(", ")}` : "the intercept") : others.map((o) => `'${o}'`).join(", ");
      throw new ForecastInputError(
        origNorm === 0
          ? `ols: ${what} is all zeros; remove it`
          : `ols: ${what} is a linear combination of ${against || "the earlier columns"} (rank-deficient design); remove it or one of those`,
      );
    }
    const alpha = col[j] >= 0 ? -norm : norm;
    // v = x − alpha·e1 (stored in col[j..]), v'v = 2·norm·(norm + |x_j|)
    const v0 = col[j] - alpha;
    const vtv = 2 * norm * (norm + Math.abs(col[j]));
    col[j] = v0;
    const reflect = (target: Float64Array | number[]) => {
      let dot = 0;
      for (let i = j; i < n; i++) dot += col[i] * target[i];
      const f = (2 * dot) / vtv;
      for (let i = j; i < n; i++) target[i] -= f * col[i];
    };
    for (let k = j + 1; k < p; k++) reflect(a[k]);
    reflect(qty);
    r[j * p + j] = alpha;
    for (let k = j + 1; k < p; k++) r[j * p + k] = a[k][j];
  }
  // Back substitution R β = (Q'y)[0..p)
  const beta = new Array<number>(p).fill(0);
  for (let i = p - 1; i >= 0; i--) {
    let s = qty[i];
    for (let k = i + 1; k < p; k++) s -= r[i * p + k] * beta[k];
    beta[i] = s / r[i * p + i];
  }
  const tail: number[] = [];
  for (let i = p; i < n; i++) tail.push(qty[i] * qty[i]);
  const sse = neumaierSum(tail);
  const head: number[] = [];
  for (let i = intercept ? 1 : 0; i < p; i++) head.push(qty[i] * qty[i]);
  const ssr = neumaierSum(head);
  const dfResidual = n - p;
  const s2 = sse / dfResidual;
  const rinv = upperInverse(r, p);
  const standardErrors = beta.map((_, j) => {
    const row: number[] = [];
    for (let k = j; k < p; k++) row.push(rinv[j * p + k] ** 2);
    return Math.sqrt(s2 * neumaierSum(row));
  });
  const fitted = y.map((_, i) => {
    const terms: number[] = [];
    let k = 0;
    if (intercept) terms.push(beta[k++]);
    for (const c of columns) terms.push(beta[k++] * c[i]);
    return neumaierSum(terms);
  });
  const dfModel = intercept ? p - 1 : p;
  const rSquared = ssr / (ssr + sse);
  const dfTotal = intercept ? n - 1 : n;
  return {
    names,
    coefficients: beta,
    standardErrors,
    tValues: beta.map((b, j) => b / standardErrors[j]),
    n,
    p,
    intercept,
    dfResidual,
    residualSd: Math.sqrt(s2),
    sse,
    ssr,
    rSquared,
    adjustedRSquared: 1 - ((1 - rSquared) * dfTotal) / dfResidual,
    f: dfModel > 0 ? ssr / dfModel / s2 : NaN,
    fitted,
    residuals: y.map((v, i) => v - fitted[i]),
    r,
  };
}

/** Euclidean norm of v[from..], scaled to avoid overflow and underflow. */
function scaledNorm(v: ArrayLike<number>, from: number): number {
  let scale = 0;
  for (let i = from; i < v.length; i++) scale = Math.max(scale, Math.abs(v[i]));
  if (scale === 0) return 0;
  const sq: number[] = [];
  for (let i = from; i < v.length; i++) sq.push((v[i] / scale) ** 2);
  return scale * Math.sqrt(neumaierSum(sq));
}

/** Inverse of an upper-triangular p × p matrix (row-major), by back substitution. */
function upperInverse(r: readonly number[], p: number): number[] {
  const inv = new Array<number>(p * p).fill(0);
  for (let j = 0; j < p; j++) {
    inv[j * p + j] = 1 / r[j * p + j];
    for (let i = j - 1; i >= 0; i--) {
      let s = 0;
      for (let k = i + 1; k <= j; k++) s += r[i * p + k] * inv[k * p + j];
      inv[i * p + j] = -s / r[i * p + i];
    }
  }
  return inv;
}

/**
 * Leverage term x₀'(X'X)⁻¹x₀ = ‖R⁻ᵀx₀‖² for a new design row x₀ (intercept entry included),
 * by forward substitution Rᵀz = x₀.
 * @throws ForecastInputError when x₀ has the wrong length.
 */
export function leverage(fit: Pick<OlsResult, "r" | "p">, x0: readonly number[]): number {
  const { r, p } = fit;
  if (x0.length !== p) throw new ForecastInputError(`leverage: the new row has ${x0.length} entries, the model ${p}`);
  const z = new Array<number>(p).fill(0);
  for (let i = 0; i < p; i++) {
    let s = x0[i];
    for (let k = 0; k < i; k++) s -= r[k * p + i] * z[k];
    z[i] = s / r[i * p + i];
  }
  return neumaierSum(z.map((v) => v * v));
}

/** Point prediction and prediction interval for new rows, from {@link olsPredict}. */
export interface OlsPrediction {
  readonly mean: readonly number[];
  /** Standard deviation of the prediction error s·√(1 + leverage). */
  readonly sd: readonly number[];
  readonly levels: readonly number[];
  readonly lower: Readonly<Record<string, readonly number[]>>;
  readonly upper: Readonly<Record<string, readonly number[]>>;
}

/**
 * Predictions with prediction intervals for new values of the explanatory columns, as R's
 * `predict.lm(fit, newdata, interval = "prediction", level = L/100)`:
 * ŷ₀ ± t_{n−p}((1 + L/100)/2) · s · √(1 + x₀'(X'X)⁻¹x₀).
 *
 * @param newColumns one array per explanatory column (same order as in {@link ols}), each of
 *   the same length (the number of new rows); the intercept is added when the fit has one.
 * @param levels interval levels in percent, each in (0, 100).
 * @throws ForecastInputError for a wrong number or length of columns, a non-finite value (naming
 *   the column and row), or a level outside (0, 100).
 */
export function olsPredict(
  fit: OlsResult,
  newColumns: readonly (readonly number[])[],
  levels: readonly number[] = [80, 95],
): OlsPrediction {
  const k = fit.intercept ? fit.p - 1 : fit.p;
  const colNames = fit.intercept ? fit.names.slice(1) : fit.names;
  if (newColumns.length !== k) {
    throw new ForecastInputError(`olsPredict: the model has ${k} explanatory column(s), got ${newColumns.length}`);
  }
  const h = k > 0 ? newColumns[0].length : 0;
  newColumns.forEach((c, j) => {
    if (c.length !== h) throw new ForecastInputError(`olsPredict: column '${colNames[j]}' has ${c.length} new values, expected ${h}`);
    c.forEach((v, i) => {
      if (!Number.isFinite(v)) throw new ForecastInputError(`olsPredict: column '${colNames[j]}' at new row ${i + 1} is ${v}; values must be finite`);
    });
  });
  for (const lv of levels) {
    if (!(lv > 0 && lv < 100)) throw new ForecastInputError(`olsPredict: interval levels must be percentages between 0 and 100, got ${lv}`);
  }
  const mean: number[] = [];
  const sd: number[] = [];
  for (let i = 0; i < h; i++) {
    const x0 = fit.intercept ? [1, ...newColumns.map((c) => c[i])] : newColumns.map((c) => c[i]);
    mean.push(neumaierSum(x0.map((v, j) => v * fit.coefficients[j])));
    sd.push(fit.residualSd * Math.sqrt(1 + leverage(fit, x0)));
  }
  const lower: Record<string, number[]> = {};
  const upper: Record<string, number[]> = {};
  for (const lv of levels) {
    const t = studentTQuantile(0.5 + lv / 200, fit.dfResidual);
    lower[String(lv)] = mean.map((m, i) => m - t * sd[i]);
    upper[String(lv)] = mean.map((m, i) => m + t * sd[i]);
  }
  return { mean, sd, levels: [...levels], lower, upper };
}

export default ols;
