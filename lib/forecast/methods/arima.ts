import { arimaOriginForecasts, autoArima, fitArima, forecastArima, MAX_AR, MAX_MA, type ArimaFit, type ArimaSpec } from "../arima";
import { seasonalAdjustment } from "../decompose";
import { checkForecastArgs, checkSeriesFor, makeFit, normalForecast } from "../simple";
import { ForecastInputError, type Fit, type FitInput, type Forecast, type Method } from "../types";

/** Smallest series for which ARIMA is offered. */
const ARIMA_MIN_LENGTH = 10;

/**
 * ARIMA(p, d, q) with an optional constant (mean for d = 0, drift for d = 1), non-seasonal,
 * by exact Gaussian maximum likelihood through the Kalman filter; see lib/forecast/arima.ts
 * for the model, likelihood, sources and forecast variance.
 *
 * Parameters (published names; each estimated unless given in `fixed`): `p`, `d`, `q`
 * (orders), `includeConstant` (0/1), `ar1`…`arp`, `ma1`…`maq`, `constant`. With p and q not
 * both given the order is chosen automatically: d by KPSS tests (unless given), then p, q ≤ 3
 * (with or without the constant when d ≤ 1) by AICc in the stepwise search of Hyndman &
 * Khandakar (2008) with quick fits (lib/forecast/arima.ts autoArima; as forecast::auto.arima's
 * default `stepwise = TRUE`, here with `seasonal = FALSE`): the exhaustive search over all 32
 * models cost several times the whole automatic baseline's time on M3.
 *
 * Seasonality (season m > 1): no seasonal ARIMA terms; instead, when the seasonality test of
 * the Theta method says so ({@link seasonalAdjustment}: 90% test on the lag-m autocorrelation,
 * classical multiplicative decomposition), the model is fitted to the seasonally adjusted series
 * y_t / s_t and its forecasts, bounds and fitted values are multiplied back by the indices of
 * those positions. Forecasting the seasonally adjusted series with a non-seasonal model and
 * reseasonalising is common practice (e.g. forecast::stlf and the M4 benchmarks' "seasonally
 * adjusted" methods, Makridakis, Spiliotis & Assimakopoulos 2020, IJF 36(1)); the
 * indices are treated as known. Parameter `seasonallyAdjusted` (1/0) says whether it was done;
 * `fixed: { seasonallyAdjusted: 0 }` turns it off.
 *
 * Intervals: normal, ŷ ± z·sd_h with the finite-sample Kalman variance and
 * σ² = Σ(v²/F)/(N − k), as forecast::forecast.Arima (times the seasonal index when adjusted).
 */
