import { etsMethod } from "../ets/method";

/**
 * Holt-Winters multiplicative seasonality (Winters 1960) in the error-correction form ETS(A,A,M) of Hyndman et al. (2008): ŷ_t = (ℓ_{t−1} + b_{t−1})·s_{t−m}, ℓ_t = ℓ_{t−1} + b_{t−1} + α·ε_t/s_{t−m}, b_t = b_{t−1} + β·ε_t/s_{t−m}, s_t = s_{t−m} + γ·ε_t/(ℓ_{t−1} + b_{t−1}). A,A,M rather than M,A,M because the parameters are estimated by least squares, which is the A,A,M likelihood; intervals are simulated (see etsForecast). Note that R's stats::HoltWinters updates the season with the new level ℓ_t instead, so its multiplicative fits differ slightly. Fitted values are one-step-ahead in-sample forecasts. Needs every observation > 0, season m ≥ 2 and at least two full seasons.
 *
 * Parameters (error-correction form, as R's forecast::ets reports them): alpha ∈ [1e-4, 0.9999], beta ∈ [1e-4, alpha], gamma ∈ [1e-4, 1 − alpha].
 * Each is estimated unless given in `fixed`; the initial states (l0, b0 and s1…sm, s_i being the seasonal index used for observation i; estimated seasonal indices sum to m) likewise.
 * Estimation, bounds and σ² as in fitEts (lib/forecast/ets/least-squares.ts); intervals as in etsForecast (lib/forecast/ets/forecast.ts).
 */
const holtWintersMultiplicative = etsMethod("holt-winters-multiplicative", { trend: "A", season: "M" });

export default holtWintersMultiplicative;
