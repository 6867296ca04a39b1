/**
 * The ETS family with automatic choice of member by AICc (Hyndman, Koehler, Snyder & Grose
 * 2002, §3–4; Hyndman et al. 2008 §7.2), as R's forecast::ets with its default `restrict`:
 * errors A with trend N/A/Ad and season N/A; when every observation is above zero, also
 * errors M with trend N/A/Ad and season N/M (A errors with an M season are left out, their
 * variances being unstable near zero, Hyndman et al. 2008 §7.2). Seasonal members need m ≥ 2
 * and enough observations. M errors with an A season (which R also tries) are left out: they
 * cost as much to fit as M,·,M, and the M season is the reason to have M errors here (ranges
 * that widen with the level).
 *
 * A-error members are fitted by least squares (./least-squares.ts, their likelihood); the
 * M-error members by maximum likelihood (./estimate.ts): without an M season by Nelder–Mead from
 * the A-error member of the same structure (already fitted as a candidate); with an M season by
 * the joint Levenberg–Marquardt search on the likelihood, started from the fitted A,·,A of the
 * same trend with its seasonal states as ratios, and only when that fails by the least-squares
 * A,·,M (one joint search warm-started from the same values) and Nelder–Mead from there.
 * Likelihoods of both error types are on the same scale (n·log Σε² + 2Σlog|f| vs
 * n·log Σe², both −2 log L up to the same constant), so one AICc compares them.
 *
 * A fit records its member in state.model (a code, see modelCode) so that the member and its
 * values can be given back in `fixed` (model plus the parameters and initial states).
 */
import { fitEts, type EtsFitResult } from "./least-squares";
import { etsKeys, etsMinLength, type SeasonKind, type TrendKind } from "./model";
import { ForecastInputError, type Fit } from "../types";
import { evaluate, fitSeasonalByJointSearch, fitStateSpace, type StateSpaceFit } from "./estimate";
import { specName, type ErrorKind, type EtsSpec, type EtsState, type Smoothing } from "./state-space";

const TRENDS: readonly TrendKind[] = ["N", "A", "Ad"];
const SEASONS: readonly SeasonKind[] = ["N", "A", "M"];

/** Numeric code of a member: 100·error + 10·trend + season (A/N = 0, A = 1, Ad/M = 2; error M = 1). */
export function modelCode(spec: Pick<EtsSpec, "error" | "trend" | "season">): number {
  return (spec.error === "M" ? 100 : 0) + 10 * TRENDS.indexOf(spec.trend) + SEASONS.indexOf(spec.season);
}

/** The member of a code. @throws ForecastInputError for an unknown code. */
export function decodeModel(code: number, m: number): EtsSpec {
  const e = Math.floor(code / 100);
  const t = Math.floor((code % 100) / 10);
  const s = code % 10;
  if (!Number.isInteger(code) || e > 1 || t > 2 || s > 2 || code < 0) throw new ForecastInputError(`ets: unknown model code ${code}`);
  const season = SEASONS[s];
  return { error: e === 1 ? "M" : "A", trend: TRENDS[t], season, m: season === "N" ? 1 : m };
}

/** Members considered for a series (see the file comment). */
export function candidateSpecs(y: readonly number[], m: number): EtsSpec[] {
  const positive = y.every((v) => v > 0);
  const out: EtsSpec[] = [];
  for (const error of ["A", "M"] as ErrorKind[]) {
    if (error === "M" && !positive) continue;
    for (const trend of TRENDS) {
      for (const season of SEASONS) {
        if (season === "M" && (error === "A" || !positive)) continue;
        if (season === "A" && error === "M") continue; // M,·,A: left out for speed (see the file comment)
        if (season !== "N" && (m < 2 || y.length < etsMinLength({ trend, season }, m))) continue;
        if (y.length < etsMinLength({ trend, season }, season === "N" ? 1 : m)) continue;
        out.push({ error, trend, season, m: season === "N" ? 1 : m });
      }
    }
  }
  return out;
}

/** A least-squares fit as a state-space fit (the A-error likelihood at its optimum). */
function fromLeastSquares(spec: EtsSpec, y: readonly number[], r: EtsFitResult): StateSpaceFit {
  return evaluate(spec, y, { alpha: r.alpha, beta: r.beta, gamma: r.gamma, phi: r.phi }, { l0: r.l0, b0: r.b0, s: r.initialSeason }, r.estimated);
}