const arima: Method = {
  id: "arima",
  minLength(): number {
    return ARIMA_MIN_LENGTH;
  },
  applicable(y: readonly number[]): boolean {
    return y.length >= ARIMA_MIN_LENGTH;
  },
  /** @throws ForecastInputError for too few values, a non-finite value or unusable fixed values. */
  fit(input: FitInput): Fit {
    checkSeriesFor("arima", input.y, ARIMA_MIN_LENGTH);
    const fx = input.fixed ?? {};
    for (const [k, v] of Object.entries(fx)) {
      if (!Number.isFinite(v)) throw new ForecastInputError(`arima: fixed ${k} must be a finite number (got ${v})`);
    }
    const adjustment = fx.seasonallyAdjusted === 0 ? { indices: null, notes: [] } : seasonalAdjustment(input.y, input.season);
    const indices = adjustment.indices;
    const y = indices ? input.y.map((v, t) => v / indices[t]) : input.y;
    const notes: string[] = [...adjustment.notes];
    let fit: ArimaFit;
    try {
      if (fx.p !== undefined && fx.q !== undefined) {
        const d = fx.d ?? 0;
        const spec: ArimaSpec = { p: fx.p, d, q: fx.q, constant: (fx.includeConstant ?? (d <= 1 ? 1 : 0)) === 1 };
        fit = fitArima(y, spec, {
          ar: Array.from({ length: spec.p }, (_, i) => fx[`ar${i + 1}`]),
          ma: Array.from({ length: spec.q }, (_, i) => fx[`ma${i + 1}`]),
          constant: fx.constant,
        });
      } else {
        const auto = autoArima(y, { d: fx.d, maxP: fx.p ?? MAX_AR, maxQ: fx.q ?? MAX_MA, search: "stepwise", quick: true });
        fit = auto.fit;
        const tried = auto.candidates.filter((c) => Number.isFinite(c.aicc)).length;
        notes.push(`order chosen by AICc in a stepwise search over ${tried} admissible ARIMA models (d = ${fit.spec.d} by KPSS tests unless given)`);
      }
    } catch (e) {
      if (e instanceof RangeError) throw new ForecastInputError(e.message);
      throw e;
    }
    if (input.season > 1) notes.push(`seasonal ARIMA terms are not modelled (season ${input.season})${indices ? ": fitted to the seasonally adjusted series" : ""}`);
    if (!fit.converged) notes.push("the likelihood optimiser stopped at its evaluation limit");
    const { p, d, q, constant } = fit.spec;
    const parameters: Record<string, number> = { p, d, q, includeConstant: constant ? 1 : 0, seasonallyAdjusted: indices ? 1 : 0 };
    fit.ar.forEach((v, i) => (parameters[`ar${i + 1}`] = v));
    fit.ma.forEach((v, i) => (parameters[`ma${i + 1}`] = v));
    if (constant) parameters.constant = fit.constant;
    const base = makeFit(
      "arima",
      input.y,
      input.season,
      indices ? fit.fitted.map((f, t) => f * indices[t]) : fit.fitted,
      parameters,
      {
        ar: fit.ar,
        ma: fit.ma,
        constant: fit.constant,
        d,
        a: fit.state,
        P: fit.stateCov,
        lastValues: fit.lastValues,
        loglik: fit.loglik,
        aicc: fit.aicc,
        // the seasonal indices of the next m positions after the series (empty: not adjusted)
        season: indices ? Array.from({ length: input.season }, (_, j) => indices[input.y.length - input.season + j]) : [],
        n: input.y.length,
      },
      fit.sigma2,
      notes,
    );
    // The estimated coefficients (npar counts σ² too) and the m − 1 free seasonal indices when adjusted.
    return { ...base, estimated: fit.npar - 1 + (indices ? input.season - 1 : 0) };
  },
  /** @throws ForecastInputError for a bad horizon or level. */
  forecast(fit: Fit, h: number, levels: readonly number[]): Forecast {
    checkForecastArgs("arima", h, levels);
    const st = fit.state;
    const { mean, sd } = forecastArima(
      {
        spec: { d: st.d as number },
        ar: st.ar as readonly number[],
        ma: st.ma as readonly number[],
        constant: st.constant as number,
        sigma2: fit.sigma2,
        state: st.a as readonly number[],
        stateCov: st.P as readonly number[],
        lastValues: st.lastValues as readonly number[],
      },
      h,
    );
    const next = st.season as readonly number[];
    const index = (j: number) => (next.length > 0 ? next[j % next.length] : 1);
    return normalForecast("arima", mean.map((v, j) => v * index(j)), sd.map((v, j) => v * index(j)), levels);
  },
  /**
   * Row t: the forecasts of y_t..y_{t+h−1} from y_0..y_{t−1} with the fitted coefficients (and
   * seasonal indices) held ({@link arimaOriginForecasts}, on the adjusted scale, reseasonalised).
   */
  originForecasts(fit: Fit, y: readonly number[], h: number): number[][] {
    const st = fit.state;
    const next = st.season as readonly number[];
    const m = next.length;
    const n = st.n as number;
    const index = (t: number) => (m > 0 ? next[(((t - n) % m) + m) % m] : 1);
    const x = m > 0 ? y.map((v, t) => v / index(t)) : y;
    const rows = arimaOriginForecasts({ spec: { d: st.d as number }, ar: st.ar as readonly number[], ma: st.ma as readonly number[], constant: st.constant as number }, x, h);
    return rows.map((row, t) => row.map((v, j) => v * index(t + j)));
  },
};

export default arima;
