import { etsMethod } from "../ets/method";

/**
 * Holt's linear method (Holt 1957), ETS(A,A,N) of Hyndman et al. (2008): ŷ_t = ℓ_{t−1} + b_{t−1}, ℓ_t = ℓ_{t−1} + b_{t−1} + α·ε_t, b_t = b_{t−1} + β·ε_t (β = α·β* of the component form). Fitted values are one-step-ahead in-sample forecasts.
 *
 * Parameters (error-correction form, as R's forecast::ets reports them): alpha ∈ [1e-4, 0.9999], beta ∈ [1e-4, alpha].
 * Each is estimated unless given in `fixed`; the initial states (l0, b0) likewise.
 * Estimation, bounds and σ² as in fitEts (lib/forecast/ets/least-squares.ts); intervals as in etsForecast (lib/forecast/ets/forecast.ts).
 */
const holt = etsMethod("holt", { trend: "A", season: "N" });

export default holt;
