import { equalWeights, fitTrailing, forecastTrailing, MIN_WINDOW } from "../simple";
import type { Fit, FitInput, Forecast, Method } from "../types";

/**
 * Simple (trailing) moving average of the last k observations:
 * ŷ_{t+1} = (y_t + y_{t−1} + … + y_{t−k+1})/k, the same value for every horizon
 * (Makridakis, Wheelwright & Hyndman 1998, Forecasting: Methods and Applications, §4/2;
 * from memory as to the section). Parameter `window` k: given in `fixed.window`, else
 * estimated as the k in 2..min(max(12, m), n − 2) with the smallest one-step in-sample MSE,
 * all windows scored on the same points (ties go to the smaller window).
 *
 * Intervals (our choice, stated): the average has no generating model of its own, so the
 * variance is taken from a random walk, the model under which a trailing average is a
 * sensible forecast of a wandering level. If y is a random walk, the h-step error is
 * (y_{n+h} − y_n) + (y_n − ŷ), independent parts with variances h·q and c·q,
 * c = (k − 1)(2k − 1)/(6k); hence Var_h = q(h + c). q is calibrated so that Var_1 equals the
 * empirical one-step σ̂² (mean squared in-sample one-step error of the chosen window):
 * sd_h = σ̂·√((h + c)/(1 + c)). Intervals widen with h like the naive method's (k = 1 gives
 * the naive intervals exactly); bounds are ŷ ± z·sd_h with normal z.
 */
const movingAverage: Method = {
  id: "moving-average",
  minLength(): number {
    return MIN_WINDOW + 2;
  },
  applicable(y: readonly number[]): boolean {
    return y.length >= MIN_WINDOW + 2;
  },
  /** @throws ForecastInputError for too few values, a non-finite value or a bad window. */
  fit(input: FitInput): Fit {
    return fitTrailing("moving-average", "moving-average", equalWeights, input.y, input.season, input.fixed);
  },
  /** @throws ForecastInputError for a bad horizon or level. */
  forecast(fit: Fit, h: number, levels: readonly number[]): Forecast {
    return forecastTrailing("moving-average", "moving-average", fit, h, levels);
  },
};

export default movingAverage;
