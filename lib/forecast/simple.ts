/**
 * Shared pieces of the simple baseline methods (naive, seasonal naive, drift, moving
 * averages, linear trend, regression): input checks, normal and t intervals, and the
 * trailing-window machinery of the two moving averages. Pure TypeScript; imports lib/stats.
 */
import { neumaierSum } from "../stats/sum";
import { normalQuantile } from "../stats/normal";
import { studentTQuantile } from "../stats/student-t";
import { ForecastInputError, type Fit, type Forecast, type MethodId } from "./types";
import { leverage, ols, type OlsResult } from "./ols";

/** Largest horizon a simple method will forecast (an absurd horizon is refused). */
export const SIMPLE_MAX_HORIZON = 10000;

/**
 * Checks a series for fitting (every method's one check).
 * @throws ForecastInputError when the series is empty, a value is not finite (naming its
 *   position) or the series is shorter than `minLength` (saying how many are needed).
 */
export function checkSeriesFor(method: string, y: readonly number[], minLength: number, why = ""): void {
  if (!Array.isArray(y) || y.length === 0) throw new ForecastInputError(`${method}: the series is empty`);
  y.forEach((v, i) => {
    if (typeof v !== "number" || !Number.isFinite(v)) {
      throw new ForecastInputError(`${method}: observation ${i + 1} is not a finite number (${String(v)})`);
    }
  });
  if (y.length < minLength) {
    throw new ForecastInputError(
      `${method} needs at least ${minLength} observations${why ? ` (${why})` : ""}, got ${y.length}`,
    );
  }
}

/**
 * Checks a horizon and interval levels.
 * @throws ForecastInputError for a horizon that is not a whole number in 1..SIMPLE_MAX_HORIZON
 *   or a level outside (0, 100).
 */
export function checkForecastArgs(method: string, h: number, levels: readonly number[]): void {
  if (!Number.isInteger(h) || h < 1) {
    throw new ForecastInputError(`${method}: the horizon must be a whole number of steps, at least 1 (got ${h})`);
  }
  if (h > SIMPLE_MAX_HORIZON) {
    throw new ForecastInputError(`${method}: the horizon ${h} is beyond the ${SIMPLE_MAX_HORIZON} steps allowed`);
  }
  for (const lv of levels) {
    if (typeof lv !== "number" || !(lv > 0 && lv < 100)) {
      throw new ForecastInputError(`${method}: interval levels must be percentages between 0 and 100 (got ${String(lv)})`);
    }
  }
}

/** Mean ± z·sd bounds with z = Φ⁻¹(½ + L/200) for each level L (normal intervals). */
export function normalForecast(method: MethodId, mean: readonly number[], sd: readonly number[], levels: readonly number[]): Forecast {
  const lower: Record<string, number[]> = {};
  const upper: Record<string, number[]> = {};
  for (const lv of levels) {
    const z = normalQuantile(0.5 + lv / 200);
    lower[String(lv)] = mean.map((m, i) => m - z * sd[i]);
    upper[String(lv)] = mean.map((m, i) => m + z * sd[i]);
  }
  return { method, mean: [...mean], levels: [...levels], lower, upper, sd: [...sd] };
}

/** Sum of squares of the finite entries and their count. */
export function squaredErrors(residuals: readonly number[]): { sse: number; count: number } {
  const sq = residuals.filter((r) => Number.isFinite(r)).map((r) => r * r);
  return { sse: sq.length ? neumaierSum(sq) : 0, count: sq.length };
}

/** Builds a Fit, computing residuals and SSE from the fitted values. */
export function makeFit(
  method: MethodId,
  y: readonly number[],
  season: number,
  fitted: readonly number[],
  parameters: Record<string, number>,
  state: Record<string, number | readonly number[]>,
  sigma2: number,
  notes: string[] = [],
): Fit {
  const residuals = y.map((v, i) => (Number.isFinite(fitted[i]) ? v - fitted[i] : NaN));
  return {
    method,
    parameters,
    state,
    fitted: [...fitted],
    residuals,
    sigma2,
    n: y.length,
    season,
    sse: squaredErrors(residuals).sse,
    notes,
  };
}

// ---------------------------------------------------------------------------------------
// Trailing-window averages (moving-average and weighted-moving-average)

/** Largest window tried when the window is estimated: max(12, season), capped by the data. */
export const MAX_WINDOW = 12;
/** Smallest window tried when estimated (window 1 would be the naive method). */
export const MIN_WINDOW = 2;

