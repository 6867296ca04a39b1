/**
 * `baseline()`: the one call that turns a raw series into a baseline forecast — input policy
 * (lib/forecast/series.ts), method choice (a named method; by default for "auto" the
 * combination of Akaike-weighted ETS and Theta, lib/forecast/combination.ts; on request, selection by
 * rolling-origin MASE, lib/forecast/select.ts), fit, forecast with prediction intervals, and
 * in-sample accuracy. The command line and the web app both call it. Pure: no I/O.
 *
 * Fit, forecast and accuracy stay separate steps inside (as in R's `forecast` package,
 * Hyndman & Athanasopoulos, *Forecasting: Principles and Practice*); this function only
 * composes them and returns one plain, JSON-ready object (NaN and infinities become null).
 */
import { accuracy } from "./accuracy";
import { combineForecasts, combineTotals, type CombinationMember } from "./combination";
import { METHODS } from "./registry";
import { prepareSeries, methodProblem, type RawSeries, type PreparedSeries } from "./series";
import { selectMethod, DEFAULT_ORIGINS, DEFAULT_STEP, DEFAULT_COMBINE, DEFAULT_REFIT, type Selection } from "./select";
import { forecastTotal, type TotalForecast } from "./total";
import type { AnalogueFit, MarketPotential, SimulatedQuantity } from "./launch";
import { ForecastInputError, METHOD_IDS, type Fit, type Forecast, type Method, type MethodId } from "./types";

/**
 * Registered methods that automatic selection leaves out unless `methods` names them, with the
 * reason shown in the candidate list. `arima` (order chosen by AICc over p, q ≤ 3 at every fit)
 * took 1.5–5 s per series on the benchmark — more than R's ets() for all 23 series together —
 * and did not improve the benchmark's accuracy (bench/forecast-bench.ts, --include arima);
 * it is available by name (`method: "arima"`).
 */
export const NOT_AUTOMATIC: Readonly<Partial<Record<MethodId, string>>> = {
  "ets-weighted": "not compared automatically (the same ETS fits as ets, weighted by AICc; the default combination's member); ask for it by name",
  arima: "not compared automatically (an order search at every origin); ask for it by name",
  bass: "not compared automatically (a diffusion curve for adoptions since launch); ask for it by name",
};

/**
 * Members of the automatic combination (docs/methods.md §20): the ETS family's members weighted by
 * AICc (Akaike weights; Kolassa 2011, IJF 27(2): `ets-weighted`) and the Theta method, equal
 * weights. On all of M3 (bench/m3-coverage.ts) their combination beat each of them, the same with
 * the one member chosen by AICc (`ets`; sMAPE 12.58 → 12.44, MASE 1.355 → 1.341, 3 Dec 2026) and
 * the triple with the damped trend on seasonally adjusted data. Adding automatic ARIMA (on the
 * seasonally adjusted series; Petropoulos & Svetunkov 2020, IJF 36(1), 110–115) to ets and theta
 * lowered sMAPE (12.58 → 12.51) but raised MASE (1.355 → 1.358) and tripled the CPU time, so it is
 * not a default member (`members` or the bench's --members can add it).
 */
export const COMBINATION_MEMBERS: readonly MethodId[] = ["ets-weighted", "theta"];

/** Interval levels used when none are given. */
export const DEFAULT_LEVELS: readonly number[] = [80, 95];

/** Options for {@link baseline}. */
export interface BaselineOptions {
  /** Season length m (default 1). */
  readonly season?: number;
  /** Forecast horizon (default: see lib/forecast/series.ts, rule 4). */
  readonly horizon?: number;
  /** "auto" (default) or a method id. */
  readonly method?: "auto" | MethodId;
  /** Interval levels in percent, each strictly between 0 and 100 (default 80 and 95). */
  readonly levels?: readonly number[];
  /** Fixed parameters for a named method (alpha, beta, gamma, phi, window, …). */
  readonly fixed?: Readonly<Record<string, number>>;
  /**
   * What "auto" does: "combination" (default) = the equal-weight combination of
   * {@link COMBINATION_MEMBERS}; "best" / "combine" = rolling-origin selection among `methods`
   * (lib/forecast/select.ts), also used when `methods` is given without a strategy (with
   * "combination" and `methods`, the members are taken from `methods`).
   */
  readonly strategy?: "combination" | "best" | "combine";
  /** The combination's members (default {@link COMBINATION_MEMBERS}); for comparing member sets. */
  readonly members?: readonly MethodId[];
  /** Selection settings for the rolling-origin strategies (number of origins, their spacing, combination). */
  readonly origins?: number;
  readonly step?: number;
  readonly combine?: number;
  readonly refit?: "full" | "update";
  /** Candidate methods (default: every registered method). */
  readonly methods?: readonly Method[];
  /** Also give the forecast of the total over periods `totalFrom`..horizon (lib/forecast/total.ts). */
  readonly total?: boolean;
  /** First period a of the total (1 ≤ a ≤ horizon; default 1: the total of the next `horizon` periods). */
  readonly totalFrom?: number;
}

