import { etsMethod } from "../ets/method";

/**
 * Additive damped trend (Gardner & McKenzie 1985), ETS(A,Ad,N) of Hyndman et al. (2008): ŷ_t = ℓ_{t−1} + φ·b_{t−1}, ℓ_t = ℓ_{t−1} + φ·b_{t−1} + α·ε_t, b_t = φ·b_{t−1} + β·ε_t; forecasts ℓ_n + (φ + … + φ^h)·b_n. Fitted values are one-step-ahead in-sample forecasts.
 *
 * Parameters (error-correction form, as R's forecast::ets reports them): alpha ∈ [1e-4, 0.9999], beta ∈ [1e-4, alpha], phi ∈ [0.8, 0.98].
 * Each is estimated unless given in `fixed`; the initial states (l0, b0) likewise.
 * Estimation, bounds and σ² as in fitEts (lib/forecast/ets/least-squares.ts); intervals as in etsForecast (lib/forecast/ets/forecast.ts).
 */
const dampedHolt = etsMethod("damped-holt", { trend: "Ad", season: "N" });

export default dampedHolt;
