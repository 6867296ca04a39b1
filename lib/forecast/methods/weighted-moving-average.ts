import { fitTrailing, forecastTrailing, linearWeights, MIN_WINDOW } from "../simple";
import type { Fit, FitInput, Forecast, Method } from "../types";

/**
 * Weighted moving average with linearly declining weights: over a window of k, the latest
 * observation has weight k, the one before k − 1, …, the oldest 1, divided by k(k + 1)/2:
 * ŷ_{t+1} = Σ_{j=0}^{k−1} (k − j)·y_{t−j} / (k(k + 1)/2) (for k = 3: 3/6, 2/6, 1/6). This
 * arithmetically declining weighting is the "linearly weighted moving average" of forecasting
 * and operations texts — common practice; a textbook source (e.g. Hanke & Wichern, Business
 * Forecasting) is cited from memory, not checked. It gives recent values more say without an
 * exponential smoothing constant.
 *
 * Parameter `window` k: given in `fixed.window`, else estimated as for `moving-average`
 * (smallest one-step in-sample MSE over k = 2..min(max(12, m), n − 2), common scoring points).
 *
 * Intervals: as `moving-average`, from a random walk calibrated to the empirical one-step
 * σ̂²: sd_h = σ̂·√((h + c)/(1 + c)) with c = Σ_{i=0}^{k−2} (Σ_{j>i} ω_j)², ω_j the weight on
 * y_{n−j} (the variance of y_n − ŷ per unit of random-walk innovation variance).
 */
const weightedMovingAverage: Method = {
  id: "weighted-moving-average",
  minLength(): number {
    return MIN_WINDOW + 2;
  },
  applicable(y: readonly number[]): boolean {
    return y.length >= MIN_WINDOW + 2;
  },
  /** @throws ForecastInputError for too few values, a non-finite value or a bad window. */
  fit(input: FitInput): Fit {
    return fitTrailing("weighted-moving-average", "weighted-moving-average", linearWeights, input.y, input.season, input.fixed);
  },
  /** @throws ForecastInputError for a bad horizon or level. */
  forecast(fit: Fit, h: number, levels: readonly number[]): Forecast {
    return forecastTrailing("weighted-moving-average", "weighted-moving-average", fit, h, levels);
  },
};

export default weightedMovingAverage;