/** The forecast of the sum of the values in periods from..to after the history (JSON-ready; see lib/forecast/total.ts). */
export interface TotalResult {
  /** First period summed (1: the next period; absent in results stored before it existed = 1). */
  readonly from?: number;
  /** Last period summed (the horizon). */
  readonly to?: number;
  readonly mean: number | null;
  readonly lower: Record<string, number | null>;
  readonly upper: Record<string, number | null>;
  /** How the distribution of the total was made. */
  readonly how: string;
}

/** One forecast step. Bounds are keyed by level as a string ("80", "95"). */
export interface ForecastStep {
  readonly step: number;
  readonly mean: number | null;
  readonly lower: Record<string, number | null>;
  readonly upper: Record<string, number | null>;
}

/** In-sample accuracy of the one-step fitted values (null where undefined, e.g. MAPE with zeros). */
export interface InsampleAccuracy {
  readonly mae: number | null;
  readonly rmse: number | null;
  readonly mape: number | null;
  readonly smape: number | null;
  readonly mase: number | null;
}

/** A candidate of automatic selection: its rolling-origin MASE, or why it has none. */
export interface CandidateResult {
  readonly method: MethodId;
  readonly mase: number | null;
  readonly error?: string;
}

/** The result of {@link baseline}; JSON-ready. */
export interface BaselineResult {
  /** The method used; for a combination, "combination" (its members are in `combination`). */
  readonly method: MethodId | "combination";
  /** Estimated (or fixed) parameters by their published names; for a combination, the weights. */
  readonly parameters: Record<string, number | null>;
  /** Season length the methods used (1 after the short-series fallback). */
  readonly season: number;
  readonly horizon: number;
  readonly levels: readonly number[];
  readonly forecast: readonly ForecastStep[];
  /** One-step in-sample fitted values, aligned with the prepared series (null where none). */
  readonly fitted: readonly (number | null)[];
  readonly accuracy: { readonly insample: InsampleAccuracy };
  /**
   * Every candidate's rolling-origin MASE (rolling-origin selection only), best first; empty for
   * the default combination, which scores no candidates.
   */
  readonly candidates?: readonly CandidateResult[];
  /** Members of a combination with their own parameters (only when method is "combination"). */
  readonly combination?: readonly { readonly method: MethodId; readonly parameters: Record<string, number | null> }[];
  /** The total over periods totalFrom..horizon, when asked for (`total: true`). */
  readonly total?: TotalResult;
  /** A launch baseline's analogues, carried p and q, and market potential (lib/forecast/launch.ts). */
  readonly launch?: {
    readonly analogues: readonly AnalogueFit[];
    readonly p: SimulatedQuantity;
    readonly q: SimulatedQuantity;
    readonly market: MarketPotential;
    readonly draws: number;
  };
  readonly notes: readonly string[];
}

const finite = (v: number): number | null => (Number.isFinite(v) ? v : null);

function checkLevels(levels: readonly number[]): number[] {
  if (levels.length === 0) throw new ForecastInputError("at least one interval level is needed");
  for (const l of levels) {
    if (!Number.isFinite(l) || l <= 0 || l >= 100) {
      throw new ForecastInputError(`interval level ${l} must be a percentage strictly between 0 and 100`);
    }
  }
  return [...new Set(levels)].sort((a, b) => a - b);
}

