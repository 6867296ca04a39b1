/**
 * The named exponential-smoothing methods (ses, holt, damped-holt, holt-winters-additive,
 * holt-winters-multiplicative) as `Method`s (lib/forecast/types.ts), all made by one factory
 * from their member: least-squares fit (./least-squares.ts), forecasts and intervals
 * (./forecast.ts). Pure TypeScript.
 */
import type { Fit, FitInput, Forecast, Method, MethodId } from "../types";
import { etsForecast } from "./forecast";
import { fitEts, type EtsFitResult } from "./least-squares";
import { etsMinLength, type EtsModel } from "./model";

/**
 * Build the project's `Fit` (lib/forecast/types.ts) from an ETS fit: parameters alpha
 * (beta, gamma, phi when the model has them) in the error-correction form; state holds the
 * final level, trend and next m seasonal states (what forecasting needs), the initial states
 * l0, b0, initialSeason, and `estimated` (the k of σ² = SSE/(n − k)). Never throws.
 */
export function toFit(method: MethodId, r: EtsFitResult): Fit {
  const parameters: Record<string, number> = { alpha: r.alpha };
  const state: Record<string, number | readonly number[]> = { level: r.level, l0: r.l0 };
  if (r.model.trend !== "N") {
    parameters.beta = r.beta;
    state.trend = r.trend;
    state.b0 = r.b0;
  }
  if (r.model.season !== "N") {
    parameters.gamma = r.gamma;
    state.season = r.season;
    state.initialSeason = r.initialSeason;
  }
  if (r.model.trend === "Ad") parameters.phi = r.phi;
  state.estimated = r.estimated;
  return {
    method,
    parameters,
    state,
    fitted: r.fitted,
    residuals: r.residuals,
    sigma2: r.sigma2,
    n: r.fitted.length,
    season: r.m,
    sse: r.sse,
    notes: r.notes,
  };
}

/**
 * The `Method` of one additive-error member. Seasonal members need an integer season m ≥ 2 (and
 * minLength is infinite otherwise); a multiplicative season also needs every observation above
 * zero. `fit` estimates everything not in `fixed` (warm-started from `start` when it gives every
 * free value, see fitEts); `forecast` as etsForecast.
 * @throws ForecastInputError from fit for unusable input, from forecast for a bad horizon or level.
 */
export function etsMethod(id: MethodId, model: EtsModel): Method {
  const seasonal = model.season !== "N";
  const seasonOk = (season: number): boolean => !seasonal || (Number.isInteger(season) && season >= 2);
  return {
    id,
    minLength(season: number): number {
      return seasonOk(season) ? etsMinLength(model, season) : Number.POSITIVE_INFINITY;
    },
    applicable(y: readonly number[], season: number): boolean {
      return seasonOk(season) && y.length >= etsMinLength(model, season) && (model.season !== "M" || y.every((v) => v > 0));
    },
    fit(input: FitInput): Fit {
      return toFit(id, fitEts(id, model, input.y, input.season, input.fixed, input.start));
    },
    forecast(fit: Fit, h: number, levels: readonly number[]): Forecast {
      return etsForecast(id, id, model, fit, h, levels);
    },
  };
}
