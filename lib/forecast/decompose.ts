/**
 * Classical decomposition, the sample autocorrelation function and the seasonal adjustment built
 * on them (pure TypeScript). Shared by the Theta and ARIMA methods and by the start values of
 * the Holt-Winters methods.
 */
import { normalQuantile } from "../stats/normal";

/** Level of the one-sided seasonality test on the lag-m autocorrelation (R forecast::thetaf: 90%, i.e. qnorm(0.95)). */
export const SEASONAL_TEST_PROBABILITY = 0.95;
/** Seasonal indices below this (in absolute value) make the adjustment unsafe (thetaf's rule). */
export const MIN_SEASONAL_INDEX = 1e-4;

/** Result of {@link classicalDecomposition}. */
export interface Decomposition {
  /** Centred moving-average trend; NaN where the window does not fit (first and last ⌊m/2⌋). */
  readonly trend: number[];
  /** Seasonal component for every observation (ratio for "multiplicative", offset for "additive"). */
  readonly seasonal: number[];
  /** One seasonal figure per position in the cycle, counted from the first observation. */
  readonly figure: number[];
}

/**
 * Classical decomposition by moving averages.
 *
 * Definition: trend T_t = centred moving average of order m (a 2×m MA when m is even, i.e.
 * weights ½, 1, …, 1, ½ over m + 1 points, divided by m); detrended values y_t/T_t
 * (multiplicative) or y_t − T_t (additive); the seasonal figure of cycle position i is the
 * mean of the detrended values at that position (positions counted from the first
 * observation), then normalised to average 1 (multiplicative) or 0 (additive).
 * Source: Kendall & Stuart (1983) / Makridakis, Wheelwright & Hyndman (1998) "Forecasting:
 * methods and applications" ch. 3; this is the arithmetic of R's `stats::decompose`.
 *
 * Input: y finite, m integer ≥ 2, y.length ≥ 2m. Complexity O(n·m).
 * @throws RangeError for m < 2, a non-integer m, or fewer than 2m observations.
 * A position whose detrended values are all unavailable gets the neutral figure (1 or 0).
 */
export function classicalDecomposition(
  y: readonly number[],
  m: number,
  type: "additive" | "multiplicative",
): Decomposition {
  const n = y.length;
  if (!Number.isInteger(m) || m < 2) throw new RangeError("classicalDecomposition: season length must be an integer ≥ 2");
  if (n < 2 * m) throw new RangeError(`classicalDecomposition: season length ${m} needs at least ${2 * m} observations`);
  const trend = new Array<number>(n).fill(NaN);
  const even = m % 2 === 0;
  const half = even ? m / 2 : (m - 1) / 2;
  for (let t = half; t < n - half; t++) {
    let s = 0;
    if (even) {
      s = 0.5 * (y[t - half] + y[t + half]);
      for (let j = t - half + 1; j < t + half; j++) s += y[j];
    } else {
      for (let j = t - half; j <= t + half; j++) s += y[j];
    }
    trend[t] = s / m;
  }
  const mult = type === "multiplicative";
  const figure = new Array<number>(m).fill(0);
  for (let i = 0; i < m; i++) {
    let s = 0;
    let c = 0;
    for (let t = i; t < n; t += m) {
      if (Number.isNaN(trend[t])) continue;
      s += mult ? y[t] / trend[t] : y[t] - trend[t];
      c++;
    }
    figure[i] = c > 0 ? s / c : mult ? 1 : 0;
  }
  let avg = 0;
  for (let i = 0; i < m; i++) avg += figure[i];
  avg /= m;
  for (let i = 0; i < m; i++) figure[i] = mult ? figure[i] / avg : figure[i] - avg;
  const seasonal = new Array<number>(n);
  for (let t = 0; t < n; t++) seasonal[t] = figure[t % m];
  return { trend, seasonal, figure };
}

/**
 * Sample autocorrelations r_1..r_maxLag.
 *
 * Definition: r_k = Σ_{t=1}^{n−k} (y_t − ȳ)(y_{t+k} − ȳ) / Σ_{t=1}^{n} (y_t − ȳ)²
 * (Box & Jenkins; the estimator of R's `stats::acf`).
 * Input: finite y with n ≥ 2, 1 ≤ maxLag < n. A constant series gives all zeros (policy: no NaN).
 * @throws RangeError for maxLag out of range.
 */
export function autocorrelations(y: readonly number[], maxLag: number): number[] {
  const n = y.length;
  if (!Number.isInteger(maxLag) || maxLag < 1 || maxLag >= n) {
    throw new RangeError(`autocorrelations: maxLag must be an integer from 1 to ${n - 1}`);
  }
  let mean = 0;
  for (let t = 0; t < n; t++) mean += y[t];
  mean /= n;
  let c0 = 0;
  for (let t = 0; t < n; t++) c0 += (y[t] - mean) ** 2;
  const r = new Array<number>(maxLag).fill(0);
  if (c0 === 0) return r;
  for (let k = 1; k <= maxLag; k++) {
    let s = 0;
    for (let t = 0; t + k < n; t++) s += (y[t] - mean) * (y[t + k] - mean);
    r[k - 1] = s / c0;
  }
  return r;
}

/**
 * Multiplicative seasonal adjustment when a seasonality test says so, as R forecast::thetaf
 * does before the Theta method (Hyndman & Billah 2003, IJF 19(2); Assimakopoulos & Nikolopoulos
 * 2000 adjust the same way; docs/methods.md §9).
 *
 * Test (only when m > 1, the series is not constant and n > 2m): with r_k the sample
 * autocorrelations, the series is seasonal when |r_m| / √((1 + 2·Σ_{k<m} r_k²)/n) > Φ⁻¹(0.95)
 * (a 90% two-sided test, thetaf's rule). If seasonal, the indices are those of a classical
 * multiplicative decomposition ({@link classicalDecomposition}); the adjusted series is y_t / s_t.
 * No adjustment (indices null, with a note saying why) when the test is not run or not
 * significant, when an observation is not above zero, or when an index is below 1e-4.
 * Input: finite y; m an integer ≥ 1.
 */
export function seasonalAdjustment(y: readonly number[], m: number): { indices: number[] | null; notes: string[] } {
  const n = y.length;
  const notes: string[] = [];
  const constant = y.every((v) => v === y[0]);
  if (m <= 1) return { indices: null, notes };
  if (constant || n <= 2 * m) {
    notes.push(`seasonality not tested: needs more than ${2 * m} observations and a non-constant series`);
    return { indices: null, notes };
  }
  const r = autocorrelations(y, m);
  let s2 = 0;
  for (let k = 0; k < m - 1; k++) s2 += r[k] * r[k];
  const seasonal = Math.abs(r[m - 1]) / Math.sqrt((1 + 2 * s2) / n) > normalQuantile(SEASONAL_TEST_PROBABILITY);
  notes.push(seasonal ? `seasonal at lag ${m} (90% autocorrelation test): seasonally adjusted` : `no significant seasonality at lag ${m}`);
  if (!seasonal) return { indices: null, notes };
  if (y.some((v) => !(v > 0))) {
    notes.push("multiplicative seasonal adjustment needs every observation above zero: not adjusted");
    return { indices: null, notes };
  }
  const d = classicalDecomposition(y, m, "multiplicative");
  if (d.figure.some((v) => Math.abs(v) < MIN_SEASONAL_INDEX)) {
    notes.push("seasonal indices close to zero: not adjusted");
    return { indices: null, notes };
  }
  return { indices: d.seasonal, notes };
}
