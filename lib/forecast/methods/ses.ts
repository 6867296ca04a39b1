import { etsMethod } from "../ets/method";

/**
 * Simple exponential smoothing (Brown 1959), ETS(A,N,N) of Hyndman et al. (2008): ŷ_t = ℓ_{t−1}, ℓ_t = ℓ_{t−1} + α·ε_t. Fitted values are one-step-ahead in-sample forecasts.
 *
 * Parameters (error-correction form, as R's forecast::ets reports them): alpha ∈ [1e-4, 0.9999].
 * Each is estimated unless given in `fixed`; the initial states (l0) likewise.
 * Estimation, bounds and σ² as in fitEts (lib/forecast/ets/least-squares.ts); intervals as in etsForecast (lib/forecast/ets/forecast.ts).
 */
const ses = etsMethod("ses", { trend: "N", season: "N" });

export default ses;