function fitOne(
  method: Method,
  s: PreparedSeries,
  fixed?: Readonly<Record<string, number>>,
  start?: Readonly<Record<string, number>>,
): Fit {
  return method.fit({ y: s.y, season: s.season, x: s.x, xNames: s.xNames, fixed, ...(start ? { start } : {}) });
}

function insample(s: PreparedSeries, fitted: readonly number[]): InsampleAccuracy {
  const actual: number[] = [];
  const pred: number[] = [];
  fitted.forEach((f, i) => {
    if (Number.isFinite(f)) {
      actual.push(s.y[i]);
      pred.push(f);
    }
  });
  if (actual.length === 0) return { mae: null, rmse: null, mape: null, smape: null, mase: null };
  const a = accuracy(actual, pred, { training: s.y, season: s.season });
  return { mae: finite(a.mae), rmse: finite(a.rmse), mape: finite(a.mape), smape: finite(a.smape), mase: finite(a.mase) };
}

function params(fit: Fit): Record<string, number | null> {
  const out: Record<string, number | null> = {};
  for (const [k, v] of Object.entries(fit.parameters)) out[k] = finite(v);
  return out;
}

/**
 * The total over periods from..h; for a combination, the members' totals averaged quantile by
 * quantile, as its step bounds (Lichtendahl et al. 2013).
 */
function totalOf(members: readonly { method: Method; fit: Fit }[], s: PreparedSeries, levels: readonly number[], from: number): TotalResult {
  const t = members.map(({ method, fit }) => forecastTotal(fit, method, s.horizon, levels, s.futureX, from));
  const avg = (get: (x: TotalForecast) => number) => finite(t.reduce((a, x) => a + get(x), 0) / t.length);
  const lower: Record<string, number | null> = {};
  const upper: Record<string, number | null> = {};
  for (const l of levels) {
    lower[String(l)] = avg((x) => x.lower[String(l)]);
    upper[String(l)] = avg((x) => x.upper[String(l)]);
  }
  return { from, to: s.horizon, mean: avg((x) => x.mean), lower, upper, how: t.map((x) => x.how).join("; ") };
}

function steps(fc: Forecast, levels: readonly number[]): ForecastStep[] {
  return fc.mean.map((m, i) => {
    const lower: Record<string, number | null> = {};
    const upper: Record<string, number | null> = {};
    for (const l of levels) {
      lower[String(l)] = finite(fc.lower[String(l)]?.[i] ?? NaN);
      upper[String(l)] = finite(fc.upper[String(l)]?.[i] ?? NaN);
    }
    return { step: i + 1, mean: finite(m), lower, upper };
  });
}

/**
 * Forecasts a series with a named method or by automatic selection.
 *
 * @param input the raw series (values with `null` for missing, and optional explanatory
 *   columns), or just the values.
 * @throws ForecastInputError for unusable input (policy in lib/forecast/series.ts), a method
 *   that does not apply to the series (the message says why), bad levels, or `fixed` without a
 *   named method. A named method that fails while fitting throws its own error.
 * Empty/NaN policy: as lib/forecast/series.ts (missing values trimmed or interpolated, noted).
 */
