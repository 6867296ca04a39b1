/**
 * The automatic baseline's combination (docs/methods.md §20): the equal-weight mean of the ETS
 * family weighted by AICc (lib/forecast/methods/ets-weighted.ts) and the Theta method, with
 * empirical intervals from the combination's own multi-step errors on the history: their root
 * mean square scaled to the residual degrees of freedom n − p (p the members' average number of
 * estimated values), with Student t quantiles on the effective number of independent errors.
 * Where the history is too short for them, the members' bounds averaged quantile by quantile.
 * Pure TypeScript.
 *
 * Sources: combining ETS, ARIMA and Theta-type forecasts beat the single chosen method in the M3
 * and M4 competitions (Makridakis & Hibon 2000, IJF 16(4); Makridakis, Spiliotis &
 * Assimakopoulos 2020, IJF 36(1)); equal weights (Clemen 1989, IJF 5(4)). Empirical intervals
 * from a method's own h-step errors on the history: Williams & Goodman (1971), "A simple method
 * for the construction of empirical confidence limits for economic forecasts", JASA 66(336),
 * 752–754; Lee & Scholtes (2014), "Empirical prediction intervals revisited", IJF 30(2), 217–234.
 * Quantile averaging: Lichtendahl, Grushka-Cockayne & Winkler (2013), "Is it better to average
 * probabilities or quantiles?", Management Science 59(7), 1594–1611. Effective degrees of
 * freedom: Satterthwaite (1946).
 */
import { normalQuantile } from "../stats/normal";
import { studentTQuantile } from "../stats/student-t";
import type { Forecast } from "./types";
import { innovationWeights, weightsFromStepVariances } from "./total";

/** Fewest history errors at a horizon for its empirical spread to be used. */
export const MIN_HISTORY_ERRORS = 3;

/** What {@link combineForecasts} needs of one member. */
export interface CombinationMember {
  readonly forecast: Forecast;
  /** Its in-sample forecasts from every origin t = 0..n−1 (Method.originForecasts), steps 1..h. */
  readonly origins: readonly (readonly number[])[];
  /** Values it estimated from the series (Fit.estimated: parameters, initial states, seasonal indices). */
  readonly estimated: number;
}

/** The combination's forecast and, per step, the empirical spread used (NaN where none). */
export interface CombinedForecast {
  readonly mean: number[];
  readonly lower: Record<string, number[]>;
  readonly upper: Record<string, number[]>;
  /** Root mean square of the history errors per step (relative when `relative`). */
  readonly spread: number[];
  /** Number of history errors behind each step's spread. */
  readonly errors: number[];
  /** Effective degrees of freedom of each step's spread (the t quantile's; fewer than `errors`: overlapping origins). */
  readonly df: number[];
  /** √(n/(n − p)), by which the spread is scaled to the residual degrees of freedom (NaN when n − p < 1). */
  readonly correction: number;
  readonly relative: boolean;
  readonly notes: string[];
}

/** First origin whose errors count: max(2m, ⌈n/3⌉), so that the states have settled. */
export function firstOrigin(n: number, season: number): number {
  return Math.max(2 * season, Math.ceil(n / 3), 1);
}

/** Element-wise mean of equal-length arrays. */
function meanOf(rows: readonly (readonly number[])[]): number[] {
  return rows[0].map((_, i) => rows.reduce((a, r) => a + r[i], 0) / rows.length);
}

/**
 * Root mean square of the combination's errors on the history, per step 1..h, and what each
 * rests on: e_{t,j} = y_{t+j} − f_{t,j} from every origin t ≥ {@link firstOrigin} with y_{t+j}
 * observed; relative errors e/|f| when `relative` (a forecast ≤ 0 is then skipped). Steps with
 * fewer than {@link MIN_HISTORY_ERRORS} errors give NaN. `origins[j]` lists the origins behind
 * step j (for {@link overlapDegreesOfFreedom}).
 */
