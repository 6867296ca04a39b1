/**
 * Scoring once the outcome is known: every figure of a question (raw panel, corrected panel, baseline,
 * blend, each panelist's final answer) scored against the actual value, and an accuracy
 * history over questions with an outcome with the tracking signal. The measures themselves come from
 * lib/forecast/accuracy (Hyndman & Koehler 2006). Input policy: see `index.ts`.
 */
import {
  accuracy,
  meanAbsolutePercentageError,
  meanAbsoluteScaledError,
  meanError,
  meanPercentageError,
  symmetricMape,
  relativeTrackingSignalSeries,
  type AccuracyResult,
} from "../forecast/accuracy";
import { withinMagnitude } from "./magnitude";
import { assertFinite, assertFiniteArray } from "../stats/validate";

/**
 * Tracking-signal alarm limit, in MAD units: |TS| above 4 flags a biased series. ±4 is the
 * usual textbook and practice limit; no authoritative source was found (docs/methods.md §8:
 * common practice, unverified), and some use ±3.
 */
export const TRACKING_SIGNAL_LIMIT = 4;

/** The scores of one figure on one question with an outcome. */
export interface FigureScore {
  /** Which figure: "raw panel", "corrected panel", "baseline", "blend", or a panelist's label. */
  readonly label: string;
  readonly forecast: number;
  readonly actual: number;
  /** actual − forecast (positive: the figure was too low). */
  readonly error: number;
  readonly absoluteError: number;
  /** 100·error/actual (NaN when actual = 0). */
  readonly percentError: number;
  /** |100·error/actual| (NaN when actual = 0). */
  readonly absolutePercentError: number;
  /** 200·|error| / (|actual| + |forecast|) (0 when both are 0). */
  readonly symmetricPercentError: number;
  /** |error| / MASE scale of the baseline's history (NaN without a training series). */
  readonly scaledError: number;
}

/** Options for scoring. */
export interface ScoreOptions {
  /** The baseline's history, for the MASE scale (in-sample naive MAE, Hyndman & Koehler 2006). */
  readonly training?: readonly number[];
  /** Season length for the MASE scale (default 1). */
  readonly season?: number;
}

/**
 * One figure scored against the actual value: error, absolute error, percent and absolute
 * percent error, symmetric percent error and scaled error — the one-question values of ME,
 * MAE, MPE, MAPE, sMAPE and MASE, computed by lib/forecast/accuracy on a single pair.
 *
 * @throws RangeError for a non-finite actual or forecast, or a bad training series or season.
 */
export function scoreFigure(label: string, actual: number, forecast: number, options: ScoreOptions = {}): FigureScore {
  assertFinite(actual, "scoreFigure", "actual");
  assertFinite(forecast, "scoreFigure", `forecast of ${label}`);
  const a = [actual];
  const f = [forecast];
  const error = meanError(a, f);
  return {
    label,
    forecast,
    actual,
    error,
    absoluteError: Math.abs(error),
    percentError: meanPercentageError(a, f),
    absolutePercentError: meanAbsolutePercentageError(a, f),
    symmetricPercentError: symmetricMape(a, f),
    scaledError: options.training ? meanAbsoluteScaledError(a, f, options.training, options.season ?? 1) : NaN,
  };
}

/** The figures of one question when the outcome was recorded. */
export interface OutcomeFigures {
  readonly rawPanel: number;
  readonly correctedPanel: number;
  readonly baseline: number;
  readonly blend: number;
  /** Each panelist's final answer, by pseudonym or roster id. */
  readonly panelists?: Readonly<Record<string, number>>;
}

/** Scores of every figure of one question. */
export interface OutcomeScores {
  readonly actual: number;
  readonly rawPanel: FigureScore;
  readonly correctedPanel: FigureScore;
  readonly baseline: FigureScore;
  readonly blend: FigureScore;
  /** One score per panelist, in the order of `figures.panelists`' keys. */
  readonly panelists: readonly FigureScore[];
}

/**
 * Scores every figure of a question with an outcome (docs/methods.md §14.9) with
 * {@link scoreFigure}.
 * @throws RangeError for a non-finite actual or figure (the message names the figure).
 */
export function scoreOutcome(actual: number, figures: OutcomeFigures, options: ScoreOptions = {}): OutcomeScores {
  assertFinite(actual, "scoreOutcome", "actual");
  return {
    actual,
    rawPanel: scoreFigure("raw panel", actual, figures.rawPanel, options),
    correctedPanel: scoreFigure("corrected panel", actual, figures.correctedPanel, options),
    baseline: scoreFigure("baseline", actual, figures.baseline, options),
    blend: scoreFigure("blend", actual, figures.blend, options),
    panelists: Object.entries(figures.panelists ?? {}).map(([label, v]) => scoreFigure(label, actual, v, options)),
  };
}

/** The first period whose tracking signal is beyond ±limit. */
export interface TrackingAlarm {
  /** 1-based period of the first |TS| > limit, or null when none. */
  readonly firstBreach: number | null;
  /** TS at that period (NaN when none). */
  readonly value: number;
  readonly limit: number;
}

