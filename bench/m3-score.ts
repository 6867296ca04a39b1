/**
 * The figures of one M3 series for the M3 bench (bench/m3-coverage.ts): the baseline fitted to
 * the training part, scored on the held-out part. Runs in the bench's worker threads.
 */
import { meanAbsoluteScaledError, symmetricMape } from "../lib/forecast/accuracy";
import { baseline } from "../lib/forecast/baseline";
import type { MethodId } from "../lib/forecast/types";

/** One line of m3.jsonl (the fields the bench uses). */
export interface M3Series {
  readonly id: string;
  readonly period: string;
  readonly frequency: number;
  readonly h: number;
  readonly train: readonly number[];
  readonly test: readonly number[];
}

/** sMAPE and MASE over the horizon, held-out points inside the 80% and 95% intervals, or the error. */
export interface SeriesScore {
  readonly method?: string;
  readonly smape?: number;
  readonly mase?: number;
  readonly points?: number;
  readonly in80?: number;
  readonly in95?: number;
  /** Points whose forecast lies outside its own 80% or 95% interval (must be 0). */
  readonly incoherent?: number;
  /** With totals asked for: whether the sum of the held-out values lies inside the total's 80% / 95% interval. */
  readonly total80?: boolean;
  readonly total95?: boolean;
  readonly error?: string;
}

/**
 * `baseline(train, { season: frequency, horizon: h, method })`, then sMAPE (Makridakis & Hibon
 * 2000), MASE with the seasonal-naive in-sample scale (Hyndman & Koehler 2006) and interval hits
 * on the held-out points; with `total`, also whether the held-out sum over periods
 * min(from, h)..h lies inside the total's intervals; with `members`, the automatic combination of
 * those methods instead of the default members. Never throws: a failure is returned as `error`.
 */
export function scoreSeries(s: M3Series, method: string, total = false, from = 1, members?: readonly string[]): SeriesScore {
  try {
    const a = Math.min(from, s.h);
    const r = baseline(s.train, { season: s.frequency, horizon: s.h, method: method as "auto" | MethodId, levels: [80, 95], total, totalFrom: a, ...(members ? { members: members as MethodId[] } : {}) });
    const mean = r.forecast.map((f) => f.mean ?? NaN);
    let in80 = 0;
    let in95 = 0;
    let incoherent = 0;
    r.forecast.forEach((f, i) => {
      const y = s.test[i];
      const [l80, u80, l95, u95] = [f.lower["80"] ?? Infinity, f.upper["80"] ?? -Infinity, f.lower["95"] ?? Infinity, f.upper["95"] ?? -Infinity];
      if (l80 <= y && y <= u80) in80++;
      if (l95 <= y && y <= u95) in95++;
      const m = f.mean ?? NaN;
      if (!(l95 <= l80 && l80 <= m && m <= u80 && u80 <= u95)) incoherent++;
    });
    const sum = s.test.slice(a - 1, s.h).reduce((x, v) => x + v, 0);
    const inside = (level: string) => (r.total?.lower[level] ?? Infinity) <= sum && sum <= (r.total?.upper[level] ?? -Infinity);
    return {
      ...(total ? { total80: inside("80"), total95: inside("95") } : {}),
      method: r.method,
      smape: symmetricMape(s.test, mean),
      mase: meanAbsoluteScaledError(s.test, mean, s.train, s.frequency),
      points: r.forecast.length,
      in80,
      in95,
      incoherent,
    };
  } catch (e) {
    return { error: e instanceof Error ? e.message : String(e) };
  }
}