export function historySpread(
  y: readonly number[],
  combined: (t: number) => readonly number[],
  h: number,
  season: number,
  relative: boolean,
): { spread: number[]; count: number[]; origins: number[][] } {
  const sum = new Array<number>(h).fill(0);
  const count = new Array<number>(h).fill(0);
  const origins: number[][] = Array.from({ length: h }, () => []);
  for (let t = firstOrigin(y.length, season); t < y.length; t++) {
    const f = combined(t);
    for (let j = 0; j < h && t + j < y.length; j++) {
      if (relative && !(f[j] > 0)) continue;
      const e = (y[t + j] - f[j]) / (relative ? f[j] : 1);
      if (!Number.isFinite(e)) continue;
      sum[j] += e * e;
      count[j]++;
      origins[j].push(t);
    }
  }
  return { spread: sum.map((s, j) => (count[j] >= MIN_HISTORY_ERRORS ? Math.sqrt(s / count[j]) : NaN)), count, origins };
}

/**
 * √(n/(n − p)): the factor that turns a root mean square of errors on the values a model was
 * fitted to into an estimate of the spread of new errors. In-sample errors are too small by about
 * (n − p)/n in mean square when p values were estimated from the n observations (the residual
 * degrees of freedom of least squares; the same count gives σ² = SSE/(n − k) of R's ets() and
 * Arima(), Hyndman et al. 2008 — from memory). p = the members' average of Fit.estimated.
 * NaN when n − p < 1 (too many values estimated for the errors to say anything) or when n or p
 * is NaN or p < 0.
 */
export function residualCorrection(n: number, p: number): number {
  return n - p >= 1 && p >= 0 ? Math.sqrt(n / (n - p)) : NaN;
}

/** {@link residualCorrection} of the fitted series with p the members' average of `estimated`. */
function membersCorrection(y: readonly number[], members: readonly CombinationMember[]): number {
  return residualCorrection(y.length, members.reduce((a, m) => a + m.estimated, 0) / members.length);
}

/** The members' error model: their average step variances read as a linear innovations model (c_k of lib/forecast/total.ts; 0, independent period errors, when a member gives no finite step sd). */
function membersInnovations(sd: readonly number[], h: number): number[] {
  return sd.length === h && sd.every((x) => Number.isFinite(x) && x > 0) ? weightsFromStepVariances(sd.map((x) => x * x)) : new Array<number>(Math.max(h - 1, 0)).fill(0);
}

/**
 * Quantile of a new error in units of a spread estimated as the root mean square of k independent
 * errors centred on zero (k effective degrees of freedom for correlated ones): Student's t with k
 * degrees of freedom (a new normal error over s is t_k; e.g.
 * Hahn & Meeker (1991), *Statistical Intervals*, ch. 4 — from memory). Wider than the normal
 * quantile where the history is short.
 */
function errorQuantile(level: number, k: number): number {
  const p = 0.5 + level / 200;
  return k > 0 ? studentTQuantile(p, k) : normalQuantile(p);
}

/**
 * Equal-weight combination of the members (see the file comment).
 *
 * mean_j = average of the members' means. For each level L and step j, the empirical bound
 * mean_j ∓ q_j·c·s_j·scale_j: s_j the root mean square of the combination's step-j errors on the
 * history ({@link historySpread}); c = {@link residualCorrection}(n, p), p the members' average
 * number of estimated values; q_j the Student t quantile of L with ν_j degrees of freedom, ν_j the
 * effective number of independent errors behind s_j ({@link overlapDegreesOfFreedom}: step-j
 * errors from origins less than j apart share innovations, weighted ψ_{j−i} by the members'
 * average step sd read as a linear innovations model, as for totals); scale_j = |mean_j| for
 * relative errors (used when every observation is above zero), else 1. Past the last step J with
 * enough history errors, s_j = s_J·σ̄_j/σ̄_J (σ̄ the members' average forecast sd) and ν_j = ν_J.
 * Without any history spread (or with c NaN), the members' L-bounds averaged quantile by quantile.
 * The mean always lies inside its intervals.
 *
 * Input: at least one member, all with the same horizon and levels; y the fitted series.
 * Non-finite member values propagate (the caller drops failed members first).
 */
