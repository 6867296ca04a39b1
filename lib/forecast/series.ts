/**
 * Input policy for the baseline engine: what the engine does with the series before any
 * method sees it. Pure functions, no I/O.
 *
 * The rules (each one is tested in tests/forecast/series.test.ts):
 *
 * 1. **Missing values** (`null`, `NaN`): leading and trailing missing values are trimmed;
 *    interior gaps are filled by linear interpolation between the nearest observed values on
 *    either side (Hyndman & Athanasopoulos, *Forecasting: Principles and Practice*, 2nd ed.,
 *    §12.9 "Dealing with missing values and outliers", which describes interpolating missing
 *    values for methods that cannot handle them). Every filled position is listed in the
 *    notes with its row. Infinite values are refused.
 * 2. **Too short**: at least {@link MIN_OBSERVATIONS} observed values are needed after trimming.
 * 3. **Season length** must be a whole number ≥ 1 (1 = no season). When the series is shorter
 *    than two full seasons (n < 2m), seasonal methods are dropped, the engine works with
 *    season 1, and a note says so. Asking explicitly for a seasonal method then is an error
 *    ("season length 12 needs at least 24 observations").
 * 4. **Horizon** must be a whole number from 1 to {@link MAX_HORIZON} and at most
 *    {@link HORIZON_PER_OBSERVATION} × n; anything beyond that is refused as absurd.
 *    When not given: the number of future rows of the explanatory columns if there are any,
 *    else 2m for seasonal data (m after rule 3) and 10 otherwise (the default of R's `forecast()`).
 * 5. **Constant series**: only the methods in {@link CONSTANT_SAFE_METHODS} are used
 *    (MASE's scale is zero, so there is nothing to select on; automatic selection takes
 *    `naive`, which forecasts the constant). Asking for another method is an error.
 * 6. **Zeros or negatives**: `holt-winters-multiplicative` is not used (it divides by the
 *    level and seasonal indices); a note says so when it would otherwise have been a candidate.
 * 7. **Explanatory columns**: used only by `regression`. A missing explanatory cell within
 *    the observed rows, or fewer future rows than the horizon, makes `regression` unavailable
 *    (the reason is in `regressionProblem`, and automatic selection lists it against
 *    `regression`); it never stops the other methods.
 */
import { ForecastInputError, type Method, type MethodId } from "./types";

/** Fewest observed values the engine accepts (MASE's naive scale needs one difference). */
export const MIN_OBSERVATIONS = 2;
/** Largest horizon accepted, whatever the length of the series. */
export const MAX_HORIZON = 1000;
/** The horizon may be at most this many times the number of observations. */
export const HORIZON_PER_OBSERVATION = 10;
/** Methods that give a sensible answer on a constant series. */
export const CONSTANT_SAFE_METHODS: readonly MethodId[] = [
  "naive",
  "seasonal-naive",
  "drift",
  "moving-average",
  "weighted-moving-average",
  "linear-trend",
];

/** Raw series as read from a file or a form. */
export interface RawSeries {
  /** Observations in time order; `null` or NaN marks a missing value. */
  readonly y: readonly (number | null)[];
  /** Row label of each observation for notes (e.g. CSV row numbers); defaults to 1-based positions. */
  readonly rows?: readonly number[];
  /** Explanatory columns aligned with `y` (`null` where missing). */
  readonly x?: readonly (readonly (number | null)[])[];
  readonly xNames?: readonly string[];
  /** Future values of the explanatory columns. */
  readonly futureX?: readonly (readonly number[])[];
}

/** Options for {@link prepareSeries}. */
export interface PrepareOptions {
  /** Season length m (default 1). */
  readonly season?: number;
  /** Forecast horizon (default: see rule 4 in the module comment). */
  readonly horizon?: number;
}

/** A series ready for the methods, with everything the policy decided. */
export interface PreparedSeries {
  /** Finite observations after trimming and interpolation. */
  readonly y: readonly number[];
  /** Season length the methods use (1 after the short-series fallback). */
  readonly season: number;
  /** Season length asked for. */
  readonly requestedSeason: number;
  readonly horizon: number;
  /** Explanatory columns for `regression` (trimmed like y), if usable. */
  readonly x?: readonly (readonly number[])[];
  readonly xNames?: readonly string[];
  /** First `horizon` future rows of the explanatory columns, if usable. */
  readonly futureX?: readonly (readonly number[])[];
  /** Why `regression` cannot be used, when explanatory columns were given but are not usable. */
  readonly regressionProblem?: string;
  /** Positions in `y` that were filled by interpolation. */
  readonly filled: readonly number[];
  /** Number of leading and trailing missing values trimmed. */
  readonly trimmedStart: number;
  readonly trimmedEnd: number;
  readonly constant: boolean;
  /** Whether every value is strictly positive. */
  readonly positive: boolean;
  /** Notes for people, in the order the rules were applied. */
  readonly notes: readonly string[];
}