/** Normalised weights for a window of k, oldest first (w[k−1] multiplies the latest value). */
export type WeightScheme = (k: number) => number[];

/** Equal weights 1/k. */
export const equalWeights: WeightScheme = (k) => Array<number>(k).fill(1 / k);

/** Linearly declining weights k, k−1, …, 1 (latest first) over k(k+1)/2; returned oldest first. */
export const linearWeights: WeightScheme = (k) => {
  const s = (k * (k + 1)) / 2;
  return Array.from({ length: k }, (_, i) => (i + 1) / s);
};

/** One-step trailing-average fitted values: fitted[t] = Σ w_i·y[t−k+i], t ≥ k; NaN before. */
export function trailingFitted(y: readonly number[], w: readonly number[]): number[] {
  const k = w.length;
  return y.map((_, t) => (t < k ? NaN : neumaierSum(w.map((wi, i) => wi * y[t - k + i]))));
}

/**
 * Random-walk variance factor c = Σ_{i=0}^{k−2} (Σ_{j>i} ω_j)², with ω_j the weight on
 * y_{n−j} (latest j = 0). If y is a random walk with innovation variance q, the error of the
 * trailing average ŷ = Σ ω_j y_{n−j} at horizon h is (y_{n+h} − y_n) + Σ_j ω_j (y_n − y_{n−j}),
 * two independent parts with variances h·q and c·q; so Var_h = q·(h + c). For equal weights
 * c = (k − 1)(2k − 1)/(6k).
 */
export function randomWalkFactor(w: readonly number[]): number {
  const k = w.length;
  const latestFirst = [...w].reverse();
  const terms: number[] = [];
  for (let i = 0; i < k - 1; i++) {
    let tail = 0;
    for (let j = i + 1; j < k; j++) tail += latestFirst[j];
    terms.push(tail * tail);
  }
  return terms.length ? neumaierSum(terms) : 0;
}

/**
 * Fits a trailing-window average: the window is `fixed.window` if given, else the k in
 * MIN_WINDOW..min(max(MAX_WINDOW, season), n − 2) with the smallest one-step in-sample MSE,
 * all windows scored on the same points t ≥ K (largest window tried) so the comparison is
 * fair; ties go to the smaller window. σ² = mean squared one-step error of the chosen window
 * over every point it can forecast (t ≥ k).
 */
export function fitTrailing(
  method: MethodId,
  label: string,
  scheme: WeightScheme,
  y: readonly number[],
  season: number,
  fixed: Readonly<Record<string, number>> | undefined,
): Fit {
  const notes: string[] = [];
  let k: number;
  const given = fixed?.window;
  if (given !== undefined) {
    if (!Number.isInteger(given) || given < 1) {
      throw new ForecastInputError(`${label}: the window must be a whole number of at least 1 (got ${given})`);
    }
    checkSeriesFor(label, y, given + 1, `a window of ${given} plus one value to check it against`);
    k = given;
  } else {
    checkSeriesFor(label, y, MIN_WINDOW + 2, "to estimate the window from at least two one-step errors");
    const kMax = Math.max(MIN_WINDOW, Math.min(Math.max(MAX_WINDOW, season), y.length - 2));
    let best = NaN;
    k = MIN_WINDOW;
    for (let cand = MIN_WINDOW; cand <= kMax; cand++) {
      const f = trailingFitted(y, scheme(cand));
      const sq: number[] = [];
      for (let t = kMax; t < y.length; t++) sq.push((y[t] - f[t]) ** 2);
      const mse = neumaierSum(sq) / sq.length;
      if (Number.isNaN(best) || mse < best * (1 - 1e-12)) {
        best = mse;
        k = cand;
      }
    }
    notes.push(`window ${k} chosen by one-step in-sample MSE over windows ${MIN_WINDOW}..${kMax}`);
  }
  const w = scheme(k);
  const fitted = trailingFitted(y, w);
  const residuals = y.map((v, t) => v - fitted[t]);
  const { sse, count } = squaredErrors(residuals);
  const sigma2 = sse / count;
  return makeFit(
    method,
    y,
    season,
    fitted,
    { window: k },
    { lastValues: y.slice(y.length - k), weights: w, randomWalkFactor: randomWalkFactor(w) },
    sigma2,
    notes,
  );
}