/** Values of a fit as a `start`/`fixed` record: alpha…phi, l0, b0, s1…sm. */
function asRecord(r: Pick<StateSpaceFit, "par" | "initial">): Record<string, number> {
  const out: Record<string, number> = { alpha: r.par.alpha, beta: r.par.beta, gamma: r.par.gamma, phi: r.par.phi, l0: r.initial.l0, b0: r.initial.b0 };
  r.initial.s.forEach((v, i) => (out[`s${i + 1}`] = v));
  return out;
}

/**
 * Fits one member: A errors by least squares, M errors by maximum likelihood started from
 * the least-squares fit of the same structure (`ls`, computed when not given).
 * `fixed` holds values (all of them when the member is re-run with its own estimates); `warm`
 * (every value of the member) replaces the least-squares start.
 */
export function fitMember(
  spec: EtsSpec,
  y: readonly number[],
  fixed?: Readonly<Record<string, number>>,
  ls?: EtsFitResult,
  warm?: Readonly<Record<string, number>>,
): StateSpaceFit {
  const model = { trend: spec.trend, season: spec.season };
  const season = spec.season === "N" ? 1 : spec.m;
  const only = (rec: Readonly<Record<string, number>> | undefined) => {
    if (!rec) return undefined;
    const out: Record<string, number> = {};
    for (const [k, v] of Object.entries(rec)) {
      if (k === "model" || (k === "beta" && spec.trend === "N") || (k === "phi" && spec.trend !== "Ad") || (k === "b0" && spec.trend === "N")) continue;
      if ((k === "gamma" || /^s\d+$/.test(k)) && spec.season === "N") continue;
      out[k] = v;
    }
    return out;
  };
  const given = only(fixed);
  const { params, states } = etsKeys(model, season);
  const complete = given && [...params, ...states].every((k) => k in given);
  const start0 = only(warm) ?? (complete ? given : undefined); // every value given: no start search
  if (spec.error === "A") return fromLeastSquares(spec, y, fitEts(`ETS(${specName(spec)})`, model, y, season, given, start0));
  const start = start0 && Object.values(start0).every(Number.isFinite) && Object.keys(start0).length > 0
    ? { beta: 0, gamma: 0, phi: 1, b0: 0, ...start0 }
    : asRecord(fromLeastSquares(spec, y, ls ?? fitEts(`ETS(${specName(spec)})`, model, y, season)));
  if (spec.season === "M" && !given && !warm) {
    const joint = fitSeasonalByJointSearch(spec, y, start);
    if (joint) return joint;
  }
  return fitStateSpace(spec, y, { ...start, ...given }, given);
}

/**
 * Start values of an M-season member from the fitted A-season member of the same trend: its
 * parameters and level and trend states, and the seasonal states as ratios 1 + s_i / ℓ0 (they
 * sum to m as the additive ones sum to 0). Undefined when ℓ0 or a ratio is not above zero.
 */
function seasonRatios(r: EtsFitResult): Record<string, number> | undefined {
  if (!(r.l0 > 0)) return undefined;
  const out: Record<string, number> = { alpha: r.alpha, beta: r.beta, gamma: r.gamma, phi: r.phi, l0: r.l0, b0: r.b0 };
  for (let i = 0; i < r.initialSeason.length; i++) {
    const v = 1 + r.initialSeason[i] / r.l0;
    if (!(v > 0)) return undefined;
    out[`s${i + 1}`] = v;
  }
  return out;
}

/** Result of {@link chooseMember}: the chosen fit, every member's AICc and every member's fit (in `table`'s order). */
export interface FamilyChoice {
  readonly best: StateSpaceFit;
  readonly table: readonly { readonly model: string; readonly aicc: number }[];
  readonly members: readonly StateSpaceFit[];
}

/**
 * Fits every candidate member and keeps the lowest AICc (ties: the earlier member, A before M,
 * simpler first). Members that fail to fit are skipped.
 * @throws ForecastInputError when no member can be fitted.
 */