const isObserved = (v: number | null): v is number => v !== null && !Number.isNaN(v);

/**
 * Checks a season length: a whole number ≥ 1.
 * @throws ForecastInputError when it is not.
 */
export function checkSeason(season: number): number {
  if (!Number.isInteger(season) || season < 1) {
    throw new ForecastInputError(`season length must be a whole number of at least 1 (got ${season})`);
  }
  return season;
}

/**
 * Checks a horizon against rule 4 (1 ≤ h ≤ min(MAX_HORIZON, HORIZON_PER_OBSERVATION · n)).
 * @throws ForecastInputError naming the limit that was broken.
 */
export function checkHorizon(h: number, n: number): number {
  if (!Number.isInteger(h) || h < 1) {
    throw new ForecastInputError(`horizon must be a whole number of at least 1 (got ${h})`);
  }
  if (h > MAX_HORIZON) {
    throw new ForecastInputError(`horizon ${h} is above the maximum of ${MAX_HORIZON} steps`);
  }
  if (h > HORIZON_PER_OBSERVATION * n) {
    throw new ForecastInputError(
      `horizon ${h} is more than ${HORIZON_PER_OBSERVATION} times the ${n} observations; forecast at most ${HORIZON_PER_OBSERVATION * n} steps`,
    );
  }
  return h;
}

/** Default horizon (rule 4). */
export function defaultHorizon(season: number, futureRows: number): number {
  if (futureRows > 0) return futureRows;
  return season > 1 ? 2 * season : 10;
}

/**
 * Linear interpolation over interior gaps: a missing value (`null` or NaN) at position k between
 * observed values at i < k < j becomes y_i + (y_j − y_i)·(k − i)/(j − i), as R's
 * `approx(method = "linear")` (FPP §12.9 describes interpolating missing values this way).
 * Leading and trailing missing values have no neighbour on one side and stay NaN (callers trim
 * them first). Returns the filled copy and the filled positions. O(n); never throws.
 * @example interpolateGaps([0, null, 4]) → { y: [0, 2, 4], filled: [1] }
 */
export function interpolateGaps(values: readonly (number | null)[]): { y: number[]; filled: number[] } {
  const y: number[] = new Array<number>(values.length).fill(NaN);
  const filled: number[] = [];
  let last = -1;
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (!isObserved(v)) continue;
    if (last >= 0 && i - last > 1) {
      const a = y[last];
      for (let k = last + 1; k < i; k++) {
        y[k] = a + ((v - a) * (k - last)) / (i - last);
        filled.push(k);
      }
    }
    y[i] = v;
    last = i;
  }
  return { y, filled };
}

function describeRows(rows: readonly number[]): string {
  if (rows.length <= 6) return rows.join(", ");
  return `${rows.slice(0, 5).join(", ")} and ${rows.length - 5} more`;
}

/**
 * Applies the input policy (module comment, rules 1–7) to a raw series.
 *
 * @throws ForecastInputError when the series is unusable: fewer than {@link MIN_OBSERVATIONS}
 *   observed values, an infinite value, a bad season length or horizon. The message says what
 *   to fix.
 */
