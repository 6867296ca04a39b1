import { etsForecast, etsMinLength, fitEts, toFit, type EtsModel } from "../ets";
import type { Fit, FitInput, Forecast, Method } from "../types";

/** Holt's linear method, ETS(A,A,N). */
const MODEL: EtsModel = { trend: "A", season: "N" };

/**
 * Holt's linear method (Holt 1957), ETS(A,A,N) of Hyndman et al. (2008): ŷ_t = ℓ_{t−1} + b_{t−1}, ℓ_t = ℓ_{t−1} + b_{t−1} + α·ε_t, b_t = b_{t−1} + β·ε_t (β = α·β* of the component form). Fitted values are one-step-ahead in-sample forecasts.
 *
 * Parameters (error-correction form, as R's forecast::ets reports them): alpha ∈ [1e-4, 0.9999], beta ∈ [1e-4, alpha].
 * Each is estimated unless given in `fixed`; the initial states (l0, b0) likewise.
 * Estimation, bounds and σ² as in {@link fitEts}; intervals as in {@link etsForecast}.
 */
const holt: Method = {
  id: "holt",
  /** Smallest length with every parameter estimated (see {@link etsMinLength}). */
  minLength(season: number): number {
    return etsMinLength(MODEL, season);
  },
  /** Any series of at least minLength observations (season is ignored). */
  applicable(y: readonly number[], season: number): boolean {
    return y.length >= etsMinLength(MODEL, season);
  },
  /** @throws ForecastInputError for unusable input (message says what to fix). */
  fit(input: FitInput): Fit {
    return toFit("holt", fitEts("holt", MODEL, input.y, input.season, input.fixed, input.start));
  },
  /** @throws ForecastInputError for a bad horizon or level. */
  forecast(fit: Fit, h: number, levels: readonly number[]): Forecast {
    return etsForecast("holt", "holt", MODEL, fit, h, levels);
  },
};

export default holt;
