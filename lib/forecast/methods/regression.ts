import { checkForecastArgs, checkSeriesFor, fitLinearModel, forecastLinearModel } from "../simple";
import { ForecastInputError, type Fit, type FitInput, type Forecast, type FutureX, type Method } from "../types";

/** Column names of a fit, in design order. */
function columnNames(fit: Fit): string[] {
  const count = (fit.state.coefficients as readonly number[]).length - 1;
  return Array.from({ length: count }, (_, j) => fit.xNames?.[j] ?? `x${j + 1}`);
}

/**
 * Multiple regression on the explanatory columns: y_t = β₀ + Σ_j β_j·x_{j,t} + ε_t by
 * ordinary least squares (Householder QR, lib/forecast/ols.ts), as R's `lm(y ~ x1 + …)` /
 * `forecast::tslm`. Parameters: `intercept` and one coefficient per column, under the
 * column's name (`input.xNames`, default x1, x2, …); each estimated unless given in `fixed`
 * (fixed ones are subtracted and the rest estimated, see {@link fitLinearModel}).
 *
 * Forecasts need the future values of every column (`futureX`, one array per column with h
 * values). Intervals: ŷ ± t_{n−p}((1 + L/100)/2)·s·√(1 + x₀'(X'X)⁻¹x₀), as R's
 * `predict.lm(interval = "prediction")`. These intervals treat the future x as known.
 * Needs at least p + 1 observations (p = columns + 1).
 */
const regression: Method = {
  id: "regression",
  minLength(): number {
    return 3;
  },
  /** Applies only when explanatory columns are present. */
  applicable(y: readonly number[], _season: number, hasX: boolean): boolean {
    return hasX && y.length >= 3;
  },
  /**
   * @throws ForecastInputError when there are no columns, too few rows for the coefficients,
   *   a non-finite cell (naming column and row), or a column that is a linear combination of
   *   the intercept and earlier columns (naming it).
   */
  fit(input: FitInput): Fit {
    const x = input.x ?? [];
    if (x.length === 0) {
      throw new ForecastInputError("regression needs at least one explanatory column besides the value column");
    }
    const names = x.map((_, j) => input.xNames?.[j] ?? `x${j + 1}`);
    if (names.includes("intercept")) throw new ForecastInputError("regression: a column may not be called 'intercept'; rename it");
    const dup = names.find((nm, j) => names.indexOf(nm) !== j);
    if (dup !== undefined) throw new ForecastInputError(`regression: two columns are called '${dup}'; rename one`);
    checkSeriesFor("regression", input.y, x.length + 2, `${x.length + 1} coefficients plus one degree of freedom for the error`);
    return fitLinearModel("regression", input.y, input.season, x, names, ["intercept", ...names], input.fixed);
  },
  /**
   * @throws ForecastInputError when `futureX` is missing, has the wrong number of columns,
   *   or a column has fewer than h values or a non-finite value (naming the column).
   */
  forecast(fit: Fit, h: number, levels: readonly number[], futureX?: FutureX): Forecast {
    checkForecastArgs("regression", h, levels);
    const names = columnNames(fit);
    if (!futureX || futureX.length === 0) {
      throw new ForecastInputError(
        `regression needs future values of ${names.map((n) => `'${n}'`).join(", ")} for each of the ${h} forecast steps`,
      );
    }
    if (futureX.length !== names.length) {
      throw new ForecastInputError(`regression was fitted on ${names.length} column(s) but ${futureX.length} future column(s) were given`);
    }
    const cols = futureX.map((c, j) => {
      if (c.length < h) {
        throw new ForecastInputError(`regression: column '${names[j]}' has ${c.length} future value(s) but the horizon is ${h}`);
      }
      return c.slice(0, h);
    });
    cols.forEach((c, j) =>
      c.forEach((v, i) => {
        if (!Number.isFinite(v)) {
          throw new ForecastInputError(`regression: column '${names[j]}' at future row ${i + 1} is ${v}; values must be finite`);
        }
      }),
    );
    return forecastLinearModel("regression", fit, cols, h, levels);
  },
};

export default regression;