export function baseline(input: RawSeries | readonly (number | null)[], options: BaselineOptions = {}): BaselineResult {
  const raw: RawSeries = Array.isArray(input) ? { y: input as readonly (number | null)[] } : (input as RawSeries);
  const levels = checkLevels(options.levels ?? DEFAULT_LEVELS);
  const s = prepareSeries(raw, { season: options.season, horizon: options.horizon });
  const from = options.totalFrom ?? 1;
  if (options.total && !(Number.isInteger(from) && from >= 1 && from <= s.horizon)) {
    throw new ForecastInputError(`the total's first period must be a whole number from 1 to the horizon ${s.horizon} (got ${from})`);
  }
  const notes = [...s.notes];
  const which = options.method ?? "auto";
  const methods = options.methods ?? (which === "auto" ? METHODS.filter((m) => !(m.id in NOT_AUTOMATIC)) : METHODS);

  if (which !== "auto") {
    if (!(METHOD_IDS as readonly string[]).includes(which)) {
      throw new ForecastInputError(`unknown method '${which}' (use auto or one of: ${METHOD_IDS.join(", ")})`);
    }
    const method = methods.find((m) => m.id === which);
    if (!method) throw new ForecastInputError(`method '${which}' is not available yet`);
    const problem = methodProblem(method, s);
    if (problem) throw new ForecastInputError(problem);
    const fit = fitOne(method, s, options.fixed);
    const fc = method.forecast(fit, s.horizon, levels, s.futureX);
    return {
      method: method.id,
      parameters: params(fit),
      season: s.season,
      horizon: s.horizon,
      levels,
      forecast: steps(fc, levels),
      fitted: fit.fitted.map(finite),
      accuracy: { insample: insample(s, fit.fitted) },
      ...(options.total ? { total: totalOf([{ method, fit }], s, levels, from) } : {}),
      notes: [...notes, ...fit.notes],
    };
  }

  if (options.fixed && Object.keys(options.fixed).length > 0) {
    throw new ForecastInputError("fixed parameters need a named method, not auto");
  }

  const strategy = options.strategy ?? (options.methods ? "best" : "combination");
  if (strategy === "combination" && !s.constant) {
    const combined = combination(s, levels, options.total === true ? from : null, options.methods ?? METHODS, options.members ?? COMBINATION_MEMBERS);
    if (combined) return { ...combined, notes: [...notes, ...combined.notes] };
    notes.push("no member of the combination could be fitted: rolling-origin selection used instead");
  }

  // Which candidates apply at all.
  const usable: Method[] = [];
  const refused: CandidateResult[] = [];
  for (const m of methods) {
    const problem = methodProblem(m, s);
    if (problem) refused.push({ method: m.id, mase: null, error: problem });
    else usable.push(m);
  }

  let chosen: MethodId[];
  // Estimates of each candidate at the forecast origins: warm starts for the whole-series fit.
  let estimates: Selection["estimates"];
  let candidates: CandidateResult[] = [];
  if (s.constant) {
    const naive = usable.find((m) => m.id === "naive") ?? usable[0];
    if (!naive) throw new ForecastInputError("no method applies to this series");
    chosen = [naive.id];
    notes.push(`MASE is undefined on a constant series, so ${naive.id} was used without comparison`);
  } else {
    if (usable.length === 0) throw new ForecastInputError("no method applies to this series");
    const sel = selectMethod(
      usable,
      { y: s.y, season: s.season, horizon: s.horizon, x: s.x, xNames: s.xNames },
      {
        origins: options.origins ?? DEFAULT_ORIGINS,
        step: options.step ?? DEFAULT_STEP,
        strategy: strategy === "combine" ? "combine" : "best",
        combine: options.combine ?? DEFAULT_COMBINE,
        refit: options.refit ?? DEFAULT_REFIT,
      },
    );
    notes.push(...sel.notes);
    estimates = sel.estimates;
    if (sel.originLengths.length > 0) {
      notes.push(
        `candidates compared by rolling-origin MASE: ${sel.originLengths.length} origin${sel.originLengths.length === 1 ? "" : "s"} (training lengths ${sel.originLengths.join(", ")}), ${sel.evaluatedHorizon}-step forecasts, scaled by the ${s.season > 1 ? "seasonal naive" : "naive"} in-sample MAE`,
      );
    }
    candidates = sel.candidates.map((c) => (c.error ? { method: c.method, mase: finite(c.mase ?? NaN), error: c.error } : { method: c.method, mase: finite(c.mase ?? NaN) }));
    if (sel.chosen.length === 0) {
      // Nothing could be scored out of sample (very short series): fall back to the first usable method.
      chosen = [usable[0].id];
      notes.push(`no candidate could be evaluated out of sample; ${usable[0].id} was used`);
    } else {
      chosen = [...sel.chosen];
    }
    // Scored candidates best first (stable sort keeps the METHOD_IDS order among equals), then the unscored.
    const rank = (c: CandidateResult) => (c.mase === null ? Number.MAX_VALUE : c.mase);
    candidates.sort((a, b) => (rank(a) < rank(b) ? -1 : rank(a) > rank(b) ? 1 : 0));
    candidates.push(...refused);
    if (!options.methods) {
      for (const m of METHODS) {
        const why = NOT_AUTOMATIC[m.id];
        if (why) candidates.push({ method: m.id, mase: null, error: why });
      }
    }
  }

  // Fit the choice on the whole series (warm-started from its estimates at the origins, see
  // FitInput.start). A member that fails here is dropped with a note.
  const fits: { method: Method; fit: Fit; fc: Forecast }[] = [];
  for (const id of chosen) {
    const method = usable.find((m) => m.id === id)!;
    try {
      const fit = fitOne(method, s, undefined, estimates?.[method.id]);
      const fc = method.forecast(fit, s.horizon, levels, s.futureX);
      if (fc.mean.some((v) => !Number.isFinite(v))) throw new Error("non-finite forecast");
      fits.push({ method, fit, fc });
    } catch (e) {
      notes.push(`${id} failed on the whole series (${e instanceof Error ? e.message : String(e)})`);
    }
  }
  if (fits.length === 0) {
    // Try the remaining candidates in score order.
    for (const c of candidates) {
      if (c.mase === null || chosen.includes(c.method)) continue;
      const method = usable.find((m) => m.id === c.method)!;
      try {
        const fit = fitOne(method, s, undefined, estimates?.[method.id]);
        const fc = method.forecast(fit, s.horizon, levels, s.futureX);
        if (fc.mean.some((v) => !Number.isFinite(v))) continue;
        fits.push({ method, fit, fc });
        notes.push(`${method.id} used instead`);
        break;
      } catch {
        /* next candidate */
      }
    }
  }
  if (fits.length === 0) throw new ForecastInputError("every candidate method failed on this series");

  if (fits.length === 1) {
    const { method, fit, fc } = fits[0];
    return {
      method: method.id,
      parameters: params(fit),
      season: s.season,
      horizon: s.horizon,
      levels,
      forecast: steps(fc, levels),
      fitted: fit.fitted.map(finite),
      accuracy: { insample: insample(s, fit.fitted) },
      candidates,
      ...(options.total ? { total: totalOf([{ method, fit }], s, levels, from) } : {}),
      notes: [...notes, ...fit.notes],
    };
  }

  // Equal-weight combination: means averaged; interval bounds averaged quantile by quantile
  // (Lichtendahl, Grushka-Cockayne & Winkler (2013), "Is it better to average probabilities or
  // quantiles?", Management Science 59(7), 1594–1611).
  const k = fits.length;
  const avg = (get: (f: (typeof fits)[number]) => readonly number[]) =>
    get(fits[0]).map((_, i) => fits.reduce((acc, f) => acc + get(f)[i], 0) / k);
  const mean = avg((f) => f.fc.mean);
  const lower: Record<string, number[]> = {};
  const upper: Record<string, number[]> = {};
  for (const l of levels) {
    lower[String(l)] = avg((f) => f.fc.lower[String(l)]);
    upper[String(l)] = avg((f) => f.fc.upper[String(l)]);
  }
  const fitted = avg((f) => f.fit.fitted);
  const weights: Record<string, number> = {};
  for (const f of fits) weights[f.method.id] = 1 / k;
  notes.push(`equal-weight combination of ${fits.map((f) => f.method.id).join(", ")} (it beat each of them out of sample)`);
  return {
    method: "combination",
    parameters: weights,
    season: s.season,
    horizon: s.horizon,
    levels,
    forecast: steps({ method: fits[0].method.id, mean, levels, lower, upper, sd: mean.map(() => NaN) }, levels),
    fitted: fitted.map(finite),
    accuracy: { insample: insample(s, fitted) },
    candidates,
    combination: fits.map((f) => ({ method: f.method.id, parameters: params(f.fit) })),
    ...(options.total ? { total: totalOf(fits, s, levels, from) } : {}),
    notes: [...notes, ...fits.flatMap((f) => f.fit.notes.map((t) => `${f.method.id}: ${t}`))],
  };
}