/**
 * Forecast of a trailing-window average: the same value Σ w_i·y_{n−k+1+i} at every step,
 * sd_h = √(σ² · (h + c)/(1 + c)) with c from {@link randomWalkFactor} (the random-walk
 * growth calibrated so that sd_1² equals the empirical one-step σ²).
 */
export function forecastTrailing(method: MethodId, label: string, fit: Fit, h: number, levels: readonly number[]): Forecast {
  checkForecastArgs(label, h, levels);
  const last = fit.state.lastValues as readonly number[];
  const w = fit.state.weights as readonly number[];
  const c = fit.state.randomWalkFactor as number;
  const value = neumaierSum(w.map((wi, i) => wi * last[i]));
  const mean = Array<number>(h).fill(value);
  const sd = mean.map((_, i) => Math.sqrt((fit.sigma2 * (i + 1 + c)) / (1 + c)));
  return normalForecast(method, mean, sd, levels);
}

// ---------------------------------------------------------------------------------------
// Lag walks (naive, seasonal naive, drift)

/**
 * Fits a lag walk: ŷ_t = y_{t−lag} (+ b). Without drift σ² = mean of the n − lag squared
 * residuals; with drift b = mean of the lag differences (y_n − y_1)/(n − 1) for lag 1, its
 * standard error s/√(n − lag) and σ² = s² = Σ(residual²)/(n − lag − 1), as R's
 * `forecast:::lagwalk` (forecast 8.20) and FPP §5.2/§5.5.
 */
export function fitLagWalk(
  method: MethodId,
  y: readonly number[],
  lag: number,
  season: number,
  drift: boolean,
  fixedDrift?: number,
): Fit {
  const n = y.length;
  const diffs: number[] = [];
  for (let t = lag; t < n; t++) diffs.push(y[t] - y[t - lag]);
  let b = 0;
  let bSe = 0;
  const estimated = drift && fixedDrift === undefined;
  if (drift) b = fixedDrift ?? neumaierSum(diffs) / diffs.length;
  const fitted = y.map((_, t) => (t < lag ? NaN : y[t - lag] + b));
  const res = diffs.map((d) => d - b);
  const { sse, count } = squaredErrors(res);
  const sigma2 = sse / (count - (estimated ? 1 : 0));
  if (estimated) bSe = Math.sqrt(sigma2 / count);
  const parameters: Record<string, number> = drift ? { drift: b } : {};
  return makeFit(method, y, season, fitted, parameters, { lastValues: y.slice(n - lag), drift: b, driftSe: bSe }, sigma2);
}

/**
 * Forecasts of a lag walk: ŷ_{n+h} = y_{n+h−lag·k} + k·b with k = ⌊(h − 1)/lag⌋ + 1, and
 * sd_h = √(σ²·k + (k·se_b)²): FPP §5.5 table (naive σ√h, seasonal naive σ√(k), drift
 * σ√(h(1 + h/T))), in the exact form R's `forecast:::forecast.lagwalk` uses.
 */
export function forecastLagWalk(method: MethodId, label: string, fit: Fit, h: number, levels: readonly number[]): Forecast {
  checkForecastArgs(label, h, levels);
  const last = fit.state.lastValues as readonly number[];
  const lag = last.length;
  const b = fit.state.drift as number;
  const bSe = fit.state.driftSe as number;
  const mean: number[] = [];
  const sd: number[] = [];
  for (let i = 0; i < h; i++) {
    const k = Math.floor(i / lag) + 1;
    mean.push(last[i % lag] + k * b);
    sd.push(Math.sqrt(fit.sigma2 * k + (k * bSe) ** 2));
  }
  return normalForecast(method, mean, sd, levels);
}

// ---------------------------------------------------------------------------------------
// Ordinary least squares methods (linear-trend, regression)

/**
 * Fits y = β₀ + Σ_j β_j·x_j + ε by OLS (lib/forecast/ols.ts), holding any coefficient given
 * in `fixed` (under its name in `paramNames`, design order: intercept first) at that value:
 * the fixed part is subtracted from y and the free coefficients are estimated on the rest.
 * With every coefficient fixed, σ̂² = SSE/n (n degrees of freedom, no estimation error in the
 * mean). The fit's state keeps what {@link forecastLinearModel} needs: all coefficients, the
 * mask of free ones, the R factor of the free design, the residual SD and its df.
 *
 * @throws ForecastInputError for non-finite or unusable input, naming the column.
 */
