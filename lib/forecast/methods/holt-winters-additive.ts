import { etsForecast, etsMinLength, fitEts, toFit, type EtsModel } from "../ets";
import type { Fit, FitInput, Forecast, Method } from "../types";

/** Holt-Winters additive method, ETS(A,A,A). */
const MODEL: EtsModel = { trend: "A", season: "A" };

/**
 * Holt-Winters additive seasonality (Winters 1960), ETS(A,A,A) of Hyndman et al. (2008): ŷ_t = ℓ_{t−1} + b_{t−1} + s_{t−m}, ℓ_t = ℓ_{t−1} + b_{t−1} + α·ε_t, b_t = b_{t−1} + β·ε_t, s_t = s_{t−m} + γ·ε_t (γ = (1 − α)·γ* of the component form). Fitted values are one-step-ahead in-sample forecasts. Needs season m ≥ 2 and at least two full seasons.
 *
 * Parameters (error-correction form, as R's forecast::ets reports them): alpha ∈ [1e-4, 0.9999], beta ∈ [1e-4, alpha], gamma ∈ [1e-4, 1 − alpha].
 * Each is estimated unless given in `fixed`; the initial states (l0, b0 and s1…sm, s_i being the seasonal state used for observation i; estimated seasonal states sum to zero) likewise.
 * Estimation, bounds and σ² as in {@link fitEts}; intervals as in {@link etsForecast}.
 */
const holtWintersAdditive: Method = {
  id: "holt-winters-additive",
  /** Smallest length with every parameter estimated (see {@link etsMinLength}). */
  minLength(season: number): number {
    return season >= 2 && Number.isInteger(season) ? etsMinLength(MODEL, season) : Number.POSITIVE_INFINITY;
  },
  /** Needs an integer season ≥ 2 and at least minLength(season) observations. */
  applicable(y: readonly number[], season: number): boolean {
    return Number.isInteger(season) && season >= 2 && y.length >= etsMinLength(MODEL, season);
  },
  /** @throws ForecastInputError for unusable input (message says what to fix). */
  fit(input: FitInput): Fit {
    return toFit("holt-winters-additive", fitEts("holt-winters-additive", MODEL, input.y, input.season, input.fixed, input.start));
  },
  /** @throws ForecastInputError for a bad horizon or level. */
  forecast(fit: Fit, h: number, levels: readonly number[]): Forecast {
    return etsForecast("holt-winters-additive", "holt-winters-additive", MODEL, fit, h, levels);
  },
};

export default holtWintersAdditive;