export function chooseMember(y: readonly number[], m: number): FamilyChoice {
  const table: { model: string; aicc: number }[] = [];
  const members: StateSpaceFit[] = [];
  const lsFits = new Map<string, EtsFitResult>();
  let best: StateSpaceFit | undefined;
  for (const spec of candidateSpecs(y, m)) {
    try {
      const key = `${spec.trend},${spec.season}`;
      let fit: StateSpaceFit;
      if (spec.error === "A") {
        const r = fitEts(`ETS(${specName(spec)})`, { trend: spec.trend, season: spec.season }, y, spec.m);
        lsFits.set(key, r);
        fit = fromLeastSquares(spec, y, r);
      } else {
        // An M-season member: its likelihood searched jointly from the fitted A,·,A of the same
        // trend (seasonal states as ratios). Failing that, Nelder–Mead from the least-squares
        // A,·,M, itself warm-started from the same values.
        const additive = spec.season === "M" && !lsFits.has(key) ? lsFits.get(`${spec.trend},A`) : undefined;
        const warm = additive ? seasonRatios(additive) : undefined;
        const joint = warm ? fitSeasonalByJointSearch(spec, y, warm) : undefined;
        if (joint) fit = joint;
        else {
          if (warm) lsFits.set(key, fitEts(`ETS(${specName(spec)})`, { trend: spec.trend, season: spec.season }, y, spec.m, undefined, warm));
          fit = fitMember(spec, y, undefined, lsFits.get(key));
        }
      }
      table.push({ model: specName(spec), aicc: fit.aicc });
      members.push(fit);
      if (!best || fit.aicc < best.aicc) best = fit;
    } catch (e) {
      if (!(e instanceof ForecastInputError)) throw e;
    }
  }
  if (!best) throw new ForecastInputError("ets: no member of the family could be fitted to this series");
  return { best, table, members };
}

/**
 * The project's Fit of a member: parameters alpha (beta, gamma, phi when present); state:
 * level, trend, season (the m seasonal states for steps 1..m ahead), l0, b0, initialSeason,
 * estimated, model (code), aicc, loglik. residuals are y − fitted; sigma2 is the variance of
 * the model's errors (relative errors for error M).
 */
export function memberToFit(fit: StateSpaceFit, y: readonly number[], notes: string[]): Fit {
  const { spec, par, initial, filtered } = fit;
  const parameters: Record<string, number> = { alpha: par.alpha };
  const state: Record<string, number | readonly number[]> = { level: filtered.final.level, l0: initial.l0 };
  if (spec.trend !== "N") {
    parameters.beta = par.beta;
    state.trend = filtered.final.trend;
    state.b0 = initial.b0;
  }
  if (spec.season !== "N") {
    parameters.gamma = par.gamma;
    const { ring, k } = filtered.final;
    state.season = Array.from(ring, (_, j) => ring[(k + j) % spec.m]);
    state.initialSeason = [...initial.s];
  }
  if (spec.trend === "Ad") parameters.phi = par.phi;
  state.estimated = fit.estimated;
  state.model = modelCode(spec);
  state.aicc = fit.aicc;
  state.loglik = fit.loglik;
  const fitted = Array.from(filtered.fitted ?? []);
  const residuals = fitted.map((f, i) => y[i] - f);
  return {
    method: "ets",
    parameters,
    state,
    fitted,
    residuals,
    sigma2: fit.sigma2,
    n: y.length,
    season: spec.m,
    sse: residuals.reduce((a, e) => a + e * e, 0),
    notes,
    estimated: fit.estimated,
  };
}

/** The member, smoothing parameters and forecast-origin states of an `ets` Fit. */
export function memberOf(fit: Fit): { spec: EtsSpec; par: Smoothing; origin: EtsState } {
  const spec = decodeModel(fit.state.model as number, fit.season);
  const p = fit.parameters;
  const par: Smoothing = { alpha: p.alpha, beta: p.beta ?? 0, gamma: p.gamma ?? 0, phi: p.phi ?? 1 };
  const season = (fit.state.season as readonly number[] | undefined) ?? [0];
  return { spec, par, origin: { level: fit.state.level as number, trend: (fit.state.trend as number | undefined) ?? 0, ring: Float64Array.from(season), k: 0 } };
}