export function fitLinearModel(
  method: MethodId,
  y: readonly number[],
  season: number,
  columns: readonly (readonly number[])[],
  columnNames: readonly string[],
  paramNames: readonly string[],
  fixed: Readonly<Record<string, number>> | undefined,
): Fit {
  const p = columns.length + 1;
  const given = paramNames.map((nm) => fixed?.[nm]);
  given.forEach((v, j) => {
    if (v !== undefined && !Number.isFinite(v)) {
      throw new ForecastInputError(`${method}: a fixed ${paramNames[j]} must be a finite number (got ${v})`);
    }
  });
  const free = given.map((v) => v === undefined);
  const n = y.length;
  const offset = y.map((_, i) =>
    neumaierSum(given.map((v, j) => (v === undefined ? 0 : v * (j === 0 ? 1 : columns[j - 1][i])))),
  );
  const target = y.map((v, i) => v - offset[i]);
  const freeCols = columns.filter((_, j) => free[j + 1]);
  const freeNames = columnNames.filter((_, j) => free[j + 1]);
  const coefficients = given.map((v) => v ?? NaN);
  let r: readonly number[] = [];
  let pFree = 0;
  let dfResidual = n;
  let residualSd: number;
  let fitted: number[];
  if (free.some((f) => f)) {
    let fit: OlsResult;
    try {
      fit = ols(target, freeCols, { intercept: free[0], names: freeNames });
    } catch (e) {
      if (e instanceof ForecastInputError) throw new ForecastInputError(`${method}: ${e.message.replace(/^ols: /, "")}`);
      throw e;
    }
    let k = 0;
    free.forEach((f, j) => {
      if (f) coefficients[j] = fit.coefficients[k++];
    });
    r = fit.r;
    pFree = fit.p;
    dfResidual = fit.dfResidual;
    residualSd = fit.residualSd;
    fitted = fit.fitted.map((v, i) => v + offset[i]);
  } else {
    fitted = offset;
    residualSd = Math.sqrt(squaredErrors(y.map((v, i) => v - offset[i])).sse / n);
  }
  const parameters: Record<string, number> = {};
  paramNames.forEach((nm, j) => (parameters[nm] = coefficients[j]));
  return {
    ...makeFit(
      method,
      y,
      season,
      fitted,
      parameters,
      { coefficients, free: free.map((f) => (f ? 1 : 0)), r, p: pFree, dfResidual, residualSd },
      residualSd ** 2,
      free.every((f) => f) ? [] : [`held fixed: ${paramNames.filter((_, j) => !free[j]).join(", ")}`],
    ),
    xNames: columnNames,
  };
}

/**
 * Forecasts of a {@link fitLinearModel} fit for future explanatory values (one array per
 * column, h values each): ŷ₀ = x₀'β and bounds ŷ₀ ± t_{df}((1 + L/100)/2)·s·√(1 + x_f'(X_f'X_f)⁻¹x_f)
 * with x_f the free part of x₀ — R's `predict.lm(interval = "prediction")` when nothing is fixed.
 */
export function forecastLinearModel(method: MethodId, fit: Fit, future: readonly (readonly number[])[], h: number, levels: readonly number[]): Forecast {
  const st = fit.state;
  const beta = st.coefficients as readonly number[];
  const free = st.free as readonly number[];
  const pFree = st.p as number;
  const s = st.residualSd as number;
  const df = st.dfResidual as number;
  const mean: number[] = [];
  const sd: number[] = [];
  for (let i = 0; i < h; i++) {
    const x0 = [1, ...future.map((c) => c[i])];
    mean.push(neumaierSum(x0.map((v, j) => v * beta[j])));
    const xf = x0.filter((_, j) => free[j] === 1);
    sd.push(pFree > 0 ? s * Math.sqrt(1 + leverage({ r: st.r as readonly number[], p: pFree }, xf)) : s);
  }
  const lower: Record<string, number[]> = {};
  const upper: Record<string, number[]> = {};
  for (const lv of levels) {
    const t = studentTQuantile(0.5 + lv / 200, df);
    lower[String(lv)] = mean.map((m, i) => m - t * sd[i]);
    upper[String(lv)] = mean.map((m, i) => m + t * sd[i]);
  }
  return { method, mean, levels: [...levels], lower, upper, sd };
}
