import { seasonalAdjustment } from "../decompose";
import { fitEts } from "../ets/least-squares";
import { checkHorizon } from "../ets/model";
import { checkSeriesFor } from "../simple";
import { ols } from "../ols";
import { ForecastInputError, type Fit, type FitInput, type Forecast, type Method } from "../types";
import { normalQuantile } from "../../stats/normal";

/** Lower floor of alpha in the drift term, as in thetaf (avoids division by zero). */
const ALPHA_FLOOR = 1e-10;
const MIN_LENGTH = 3;

/**
 * The standard Theta method (Assimakopoulos & Nikolopoulos 2000), in the form shown by
 * Hyndman & Billah (2003), "Unmasking the Theta method", IJF 19(2): simple exponential
 * smoothing plus half the OLS trend slope; the arithmetic follows R forecast::thetaf
 * (docs/methods.md §9).
 *
 * Steps:
 * 1. Seasonality test and multiplicative classical adjustment ({@link seasonalAdjustment} of
 *    lib/forecast/decompose.ts, thetaf's rule: a 90% test on the lag-m autocorrelation; skipped,
 *    with a note, when an index is below 1e-4 or an observation is not above zero).
 * 2. SES (ETS(A,N,N)) is fitted to the (adjusted) series x by least squares: alpha and l0
 *    are estimated unless given in `fixed` (keys alpha, l0).
 * 3. b = OLS slope of x on t = 0..n−1 (lib/forecast/ols.ts, as thetaf's lsfit); forecast
 *    ŷ_{n+h} = [ℓ_n + (b/2)·((h − 1) + (1 − (1 − α)^n)/α)] × (seasonal index of that position).
 * 4. Intervals as thetaf: ŷ ± z·σ·√(1 + (h − 1)α²), σ² the SES residual variance
 *    (SSE/(n − k), k estimated parameters) on the adjusted scale.
 *
 * Fitted values follow thetaf: the SES one-step fitted values, reseasonalised (the drift
 * term is not included in-sample).
 * Input: finite y (n ≥ 3); season m ≥ 1. Constant series: forecast is the constant, zero-width
 * intervals.
 */
const theta: Method = {
  id: "theta",
  /** Three observations (an SES level, a slope and one degree of freedom). */
  minLength(): number {
    return MIN_LENGTH;
  },
  /** Any series of at least three observations. */
  applicable(y: readonly number[]): boolean {
    return y.length >= MIN_LENGTH;
  },
  /** @throws ForecastInputError for unusable input. */
  fit(input: FitInput): Fit {
    const { y } = input;
    checkSeriesFor("theta", y, 1);
    const n = y.length;
    if (n < MIN_LENGTH) throw new ForecastInputError(`theta: needs at least ${MIN_LENGTH} observations (got ${n})`);
    const m = input.season;
    if (!Number.isInteger(m) || m < 1) throw new ForecastInputError(`theta: the season length must be a whole number ≥ 1 (got ${m})`);
    const notes: string[] = [];
    let constant = true;
    for (let i = 1; i < n; i++) if (y[i] !== y[0]) constant = false;

    const adjustment = seasonalAdjustment(y, m);
    notes.push(...adjustment.notes.map((t) => t.replace(/: not adjusted$/, ": non-seasonal Theta used")));
    const indices = adjustment.indices;
    const x = indices ? y.map((v, t) => v / indices![t]) : [...y];
    const fixed = input.fixed;
    if (fixed) {
      for (const key of Object.keys(fixed)) {
        if (key !== "alpha" && key !== "l0") throw new ForecastInputError(`theta: unknown fixed parameter "${key}"; this method accepts alpha, l0`);
      }
    }
    const ses = fitEts("theta", { trend: "N", season: "N" }, x, 1, fixed);
    notes.push(...ses.notes);
    // OLS slope of x on 0..n−1 (a constant series has slope 0 exactly).
    const slope = constant ? 0 : ols(x, [x.map((_, t) => t)]).coefficients[1];
    const fitted = ses.fitted.map((f, t) => (indices ? f * indices[t] : f));
    const residuals = fitted.map((f, t) => y[t] - f);
    let sse = 0;
    for (const e of residuals) sse += e * e;
    const next: number[] = [];
    if (indices) for (let j = 0; j < m; j++) next.push(indices[(n - m + j) % n]);
    return {
      method: "theta",
      parameters: { alpha: ses.alpha, drift: slope / 2 },
      state: { level: ses.level, l0: ses.l0, slope, season: next, n },
      fitted,
      residuals,
      sigma2: ses.sigma2,
      n,
      season: m,
      sse,
      notes,
      // SES's estimated α and ℓ0, the slope, and the m − 1 free seasonal indices when adjusted.
      estimated: ses.estimated + 1 + (indices ? m - 1 : 0),
    };
  },
  /** @throws ForecastInputError for a bad horizon or level. */
  forecast(fit: Fit, h: number, levels: readonly number[]): Forecast {
    checkHorizon("theta", h, levels);
    const alpha = Math.max(ALPHA_FLOOR, fit.parameters.alpha);
    const drift = fit.parameters.drift;
    const level = fit.state.level as number;
    const n = fit.state.n as number;
    const next = fit.state.season as readonly number[];
    const tail = (1 - (1 - alpha) ** n) / alpha;
    const mean: number[] = [];
    const sd: number[] = [];
    const sigma = Math.sqrt(Math.max(fit.sigma2, 0));
    for (let i = 0; i < h; i++) {
      const base = level + drift * (i + tail);
      mean.push(next.length > 0 ? base * next[i % next.length] : base);
      sd.push(sigma * Math.sqrt(1 + i * alpha * alpha));
    }
    const lower: Record<string, number[]> = {};
    const upper: Record<string, number[]> = {};
    for (const lv of levels) {
      const z = normalQuantile(0.5 + lv / 200);
      lower[String(lv)] = mean.map((v, i) => v - z * sd[i]);
      upper[String(lv)] = mean.map((v, i) => v + z * sd[i]);
    }
    return { method: "theta", mean, levels: [...levels], lower, upper, sd };
  },
  /**
   * Row t: the forecasts of step 3 above from origin t with α and the drift of the fit held:
   * the SES level after t observations (the fitted value of y_{t+1} on the adjusted scale),
   * the drift term with t in place of n, and the seasonal indices (periodic) of those times.
   */
  originForecasts(fit: Fit, y: readonly number[], h: number): number[][] {
    const alpha = Math.max(ALPHA_FLOOR, fit.parameters.alpha);
    const drift = fit.parameters.drift;
    const n = fit.state.n as number;
    const next = fit.state.season as readonly number[];
    const m = next.length;
    const index = (t: number) => (m > 0 ? next[(((t - n) % m) + m) % m] : 1);
    const rows: number[][] = [];
    for (let t = 0; t < y.length; t++) {
      const level = fit.fitted[t] / index(t);
      const tail = (1 - (1 - alpha) ** Math.max(t, 1)) / alpha;
      const row: number[] = [];
      for (let i = 0; i < h; i++) row.push((level + drift * (i + tail)) * index(t + i));
      rows.push(row);
    }
    return rows;
  },
};

export default theta;