/**
 * The default "auto": the members of {@link COMBINATION_MEMBERS} that apply and fit, each on the
 * whole series, combined by lib/forecast/combination.ts (means averaged; intervals from the
 * combination's own errors on the history, scaled to the residual degrees of freedom). One member alone is returned
 * as itself; none gives null (the caller falls back to selection).
 */
function combination(
  s: PreparedSeries,
  levels: readonly number[],
  total: number | null,
  available: readonly Method[],
  memberIds: readonly MethodId[],
): (Omit<BaselineResult, "notes"> & { notes: string[] }) | null {
  const notes: string[] = [];
  const fits: { method: Method; fit: Fit; fc: Forecast }[] = [];
  for (const id of memberIds) {
    const method = available.find((m) => m.id === id);
    if (!method?.originForecasts) {
      notes.push(`${id} left out of the combination: not among the methods given`);
      continue;
    }
    const problem = methodProblem(method, s);
    if (problem) {
      notes.push(`${id} left out of the combination: ${problem}`);
      continue;
    }
    try {
      const fit = fitOne(method, s);
      const fc = method.forecast(fit, s.horizon, levels, s.futureX);
      if (fc.mean.some((v) => !Number.isFinite(v))) throw new Error("non-finite forecast");
      fits.push({ method, fit, fc });
    } catch (e) {
      // As in selection: a member that fails never stops the baseline (no input may cause a 5xx).
      notes.push(`${id} left out of the combination (${e instanceof Error ? e.message : String(e)})`);
    }
  }
  if (fits.length === 0) return null;
  if (fits.length === 1) {
    const { method, fit, fc } = fits[0];
    return {
      method: method.id,
      parameters: params(fit),
      season: s.season,
      horizon: s.horizon,
      levels,
      forecast: steps(fc, levels),
      fitted: fit.fitted.map(finite),
      accuracy: { insample: insample(s, fit.fitted) },
      candidates: [],
      ...(total !== null ? { total: totalOf([{ method, fit }], s, levels, total) } : {}),
      notes: [...notes, ...fit.notes],
    };
  }
  // Every method with originForecasts gives Fit.estimated; a method without the count is taken as estimating nothing.
  const members: CombinationMember[] = fits.map((f) => ({ forecast: f.fc, origins: f.method.originForecasts!(f.fit, s.y, s.horizon), estimated: f.fit.estimated ?? 0 }));
  const c = combineForecasts(members, s.y, s.season, levels);
  const k = fits.length;
  const fitted = s.y.map((_, t) => fits.reduce((a, f) => a + f.fit.fitted[t], 0) / k);
  const weights: Record<string, number> = {};
  for (const f of fits) weights[f.method.id] = 1 / k;
  notes.push(
    `equal-weight combination of ${fits.map((f) => f.method.id).join(" and ")}${c.spread.some(Number.isFinite) ? `; intervals from the combination's own ${c.relative ? "relative " : ""}multi-step errors on the history, scaled by ${c.correction.toFixed(3)} for the values the members estimated` : ""}`,
    ...c.notes,
  );
  let totalResult: TotalResult | undefined;
  if (total !== null) {
    const t = fits.map(({ method, fit }) => forecastTotal(fit, method, s.horizon, levels, s.futureX, total));
    const ct = combineTotals(t, members, s.y, s.season, s.horizon, levels, total);
    const lower: Record<string, number | null> = {};
    const upper: Record<string, number | null> = {};
    for (const l of levels) {
      lower[String(l)] = finite(ct.lower[String(l)]);
      upper[String(l)] = finite(ct.upper[String(l)]);
    }
    totalResult = {
      from: total,
      to: s.horizon,
      mean: finite(ct.mean),
      lower,
      upper,
      how: `members' totals averaged quantile by quantile (${t.map((x) => x.how).join("; ")})${ct.empirical ? `, widened to the combination's own errors of the same window's sums on the history where those are wider (${ct.sums} overlapping sums, Student t with ${ct.df.toFixed(1)} effective degrees of freedom)` : ""}`,
    };
  }
  return {
    method: "combination",
    parameters: weights,
    season: s.season,
    horizon: s.horizon,
    levels,
    forecast: steps({ method: fits[0].method.id, mean: c.mean, levels, lower: c.lower, upper: c.upper, sd: c.mean.map(() => NaN) }, levels),
    fitted: fitted.map(finite),
    accuracy: { insample: insample(s, fitted) },
    // No rolling-origin scores: the key stays (the CLI's JSON shape), empty.
    candidates: [],
    combination: fits.map((f) => ({ method: f.method.id, parameters: params(f.fit) })),
    ...(totalResult ? { total: totalResult } : {}),
    notes: [...notes, ...fits.flatMap((f) => f.fit.notes.map((t) => `${f.method.id}: ${t}`))],
  };
}