export function combineForecasts(members: readonly CombinationMember[], y: readonly number[], season: number, levels: readonly number[]): CombinedForecast {
  const h = members[0].forecast.mean.length;
  const mean = meanOf(members.map((m) => m.forecast.mean));
  const relative = y.every((v) => v > 0);
  const history = historySpread(y, (t) => meanOf(members.map((m) => m.origins[t])), h, season, relative);
  const raw = history.spread;
  const sd = meanOf(members.map((m) => m.forecast.sd));
  const correction = membersCorrection(y, members);
  // The last step with a history spread; none (−1) also when c is NaN: then the members' bounds.
  let last = -1;
  if (Number.isFinite(correction)) {
    raw.forEach((s, j) => {
      if (Number.isFinite(s)) last = j;
    });
  }
  const at = (j: number) => (last < 0 ? j : Math.min(j, last));
  const spread = raw.map((s, j) => {
    if (last < 0) return NaN;
    if (j <= last) return s;
    const growth = sd[j] / sd[last];
    return raw[last] * (Number.isFinite(growth) && growth > 0 ? growth : 1);
  });
  const errors = raw.map((_, j) => history.count[at(j)]);
  const c = membersInnovations(sd, h);
  const df = raw.map((_, j) => overlapDegreesOfFreedom(history.origins[at(j)], innovationWeights(c, at(j) + 1, at(j) + 1)));
  const notes: string[] = [];
  if (last < 0) notes.push("too short a history for empirical intervals: the members' bounds averaged quantile by quantile");
  const lower: Record<string, number[]> = {};
  const upper: Record<string, number[]> = {};
  for (const level of levels) {
    const key = String(level);
    const lo = meanOf(members.map((m) => m.forecast.lower[key]));
    const hi = meanOf(members.map((m) => m.forecast.upper[key]));
    const half = mean.map((mu, j) => errorQuantile(level, df[j]) * correction * spread[j] * (relative ? Math.abs(mu) : 1));
    lower[key] = mean.map((mu, j) => (Number.isFinite(half[j]) ? mu - half[j] : Math.min(lo[j], mu)));
    upper[key] = mean.map((mu, j) => (Number.isFinite(half[j]) ? mu + half[j] : Math.max(hi[j], mu)));
  }
  return { mean, lower, upper, spread, errors, df, correction, relative, notes };
}

/**
 * Effective degrees of freedom of a mean square of window sums from overlapping origins
 * (Satterthwaite 1946, "An approximate distribution of estimates of variance components",
 * Biometrics Bulletin 2(6), 110–114: ν = 2·E[s²]²/Var[s²]). The sum's error from origin t is
 * Σ_i w_i ε_{t+i} (`weights` w_1..w_b: {@link innovationWeights} of lib/forecast/total.ts), so the
 * sums from origins k apart share innovations and have correlation
 * ρ_k = Σ_i w_i w_{i+k} / Σ_i w_i² (0 from k ≥ b), and for normal errors
 * Var[Σ e²] = 2σ⁴ Σ_{r,s} ρ²_{|t_r − t_s|} (the variance of a normal quadratic form), giving
 * ν = N² / Σ_{r,s} ρ²_{|t_r − t_s|}. With independent period errors (w = 1 on the window a..b,
 * 0 before it) ρ_k = (b − a + 1 − k)/(b − a + 1): N sums from consecutive origins then give about
 * N/(1 + (w − 1)(2w − 1)/(3w)), w = b − a + 1; errors that carry over between periods lower ν further.
 * Non-overlapping origins give ν = N. Input: ascending origins (empty gives 0), weights ≥ 0, not all 0.
 */
