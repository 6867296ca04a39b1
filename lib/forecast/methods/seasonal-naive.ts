import { checkSeriesFor, fitLagWalk, forecastLagWalk } from "../simple";
import { ForecastInputError, type Fit, type FitInput, type Forecast, type Method } from "../types";

/**
 * Seasonal naive method: each forecast is the observation one season earlier,
 * ŷ_{n+h} = y_{n+h−m·k} with k = ⌊(h − 1)/m⌋ + 1 (the number of whole seasons ahead).
 *
 * Intervals: ŷ ± z·σ̂√k (FPP §5.5), σ̂² the mean of the n − m squared seasonal-naive residuals,
 * as R's `forecast::snaive()` (forecast 8.20). Needs a season m ≥ 2 and m + 1 observations;
 * with season 1 it is the naive method and so is not offered.
 */
const seasonalNaive: Method = {
  id: "seasonal-naive",
  minLength(season: number): number {
    return season + 1;
  },
  applicable(y: readonly number[], season: number): boolean {
    return season >= 2 && y.length >= season + 1;
  },
  /** @throws ForecastInputError for a season below 2, too few values or a non-finite value. */
  fit(input: FitInput): Fit {
    const m = input.season;
    if (!Number.isInteger(m) || m < 2) {
      throw new ForecastInputError(`seasonal-naive needs a season length of at least 2 (got ${m}); use naive for a series without a season`);
    }
    checkSeriesFor("seasonal-naive", input.y, m + 1, `one season of ${m} plus one value to measure the error`);
    return fitLagWalk("seasonal-naive", input.y, m, m, false);
  },
  /** @throws ForecastInputError for a bad horizon or level. */
  forecast(fit: Fit, h: number, levels: readonly number[]): Forecast {
    return forecastLagWalk("seasonal-naive", "seasonal-naive", fit, h, levels);
  },
};

export default seasonalNaive;