/**
 * The first period at which |TS_t| exceeds `limit` (strictly), with TS_t from
 * lib/forecast/accuracy `relativeTrackingSignalSeries` or `trackingSignalSeries`
 * (docs/methods.md §8). NaN entries never breach.
 *
 * Input: a non-empty TS series (NaN allowed, as the series gives NaN while MAD is 0); limit > 0.
 * @throws RangeError for an empty series, an infinite entry, or a limit that is not finite and > 0.
 */
export function trackingAlarm(series: readonly number[], limit: number = TRACKING_SIGNAL_LIMIT): TrackingAlarm {
  const fn = "trackingAlarm";
  if (!Array.isArray(series) || series.length === 0) throw new RangeError(`${fn}: series is empty; at least one value is needed`);
  assertFinite(limit, fn, "limit");
  if (limit <= 0) throw new RangeError(`${fn}: limit is ${limit}; it must be greater than 0`);
  for (let i = 0; i < series.length; i++) {
    const v = series[i];
    if (v === Infinity || v === -Infinity) throw new RangeError(`${fn}: series[${i}] is ${v}; values must be finite or NaN`);
    if (Math.abs(v) > limit) return { firstBreach: i + 1, value: v, limit };
  }
  return { firstBreach: null, value: NaN, limit };
}

/** One question with an outcome in an accuracy history. */
export interface HistoryEntry {
  readonly actual: number;
  readonly rawPanel: number;
  readonly correctedPanel: number;
  readonly baseline: number;
  readonly blend: number;
}

/** Accuracy of one figure over the history. */
export interface FigureHistory {
  /** ME, MAE, MSE, RMSE, MPE, MAPE, sMAPE, MASE (NaN: no training series) and the last TS (on relative errors, as below). */
  readonly accuracy: AccuracyResult;
  /** Tracking signal on relative errors after each question with an outcome, in order (NaN for an actual of 0). */
  readonly trackingSignal: readonly number[];
  readonly alarm: TrackingAlarm;
}

/** Accuracy history of the four figures. */
export interface AccuracyHistory {
  readonly n: number;
  readonly rawPanel: FigureHistory;
  readonly correctedPanel: FigureHistory;
  readonly baseline: FigureHistory;
  readonly blend: FigureHistory;
}

const FIGURES = ["rawPanel", "correctedPanel", "baseline", "blend"] as const;

/**
 * Largest figure an accuracy history takes. A figure derived from values within the input range
 * (./magnitude.ts) can exceed it by a bias factor (at most 1e27); up to 1e100 its error, squared
 * error (1e200) and percent error against an actual ≥ 1e-12 (1e114), and their sums, stay finite.
 */
const MAX_FIGURE = 1e100;

/**
 * True when a question with an outcome can enter an accuracy history: its actual is within the input
 * range (./magnitude.ts) and every figure is finite and at most {@link MAX_FIGURE} in size.
 * Anything else (a value stored before the input rule) would make the history's sums overflow;
 * callers leave such a question out and count it.
 */
export function usableHistoryEntry(e: HistoryEntry): boolean {
  return withinMagnitude(e.actual) && FIGURES.every((k) => Number.isFinite(e[k]) && Math.abs(e[k]) <= MAX_FIGURE);
}

/**
 * Accuracy over questions with an outcome in the order the outcomes were recorded, for the raw panel, corrected panel,
 * baseline and blend: lib/forecast/accuracy `accuracy` (Hyndman & Koehler 2006) and the
 * running tracking signal with its first breach of ±limit ({@link trackingAlarm}). The questions
 * differ in size and unit, so the tracking signal is on relative errors (actual − figure)/|actual|
 * (`relativeTrackingSignalSeries`, docs/methods.md §8): raw errors would let the largest question
 * decide its sign. MASE needs a common scale and is NaN here; use MAPE/sMAPE across questions.
 *
 * Input: a non-empty array of entries with finite values.
 * @throws RangeError for an empty history or a non-finite value (named by entry and field).
 */
export function accuracyHistory(entries: readonly HistoryEntry[], limit: number = TRACKING_SIGNAL_LIMIT): AccuracyHistory {
  const fn = "accuracyHistory";
  if (!Array.isArray(entries) || entries.length === 0) throw new RangeError(`${fn}: entries is empty; at least one question with an outcome is needed`);
  entries.forEach((e, i) => {
    assertFinite(e.actual, fn, `entries[${i}].actual`);
    for (const k of FIGURES) assertFinite(e[k], fn, `entries[${i}].${k}`);
  });
  const actual = entries.map((e) => e.actual);
  const one = (k: (typeof FIGURES)[number]): FigureHistory => {
    const forecast = entries.map((e) => e[k]);
    assertFiniteArray(forecast, fn, k);
    const ts = relativeTrackingSignalSeries(actual, forecast);
    return { accuracy: { ...accuracy(actual, forecast), trackingSignal: ts[ts.length - 1] }, trackingSignal: ts, alarm: trackingAlarm(ts, limit) };
  };
  return {
    n: entries.length,
    rawPanel: one("rawPanel"),
    correctedPanel: one("correctedPanel"),
    baseline: one("baseline"),
    blend: one("blend"),
  };
}