export function prepareSeries(raw: RawSeries, options: PrepareOptions = {}): PreparedSeries {
  const requestedSeason = checkSeason(options.season ?? 1);
  const rowsOf = raw.rows ?? raw.y.map((_, i) => i + 1);
  const notes: string[] = [];

  raw.y.forEach((v, i) => {
    if (v !== null && !Number.isNaN(v) && !Number.isFinite(v)) {
      throw new ForecastInputError(`row ${rowsOf[i]}: value ${v} is not finite`);
    }
  });

  let start = 0;
  while (start < raw.y.length && !isObserved(raw.y[start])) start++;
  let end = raw.y.length;
  while (end > start && !isObserved(raw.y[end - 1])) end--;
  const observed = raw.y.slice(start, end).filter(isObserved).length;
  if (observed < MIN_OBSERVATIONS) {
    throw new ForecastInputError(
      `the series has ${observed} observed value${observed === 1 ? "" : "s"}; at least ${MIN_OBSERVATIONS} are needed`,
    );
  }
  const trimmedStart = start;
  const trimmedEnd = raw.y.length - end;
  if (trimmedStart > 0) notes.push(`${trimmedStart} leading missing value${trimmedStart === 1 ? "" : "s"} trimmed`);
  if (trimmedEnd > 0) notes.push(`${trimmedEnd} trailing missing value${trimmedEnd === 1 ? "" : "s"} trimmed`);

  const { y, filled } = interpolateGaps(raw.y.slice(start, end));
  if (filled.length > 0) {
    notes.push(
      `${filled.length} missing value${filled.length === 1 ? "" : "s"} filled by linear interpolation (row${filled.length === 1 ? "" : "s"} ${describeRows(filled.map((k) => rowsOf[start + k]))})`,
    );
  }
  const n = y.length;

  let season = requestedSeason;
  if (season > 1 && n < 2 * season) {
    notes.push(
      `season length ${season} needs at least ${2 * season} observations for seasonal methods (have ${n}); non-seasonal methods only`,
    );
    season = 1;
  }

  // Explanatory columns.
  let x: number[][] | undefined;
  let futureX: number[][] | undefined;
  let regressionProblem: string | undefined;
  const hasX = raw.x !== undefined && raw.x.length > 0;
  const futureRows = hasX ? Math.min(...(raw.futureX ?? raw.x!.map(() => [])).map((c) => c.length)) : 0;
  const horizon = checkHorizon(options.horizon ?? defaultHorizon(season, futureRows), n);

  if (hasX) {
    const names = raw.xNames ?? raw.x!.map((_, j) => `x${j + 1}`);
    const cols = raw.x!.map((c) => c.slice(start, end));
    for (let j = 0; j < cols.length && regressionProblem === undefined; j++) {
      const k = cols[j].findIndex((v) => !isObserved(v));
      if (k >= 0) regressionProblem = `column '${names[j]}' is empty in row ${rowsOf[start + k]}`;
    }
    if (regressionProblem === undefined && futureRows < horizon) {
      regressionProblem = `regression needs future values of the explanatory columns for each of the ${horizon} steps (the file has ${futureRows} future row${futureRows === 1 ? "" : "s"})`;
    }
    if (regressionProblem === undefined) {
      x = cols as number[][];
      futureX = raw.futureX!.map((c) => c.slice(0, horizon));
    }
  }

  const first = y[0];
  const constant = y.every((v) => v === first);
  const positive = y.every((v) => v > 0);
  if (constant) {
    notes.push(`the series is constant (every value is ${first}); only methods that cope with that are used`);
  }
  if (!positive && season > 1) {
    notes.push("the series has zeros or negative values; holt-winters-multiplicative is not used");
  }

  return {
    y,
    season,
    requestedSeason,
    horizon,
    x,
    xNames: x ? (raw.xNames ?? raw.x!.map((_, j) => `x${j + 1}`)) : undefined,
    futureX,
    regressionProblem,
    filled,
    trimmedStart,
    trimmedEnd,
    constant,
    positive,
    notes,
  };
}

/**
 * Whether a method may be used on a prepared series, and if not, why (for error messages and
 * the candidate list). Combines the policy rules above with the method's own
 * `minLength`/`applicable`.
 */
export function methodProblem(method: Method, s: PreparedSeries): string | undefined {
  const id = method.id;
  if (s.constant && !CONSTANT_SAFE_METHODS.includes(id)) {
    return `${id} is not used on a constant series (use one of ${CONSTANT_SAFE_METHODS.join(", ")})`;
  }
  if (id === "holt-winters-multiplicative" && !s.positive) {
    return `${id} needs every value above zero`;
  }
  if (id === "regression" && !s.x) {
    return s.regressionProblem ?? "regression needs explanatory columns";
  }
  const seasonalOnly = id === "seasonal-naive" || id === "holt-winters-additive" || id === "holt-winters-multiplicative";
  if (seasonalOnly && s.season === 1) {
    return s.requestedSeason > 1
      ? `season length ${s.requestedSeason} needs at least ${2 * s.requestedSeason} observations (have ${s.y.length})`
      : `${id} needs a season length above 1 (--season)`;
  }
  const need = method.minLength(s.season);
  if (s.y.length < need) return `${id} needs at least ${need} observations (have ${s.y.length})`;
  if (!method.applicable(s.y, s.season, s.x !== undefined)) {
    return `${id} does not apply to this series`;
  }
  return undefined;
}
