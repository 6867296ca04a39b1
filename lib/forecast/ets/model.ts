/**
 * What names a member of the additive-error exponential-smoothing family and the checks every
 * part of it shares: the member's trend and season, the bounds of its smoothing parameters,
 * the names it accepts in `fixed`, how many values it estimates, the shortest series it
 * accepts, and the horizon check (series: checkSeriesFor in ../simple.ts). Pure TypeScript.
 *
 * Bounds are R forecast::ets's defaults ("usual" region; Hyndman et al. 2008 §5.2).
 */
import { ForecastInputError } from "../types";

/** Trend component: none, additive, additive damped. */
export type TrendKind = "N" | "A" | "Ad";
/** Seasonal component: none, additive, multiplicative. */
export type SeasonKind = "N" | "A" | "M";

/** Which member of the family. Errors are always additive. */
export interface EtsModel {
  readonly trend: TrendKind;
  readonly season: SeasonKind;
}

/** Lower bound of alpha when estimated (R forecast::ets default). */
export const ALPHA_LOWER = 1e-4;
/** Upper bound of alpha when estimated (R forecast::ets default). */
export const ALPHA_UPPER = 0.9999;
/** Lower bound of beta when estimated; beta is also kept ≤ alpha (R forecast::ets "usual" bounds). */
export const BETA_LOWER = 1e-4;
/** Upper bound of beta when estimated. */
export const BETA_UPPER = 0.9999;
/** Lower bound of gamma when estimated; gamma is also kept ≤ 1 − alpha. */
export const GAMMA_LOWER = 1e-4;
/** Upper bound of gamma when estimated. */
export const GAMMA_UPPER = 0.9999;
/** Lower bound of phi when estimated (R forecast::ets default). */
export const PHI_LOWER = 0.8;
/** Upper bound of phi when estimated (R forecast::ets default). */
export const PHI_UPPER = 0.98;

/** Largest horizon accepted (an absurd horizon is refused rather than computed). */
export const MAX_HORIZON = 10000;

/** Names of the smoothing parameters and initial states a model accepts in `fixed`. */
export function etsKeys(model: EtsModel, m: number): { params: string[]; states: string[] } {
  const params = ["alpha"];
  const states = ["l0"];
  if (model.trend !== "N") {
    params.push("beta");
    states.push("b0");
  }
  if (model.season !== "N") {
    params.push("gamma");
    for (let i = 1; i <= m; i++) states.push(`s${i}`);
  }
  if (model.trend === "Ad") params.push("phi");
  return { params, states };
}

/** Number of parameters estimated when nothing is fixed: smoothing parameters + initial states (m − 1 free seasonal states). */
export function etsParameterCount(model: EtsModel, m: number): number {
  let k = 2; // alpha, l0
  if (model.trend !== "N") k += 2;
  if (model.trend === "Ad") k += 1;
  if (model.season !== "N") k += 1 + (m - 1);
  return k;
}

/**
 * Smallest series length accepted when everything is estimated: one more observation than
 * estimated parameters (so that σ² has a degree of freedom) and, for seasonal models, at
 * least two full seasons.
 */
export function etsMinLength(model: EtsModel, season: number): number {
  const m = model.season === "N" ? 1 : season;
  const k = etsParameterCount(model, m);
  return model.season === "N" ? k + 1 : Math.max(2 * m, k + 1);
}

/** Validate a horizon and interval levels. @throws ForecastInputError. */
export function checkHorizon(what: string, h: number, levels: readonly number[]): void {
  if (!Number.isInteger(h) || h < 1) throw new ForecastInputError(`${what}: the horizon must be a whole number of steps, at least 1 (got ${h})`);
  if (h > MAX_HORIZON) throw new ForecastInputError(`${what}: the horizon ${h} is beyond the ${MAX_HORIZON} steps allowed`);
  for (const lv of levels) {
    if (typeof lv !== "number" || !(lv > 0 && lv < 100)) {
      throw new ForecastInputError(`${what}: interval levels must be percentages between 0 and 100 (got ${String(lv)})`);
    }
  }
}
