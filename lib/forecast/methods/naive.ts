import { checkSeriesFor, fitLagWalk, forecastLagWalk } from "../simple";
import type { Fit, FitInput, Forecast, Method } from "../types";

/**
 * Naive method (random walk): every forecast is the last observation, ŷ_{n+h} = y_n; the
 * one-step fitted value is the previous observation.
 *
 * Intervals: ŷ ± z·σ̂√h (Hyndman & Athanasopoulos, Forecasting: Principles and Practice,
 * §5.5, table of multi-step standard deviations), with σ̂² the mean of the n − 1 squared
 * one-step residuals, as R's `forecast::naive()` (forecast 8.20). No parameters.
 * Needs 2 observations (one residual for σ̂).
 */
const naive: Method = {
  id: "naive",
  minLength(): number {
    return 2;
  },
  applicable(y: readonly number[]): boolean {
    return y.length >= 2;
  },
  /** @throws ForecastInputError for fewer than 2 values or a non-finite value. */
  fit(input: FitInput): Fit {
    checkSeriesFor("naive", input.y, 2, "one to forecast from and one to measure the error");
    return fitLagWalk("naive", input.y, 1, input.season, false);
  },
  /** @throws ForecastInputError for a bad horizon or level. */
  forecast(fit: Fit, h: number, levels: readonly number[]): Forecast {
    return forecastLagWalk("naive", "naive", fit, h, levels);
  },
};

export default naive;
