import { etsForecast, etsMinLength, fitEts, toFit, type EtsModel } from "../ets";
import type { Fit, FitInput, Forecast, Method } from "../types";

/** Simple exponential smoothing, ETS(A,N,N). */
const MODEL: EtsModel = { trend: "N", season: "N" };

/**
 * Simple exponential smoothing (Brown 1959), ETS(A,N,N) of Hyndman et al. (2008): ŷ_t = ℓ_{t−1}, ℓ_t = ℓ_{t−1} + α·ε_t. Fitted values are one-step-ahead in-sample forecasts.
 *
 * Parameters (error-correction form, as R's forecast::ets reports them): alpha ∈ [1e-4, 0.9999].
 * Each is estimated unless given in `fixed`; the initial states (l0) likewise.
 * Estimation, bounds and σ² as in {@link fitEts}; intervals as in {@link etsForecast}.
 */
const ses: Method = {
  id: "ses",
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
    return toFit("ses", fitEts("ses", MODEL, input.y, input.season, input.fixed));
  },
  /** @throws ForecastInputError for a bad horizon or level. */
  forecast(fit: Fit, h: number, levels: readonly number[]): Forecast {
    return etsForecast("ses", "ses", MODEL, fit, h, levels);
  },
};

export default ses;
