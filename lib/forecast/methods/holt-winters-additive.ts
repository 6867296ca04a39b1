import { etsMethod } from "../ets/method";

/**
 * Holt-Winters additive seasonality (Winters 1960), ETS(A,A,A) of Hyndman et al. (2008): ŷ_t = ℓ_{t−1} + b_{t−1} + s_{t−m}, ℓ_t = ℓ_{t−1} + b_{t−1} + α·ε_t, b_t = b_{t−1} + β·ε_t, s_t = s_{t−m} + γ·ε_t (γ = (1 − α)·γ* of the component form). Fitted values are one-step-ahead in-sample forecasts. Needs season m ≥ 2 and at least two full seasons.
 *
 * Parameters (error-correction form, as R's forecast::ets reports them): alpha ∈ [1e-4, 0.9999], beta ∈ [1e-4, alpha], gamma ∈ [1e-4, 1 − alpha].
 * Each is estimated unless given in `fixed`; the initial states (l0, b0 and s1…sm, s_i being the seasonal state used for observation i; estimated seasonal states sum to zero) likewise.
 * Estimation, bounds and σ² as in fitEts (lib/forecast/ets/least-squares.ts); intervals as in etsForecast (lib/forecast/ets/forecast.ts).
 */
const holtWintersAdditive = etsMethod("holt-winters-additive", { trend: "A", season: "A" });

export default holtWintersAdditive;
