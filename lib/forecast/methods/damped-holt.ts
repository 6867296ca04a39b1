import { etsForecast, etsMinLength, fitEts, toFit, type EtsModel } from "../ets";
import type { Fit, FitInput, Forecast, Method } from "../types";

/** Damped trend method, ETS(A,Ad,N). */
const MODEL: EtsModel = { trend: "Ad", season: "N" };

/**
 * Additive damped trend (Gardner & McKenzie 1985), ETS(A,Ad,N) of Hyndman et al. (2008): ŷ_t = ℓ_{t−1} + φ·b_{t−1}, ℓ_t = ℓ_{t−1} + φ·b_{t−1} + α·ε_t, b_t = φ·b_{t−1} + β·ε_t; forecasts ℓ_n + (φ + … + φ^h)·b_n. Fitted values are one-step-ahead in-sample forecasts.
 *
 * Parameters (error-correction form, as R's forecast::ets reports them): alpha ∈ [1e-4, 0.9999], beta ∈ [1e-4, alpha], phi ∈ [0.8, 0.98].
 * Each is estimated unless given in `fixed`; the initial states (l0, b0) likewise.
 * Estimation, bounds and σ² as in {@link fitEts}; intervals as in {@link etsForecast}.
 */
const dampedHolt: Method = {
  id: "damped-holt",
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
    return toFit("damped-holt", fitEts("damped-holt", MODEL, input.y, input.season, input.fixed, input.start));
  },
  /** @throws ForecastInputError for a bad horizon or level. */
  forecast(fit: Fit, h: number, levels: readonly number[]): Forecast {
    return etsForecast("damped-holt", "damped-holt", MODEL, fit, h, levels);
  },
};

export default dampedHolt;
