import { checkSeriesFor, fitLagWalk, forecastLagWalk } from "../simple";
import { ForecastInputError, type Fit, type FitInput, type Forecast, type Method } from "../types";

/**
 * Drift method (random walk with drift): ŷ_{n+h} = y_n + h·b with b = (y_n − y_1)/(n − 1), the
 * average change (Hyndman & Athanasopoulos, FPP §5.2); parameter `drift` (estimated unless
 * given in `fixed.drift`).
 *
 * Intervals: sd_h = √(σ̂²·h + h²·se_b²) with σ̂² = Σ(Δy − b)²/(n − 2) and se_b² = σ̂²/(n − 1),
 * i.e. σ̂√(h(1 + h/(n − 1))) — FPP §5.5's σ√(h(1 + h/T)) with T the number of differences —
 * exactly as R's `forecast::rwf(drift = TRUE)` (forecast 8.20). With a fixed drift, se_b = 0
 * and σ̂² = Σ(Δy − b)²/(n − 1). Needs 3 observations.
 */
const drift: Method = {
  id: "drift",
  minLength(): number {
    return 3;
  },
  applicable(y: readonly number[]): boolean {
    return y.length >= 3;
  },
  /** @throws ForecastInputError for fewer than 3 values, a non-finite value or drift. */
  fit(input: FitInput): Fit {
    checkSeriesFor("drift", input.y, 3, "two changes: one to estimate the drift, one to measure the error");
    const given = input.fixed?.drift;
    if (given !== undefined && !Number.isFinite(given)) {
      throw new ForecastInputError(`drift: a fixed drift must be a finite number (got ${given})`);
    }
    return fitLagWalk("drift", input.y, 1, input.season, true, given);
  },
  /** @throws ForecastInputError for a bad horizon or level. */
  forecast(fit: Fit, h: number, levels: readonly number[]): Forecast {
    return forecastLagWalk("drift", "drift", fit, h, levels);
  },
};

export default drift;