export function overlapDegreesOfFreedom(origins: readonly number[], weights: readonly number[]): number {
  const n = origins.length;
  if (n === 0) return 0;
  const b = weights.length;
  const g = weights.map((_, k) => weights.reduce((a, w, i) => a + (i + k < b ? w * weights[i + k] : 0), 0));
  let sum = n;
  for (let r = 0; r < n; r++) {
    for (let s = r + 1; s < n && origins[s] - origins[r] < b; s++) sum += 2 * (g[origins[s] - origins[r]] / g[0]) ** 2;
  }
  return (n * n) / sum;
}

/**
 * The total over steps a..b (`from` = a, default 1; `h` = b) for the combination: the wider of the
 * members' totals (over the same steps) averaged quantile by quantile and the empirical bound
 * mean ∓ q·c·s·scale from the combination's sums over the same window on the history (the
 * empirical bound alone covered M3's held-out sums too little, docs/methods.md §20): from every origin t ≥ {@link firstOrigin} with y_{t+a}..y_{t+b} observed,
 * e_t = Σ_{j=a}^{b} (y_{t+j} − f_{t,j}), relative to the forecast sum when every observation is
 * above zero; s their root mean square, c = {@link residualCorrection}. Neighbouring origins'
 * window sums share most of their innovations, so the t quantile has the effective degrees of
 * freedom of {@link overlapDegreesOfFreedom}, not the number of sums, with the innovations'
 * weights of the members' error model: their average step variances read as a linear
 * innovations model (c_k of lib/forecast/total.ts; c = 0, independent period errors, when a
 * member gives no finite step sd). Fewer than {@link MIN_HISTORY_ERRORS} sums: the members'
 * totals averaged alone.
 */
export function combineTotals(
  totals: readonly { readonly mean: number; readonly lower: Record<string, number>; readonly upper: Record<string, number> }[],
  members: readonly CombinationMember[],
  y: readonly number[],
  season: number,
  h: number,
  levels: readonly number[],
  from = 1,
): { mean: number; lower: Record<string, number>; upper: Record<string, number>; empirical: boolean; sums: number; df: number } {
  const avg = (get: (t: (typeof totals)[number]) => number) => totals.reduce((a, t) => a + get(t), 0) / totals.length;
  const mean = avg((t) => t.mean);
  const relative = y.every((v) => v > 0);
  let sum = 0;
  const used: number[] = [];
  for (let t = firstOrigin(y.length, season); t + h <= y.length; t++) {
    const f = meanOf(members.map((m) => m.origins[t]));
    let fs = 0;
    let ys = 0;
    for (let j = from - 1; j < h; j++) {
      fs += f[j];
      ys += y[t + j];
    }
    if (relative && !(fs > 0)) continue;
    const e = relative ? (ys - fs) / fs : ys - fs;
    if (!Number.isFinite(e)) continue;
    sum += e * e;
    used.push(t);
  }
  const count = used.length;
  const spread = count >= MIN_HISTORY_ERRORS ? membersCorrection(y, members) * Math.sqrt(sum / count) : NaN;
  const df = overlapDegreesOfFreedom(used, innovationWeights(membersInnovations(meanOf(members.map((m) => m.forecast.sd)), h), h, from));
  const lower: Record<string, number> = {};
  const upper: Record<string, number> = {};
  for (const level of levels) {
    const key = String(level);
    const half = errorQuantile(level, df) * spread * (relative ? Math.abs(mean) : 1);
    lower[key] = Math.min(avg((t) => t.lower[key]), mean, Number.isFinite(half) ? mean - half : Infinity);
    upper[key] = Math.max(avg((t) => t.upper[key]), mean, Number.isFinite(half) ? mean + half : -Infinity);
  }
  return { mean, lower, upper, empirical: Number.isFinite(spread), sums: count, df };
}
