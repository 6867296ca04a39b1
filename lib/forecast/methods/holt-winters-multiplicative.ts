import { etsForecast, etsMinLength, fitEts, toFit, type EtsModel } from "../ets";
import type { Fit, FitInput, Forecast, Method } from "../types";

/** Holt-Winters multiplicative method, ETS(A,A,M) (additive errors). */
const MODEL: EtsModel = { trend: "A", season: "M" };

/**
 * Holt-Winters multiplicative seasonality (Winters 1960) in the error-correction form ETS(A,A,M) of Hyndman et al. (2008): ŷ_t = (ℓ_{t−1} + b_{t−1})·s_{t−m}, ℓ_t = ℓ_{t−1} + b_{t−1} + α·ε_t/s_{t−m}, b_t = b_{t−1} + β·ε_t/s_{t−m}, s_t = s_{t−m} + γ·ε_t/(ℓ_{t−1} + b_{t−1}). A,A,M rather than M,A,M because the parameters are estimated by least squares, which is the A,A,M likelihood; intervals are simulated (see etsForecast). Note that R's stats::HoltWinters updates the season with the new level ℓ_t instead, so its multiplicative fits differ slightly. Fitted values are one-step-ahead in-sample forecasts. Needs every observation > 0, season m ≥ 2 and at least two full seasons.
 *
 * Parameters (error-correction form, as R's forecast::ets reports them): alpha ∈ [1e-4, 0.9999], beta ∈ [1e-4, alpha], gamma ∈ [1e-4, 1 − alpha].
 * Each is estimated unless given in `fixed`; the initial states (l0, b0 and s1…sm, s_i being the seasonal index used for observation i; estimated seasonal indices sum to m) likewise.
 * Estimation, bounds and σ² as in {@link fitEts}; intervals as in {@link etsForecast}.
 */
const holtWintersMultiplicative: Method = {
  id: "holt-winters-multiplicative",
  /** Smallest length with every parameter estimated (see {@link etsMinLength}). */
  minLength(season: number): number {
    return season >= 2 && Number.isInteger(season) ? etsMinLength(MODEL, season) : Number.POSITIVE_INFINITY;
  },
  /** Needs an integer season ≥ 2, at least minLength(season) observations, all above zero. */
  applicable(y: readonly number[], season: number): boolean {
    return Number.isInteger(season) && season >= 2 && y.length >= etsMinLength(MODEL, season) && y.every((v) => v > 0);
  },
  /** @throws ForecastInputError for unusable input (message says what to fix). */
  fit(input: FitInput): Fit {
    return toFit("holt-winters-multiplicative", fitEts("holt-winters-multiplicative", MODEL, input.y, input.season, input.fixed, input.start));
  },
  /** @throws ForecastInputError for a bad horizon or level. */
  forecast(fit: Fit, h: number, levels: readonly number[]): Forecast {
    return etsForecast("holt-winters-multiplicative", "holt-winters-multiplicative", MODEL, fit, h, levels);
  },
};

export default holtWintersMultiplicative;
