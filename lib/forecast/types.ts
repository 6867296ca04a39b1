/**
 * Shared types of the baseline-forecast engine (pure TypeScript, no framework imports).
 *
 * Life cycle, as in R's `forecast` package: `fit` → `forecast(fit, h)` → `accuracy(...)`.
 * A fit is a plain object; forecasting turns it into means and interval bounds.
 */

/** Method ids (kebab-case, published method names). */
export const METHOD_IDS = [
  "naive",
  "seasonal-naive",
  "drift",
  "moving-average",
  "weighted-moving-average",
  "ses",
  "holt",
  "damped-holt",
  "holt-winters-additive",
  "holt-winters-multiplicative",
  "ets",
  "ets-weighted",
  "theta",
  "linear-trend",
  "regression",
  "arima",
  "bass",
] as const;
export type MethodId = (typeof METHOD_IDS)[number];

/** What every method's `fit` receives. `y` has no missing values (the caller validated it). */
export interface FitInput {
  /** Observations in time order; finite numbers only. */
  readonly y: readonly number[];
  /** Season length m (1 = no season). */
  readonly season: number;
  /**
   * Explanatory columns for `regression`: one array per column, each of length y.length.
   * Other methods ignore it.
   */
  readonly x?: readonly (readonly number[])[];
  /** Column names of `x`, for reporting coefficients. */
  readonly xNames?: readonly string[];
  /**
   * Fixed parameters (alpha, beta, gamma, phi, window, l0, b0, …). A parameter given here is
   * held fixed; every other parameter is estimated ("estimated unless given").
   */
  readonly fixed?: Readonly<Record<string, number>>;
  /**
   * Optional warm start for estimation, with the keys of `fixed` (parameters and initial
   * states): typically the estimates of the same model on a prefix of `y` (automatic
   * selection passes those of its forecast origins). Methods that support it (the
   * exponential smoothing models with several free parameters) run their local search from
   * this point alone instead of scoring their grid of start candidates; others ignore it.
   * It only moves the search's starting point, never fixes a value.
   */
  readonly start?: Readonly<Record<string, number>>;
}

/** A fitted model: plain data, no closures, JSON-serialisable. */
export interface Fit {
  readonly method: MethodId;
  /** Parameters with their published names (alpha, beta, gamma, phi, window, coefficients…). */
  readonly parameters: Readonly<Record<string, number>>;
  /** Final states needed to forecast (level, trend, seasonal indices, last values…). */
  readonly state: Readonly<Record<string, number | readonly number[]>>;
  /** One-step in-sample fitted values, same length as y; NaN where the method gives none. */
  readonly fitted: readonly number[];
  /** y − fitted (NaN where fitted is NaN). */
  readonly residuals: readonly number[];
  /** Variance of the one-step errors used for intervals (method's own estimator). */
  readonly sigma2: number;
  /** Number of observations fitted and season length used. */
  readonly n: number;
  readonly season: number;
  /** Sum of squared one-step errors over the points that have a fitted value. */
  readonly sse: number;
  /** Notes for people (fallbacks taken, bounds hit, …). */
  readonly notes: readonly string[];
  /**
   * Number of values estimated from the series: parameters, initial states and seasonal indices
   * (the Akaike-weighted mean for `ets-weighted`). The automatic combination's empirical intervals
   * use n − estimated residual degrees of freedom (docs/methods.md §20). Optional: the methods that
   * can be combination members (those with `originForecasts`) give it.
   */
  readonly estimated?: number;
  /**
   * Names of the explanatory columns a `regression` fit used, in the order its forecast
   * expects `futureX` (optional; other methods leave it out).
   */
  readonly xNames?: readonly string[];
}

/** Point forecasts and prediction intervals for steps 1..h. */
export interface Forecast {
  readonly method: MethodId;
  readonly mean: readonly number[];
  /** Interval levels in percent, e.g. [80, 95]. */
  readonly levels: readonly number[];
  /** lower[String(level)][i] is the lower bound for step i + 1. */
  readonly lower: Readonly<Record<string, readonly number[]>>;
  readonly upper: Readonly<Record<string, readonly number[]>>;
  /** Standard deviation of the forecast error per step where the method has one (else NaN). */
  readonly sd: readonly number[];
}

/** Future values of the explanatory columns, one array per column, each of length h. */
export type FutureX = readonly (readonly number[])[];

/** One method: how to fit it and how to forecast from the fit. */
export interface Method {
  readonly id: MethodId;
  /** Smallest number of observations the method needs for the given season length. */
  minLength(season: number): number;
  /** Whether the method applies (e.g. multiplicative needs y > 0, seasonal needs m > 1). */
  applicable(y: readonly number[], season: number, hasX: boolean): boolean;
  fit(input: FitInput): Fit;
  forecast(fit: Fit, h: number, levels: readonly number[], futureX?: FutureX): Forecast;
  /**
   * Optional: the point forecasts for steps 1..h that the fit, with its parameters held, makes
   * from every origin t = 0..n−1 of the series it was fitted to (row t uses y_1..y_t only
   * through the recursions): the in-sample multi-step forecasts behind the combination's
   * empirical intervals (lib/forecast/combination.ts). `y` is the fitted series.
   */
  originForecasts?(fit: Fit, y: readonly number[], h: number): number[][];
}

/** Thrown for input a method cannot use; the message says what to fix. */
export class ForecastInputError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "ForecastInputError";
  }
}
