import { checkForecastArgs, checkSeriesFor, fitLinearModel, forecastLinearModel } from "../simple";
import type { Fit, FitInput, Forecast, Method } from "../types";

/**
 * Linear trend regression: y_t = β₀ + β₁·t + ε_t, t = 1..n, fitted by ordinary least squares
 * (Householder QR, lib/forecast/ols.ts); forecasts ŷ_{n+h} = β₀ + β₁(n + h). This is R's
 * `forecast::tslm(y ~ trend)`. Parameters `intercept` and `slope`, each estimated unless
 * given in `fixed` (a fixed one is subtracted and the other estimated on the rest).
 *
 * Intervals: ŷ ± t_{n−2}((1 + L/100)/2)·s·√(1 + x₀'(X'X)⁻¹x₀) with x₀ = (1, n + h), as R's
 * `predict.lm(interval = "prediction")`, which `forecast.lm` uses (with fixed coefficients,
 * the leverage and df of the free part only; see {@link fitLinearModel}). Needs 3 observations.
 */
const linearTrend: Method = {
  id: "linear-trend",
  minLength(): number {
    return 3;
  },
  applicable(y: readonly number[]): boolean {
    return y.length >= 3;
  },
  /** @throws ForecastInputError for fewer than 3 values, a non-finite value or a bad fixed value. */
  fit(input: FitInput): Fit {
    checkSeriesFor("linear-trend", input.y, 3, "two coefficients plus one degree of freedom for the error");
    const t = input.y.map((_, i) => i + 1);
    // eslint-disable-next-line @typescript-eslint/no-unused-vars
    const { xNames, ...fit } = fitLinearModel("linear-trend", input.y, input.season, [t], ["trend"], ["intercept", "slope"], input.fixed);
    return fit;
  },
  /** @throws ForecastInputError for a bad horizon or level. */
  forecast(fit: Fit, h: number, levels: readonly number[]): Forecast {
    checkForecastArgs("linear-trend", h, levels);
    const future = Array.from({ length: h }, (_, i) => fit.n + i + 1);
    return forecastLinearModel("linear-trend", fit, [future], h, levels);
  },
};

export default linearTrend;
