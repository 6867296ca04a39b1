import { checkHorizon, etsKeys, etsMinLength, etsParameterCount } from "../ets/model";
import { chooseMember, fitMember } from "../ets/family";
import { evaluate, type StateSpaceFit } from "../ets/estimate";
import { makeState, update, type EtsSpec, type EtsState, type Smoothing } from "../ets/state-space";
import { memberForecast, pointForecasts } from "../ets/distribution";
import { akaikeWeights } from "../../stats/akaike";
import { ForecastInputError, type Fit, type FitInput, type Forecast, type Method } from "../types";

/**
 * The exponential-smoothing family combined by Akaike weights (S. Kolassa (2011), "Combining
 * exponential smoothing forecasts using Akaike weights", IJF 27(2), 238–251; the weights:
 * Burnham & Anderson 2002, lib/stats/akaike.ts): every member that the AICc choice of `ets`
 * fits (lib/forecast/ets/family.ts, the same fits) forecasts, and the point forecast is
 * Σ_i w_i·ŷ^i, w_i = exp(−Δ_i/2)/Σ_k exp(−Δ_k/2), Δ_i = AICc_i − min AICc. Members without a
 * finite AICc (too short a series) get no weight; if none has one, the member `ets` chooses is
 * used alone. One-step fitted values and the in-sample forecasts from every origin are weighted
 * the same way.
 *
 * Intervals: those of the member with the largest weight (the one `ets` chooses; closed form or
 * simulated, lib/forecast/ets/distribution.ts) moved by the difference between the weighted and
 * that member's mean, so the mean lies inside them. This leaves out the spread between the
 * members' means; inside the automatic combination the empirical bounds of
 * lib/forecast/combination.ts cover that.
 *
 * The fit's parameters are every member's values, keyed by the member (AAdN = ETS(A,Ad,N)):
 * `AAdN.weight`, `AAdN.alpha`, `AAdN.beta`, `AAdN.phi`, `AAdN.l0`, `AAdN.b0` (and `.gamma`,
 * `.s1`…`.sm` for a seasonal member). Given back as `fixed` they reproduce the fit: each member
 * is run with its values (σ² and AICc counting them as estimated, as in the fit); weights given
 * for every member are held, none given are the Akaike weights of the members at those values.
 */

/** One member of a weighted fit. */
interface Member {
  readonly spec: EtsSpec;
  readonly name: string;
  readonly weight: number;
  readonly fit: StateSpaceFit;
}

/** A member's short name: error, trend and season letters (AAdN for ETS(A,Ad,N)). */
function shortName(spec: Pick<EtsSpec, "error" | "trend" | "season">): string {
  return `${spec.error}${spec.trend}${spec.season}`;
}

/** The member of a short name. @throws ForecastInputError for a name that is not one. */
function parseName(name: string, m: number): EtsSpec {
  const match = /^([AM])(N|A|Ad)([NAM])$/.exec(name);
  if (!match) throw new ForecastInputError(`ets-weighted: '${name}' is not a member (error A/M, trend N/A/Ad, season N/A/M, e.g. AAdN)`);
  const season = match[3] as EtsSpec["season"];
  if (season !== "N" && !(m >= 2)) throw new ForecastInputError(`ets-weighted: the seasonal member ${name} needs a season length of at least 2`);
  return { error: match[1] as EtsSpec["error"], trend: match[2] as EtsSpec["trend"], season, m: season === "N" ? 1 : m };
}

/** A member's values as a `fixed` record of the member alone (alpha…, l0, b0, s1…). */
function valuesOf(f: StateSpaceFit): Record<string, number> {
  const { spec, par, initial } = f;
  const out: Record<string, number> = { alpha: par.alpha, l0: initial.l0 };
  if (spec.trend !== "N") {
    out.beta = par.beta;
    out.b0 = initial.b0;
  }
  if (spec.trend === "Ad") out.phi = par.phi;
  if (spec.season !== "N") {
    out.gamma = par.gamma;
    initial.s.forEach((v, i) => (out[`s${i + 1}`] = v));
  }
  return out;
}

/** Members from `fixed` (see the file comment). @throws ForecastInputError for unknown or missing keys or bad values. */
function fromFixed(fixed: Readonly<Record<string, number>>, y: readonly number[], m: number): Member[] {
  const byName = new Map<string, Record<string, number>>();
  for (const [key, v] of Object.entries(fixed)) {
    const dot = key.indexOf(".");
    if (dot < 0) throw new ForecastInputError(`ets-weighted: fixed value '${key}' must name its member, e.g. ANN.alpha`);
    const name = key.slice(0, dot);
    if (!byName.has(name)) byName.set(name, {});
    byName.get(name)![key.slice(dot + 1)] = v;
  }
  const members = [...byName.entries()].map(([name, values]) => {
    const spec = parseName(name, m);
    const { params, states } = etsKeys(spec, spec.m);
    const keys = [...params, ...states];
    for (const k of Object.keys(values)) {
      if (k !== "weight" && !keys.includes(k)) throw new ForecastInputError(`ets-weighted: unknown fixed value '${name}.${k}' (${name} has ${keys.join(", ")}, weight)`);
    }
    const missing = keys.filter((k) => !(k in values));
    if (missing.length > 0) throw new ForecastInputError(`ets-weighted: member ${name} needs every value; missing ${missing.map((k) => `${name}.${k}`).join(", ")}`);
    const { weight, ...own } = values;
    const given = fitMember(spec, y, own); // checks the values' ranges
    return { spec, name, weight, fit: evaluate(spec, y, given.par, given.initial, etsParameterCount(spec, spec.m)) };
  });
  const weighted = members.filter((x) => x.weight !== undefined);
  if (weighted.length === 0) return withAkaikeWeights(members.map((x) => x.fit));
  if (weighted.length < members.length) throw new ForecastInputError("ets-weighted: give every member's weight or none");
  if (members.some((x) => !(Number.isFinite(x.weight) && x.weight >= 0))) throw new ForecastInputError("ets-weighted: weights must be finite and at least 0");
  const total = members.reduce((a, x) => a + x.weight, 0);
  if (!(total > 0)) throw new ForecastInputError("ets-weighted: at least one weight must be above 0");
  return members.map((x) => ({ ...x, weight: x.weight / total }));
}

/** Members weighted by their AICc; those without a finite AICc are left out (all of them without one: the first alone). */
function withAkaikeWeights(fits: readonly StateSpaceFit[]): Member[] {
  const usable = fits.filter((f) => Number.isFinite(f.aicc));
  const kept = usable.length > 0 ? usable : [fits.reduce((b, f) => (f.aicc < b.aicc ? f : b))];
  const w = usable.length > 0 ? akaikeWeights(usable.map((f) => f.aicc)) : [1];
  return kept.map((f, i) => ({ spec: f.spec, name: shortName(f.spec), weight: w[i], fit: f }));
}

/** The weighted Fit (see the file comment). */
function toFit(members: readonly Member[], y: readonly number[], notes: string[]): Fit {
  const parameters: Record<string, number> = {};
  const state: Record<string, number | readonly number[]> = {};
  for (const { name, weight, fit } of members) {
    parameters[`${name}.weight`] = weight;
    for (const [k, v] of Object.entries(valuesOf(fit))) parameters[`${name}.${k}`] = v;
    const { level, trend, ring, k } = fit.filtered.final;
    state[`${name}.level`] = level;
    state[`${name}.trend`] = trend;
    state[`${name}.season`] = Array.from(ring, (_, j) => ring[(k + j) % ring.length]);
    state[`${name}.sigma2`] = fit.sigma2;
    state[`${name}.aicc`] = fit.aicc;
  }
  const top = members.reduce((b, x) => (x.weight > b.weight ? x : b));
  const fitted = y.map((_, t) => members.reduce((a, x) => a + x.weight * (x.fit.filtered.fitted?.[t] ?? NaN), 0));
  const residuals = fitted.map((f, t) => y[t] - f);
  return {
    method: "ets-weighted",
    parameters,
    state,
    fitted,
    residuals,
    sigma2: top.fit.sigma2,
    n: y.length,
    season: Math.max(...members.map((x) => x.spec.m)),
    sse: residuals.reduce((a, e) => a + e * e, 0),
    estimated: members.reduce((a, x) => a + x.weight * x.fit.estimated, 0),
    notes: [...notes, `weights (Akaike, by AICc): ${members.map((x) => `${x.name} ${x.weight.toFixed(3)}`).join("; ")}; intervals of ${top.name} moved to the weighted mean`],
  };
}

/** A member of a weighted Fit, ready to forecast. */
export interface WeightedMember {
  readonly spec: EtsSpec;
  readonly weight: number;
  readonly par: Smoothing;
  /** States after the last observation. */
  readonly origin: EtsState;
  /** Initial states (before the first observation). */
  readonly initial: EtsState;
  readonly sigma2: number;
}

/** The members of an `ets-weighted` Fit, and the index of the one with the largest weight (the first of equals). */
export function weightedMembers(fit: Fit): { members: WeightedMember[]; top: number } {
  const p = fit.parameters;
  const names = Object.keys(p).filter((k) => k.endsWith(".weight")).map((k) => k.slice(0, -".weight".length));
  const members = names.map((name) => {
    const spec = parseName(name, fit.season);
    const v = (k: string, d: number) => p[`${name}.${k}`] ?? d;
    const s = Array.from({ length: spec.season === "N" ? 0 : spec.m }, (_, i) => p[`${name}.s${i + 1}`]);
    return {
      spec,
      weight: p[`${name}.weight`],
      par: { alpha: v("alpha", NaN), beta: v("beta", 0), gamma: v("gamma", 0), phi: v("phi", 1) },
      origin: makeState(fit.state[`${name}.level`] as number, fit.state[`${name}.trend`] as number, (fit.state[`${name}.season`] as readonly number[]) ?? []),
      initial: makeState(v("l0", NaN), v("b0", 0), s),
      sigma2: fit.state[`${name}.sigma2`] as number,
    };
  });
  let top = 0;
  members.forEach((x, i) => {
    if (x.weight > members[top].weight) top = i;
  });
  return { members, top };
}

/** Σ_i w_i · (member i's point forecasts for steps 1..h from its state `at(i)`). */
export function weightedPointForecasts(members: readonly WeightedMember[], h: number, at: (x: WeightedMember) => EtsState = (x) => x.origin): number[] {
  const out = new Array<number>(h).fill(0);
  for (const x of members) pointForecasts(x.spec, x.par, at(x), h).forEach((f, j) => (out[j] += x.weight * f));
  return out;
}

const etsWeighted: Method = {
  id: "ets-weighted",
  /** As simple exponential smoothing, the smallest member. */
  minLength(): number {
    return etsMinLength({ trend: "N", season: "N" }, 1);
  },
  applicable(y: readonly number[]): boolean {
    return y.length >= etsMinLength({ trend: "N", season: "N" }, 1);
  },
  /** @throws ForecastInputError for unusable input or bad `fixed` values. */
  fit(input: FitInput): Fit {
    const { y, season } = input;
    if (input.fixed && Object.keys(input.fixed).length > 0) {
      const members = fromFixed(input.fixed, y, season);
      return toFit(members, y, [`ETS members ${members.map((x) => x.name).join(", ")} with the values given`]);
    }
    const choice = chooseMember(y, season);
    const members = withAkaikeWeights(choice.members.length > 0 ? choice.members : [choice.best]);
    return toFit(members, y, [
      `the ETS family's ${choice.table.length} members fitted, weighted by AICc (${choice.table.map((t) => `${t.model.replace(/,/g, "")} ${Number.isFinite(t.aicc) ? t.aicc.toFixed(1) : "-"}`).join("; ")})`,
    ]);
  },
  /** @throws ForecastInputError for a bad horizon or level. */
  forecast(fit: Fit, h: number, levels: readonly number[]): Forecast {
    checkHorizon("ets-weighted", h, levels);
    const { members, top } = weightedMembers(fit);
    const mean = weightedPointForecasts(members, h);
    const chosen = members[top];
    const f = memberForecast(chosen.spec, chosen.par, chosen.origin, chosen.sigma2, h, levels);
    const lower: Record<string, number[]> = {};
    const upper: Record<string, number[]> = {};
    levels.forEach((lv, l) => {
      lower[String(lv)] = f.lower[l].map((b, j) => b + mean[j] - f.mean[j]);
      upper[String(lv)] = f.upper[l].map((b, j) => b + mean[j] - f.mean[j]);
    });
    return { method: "ets-weighted", mean, levels: [...levels], lower, upper, sd: f.sd };
  },
  /**
   * Row t: Σ_i w_i · member i's point forecasts from its states after y_1..y_t, the recursions
   * run from its initial states with its parameters (Hyndman et al. 2008 table 2.1).
   */
  originForecasts(fit: Fit, y: readonly number[], h: number): number[][] {
    const { members } = weightedMembers(fit);
    const states = members.map((x) => ({ ...x.initial, ring: Float64Array.from(x.initial.ring) }));
    const rows: number[][] = [];
    for (let t = 0; t < y.length; t++) {
      rows.push(weightedPointForecasts(members, h, (x) => states[members.indexOf(x)]));
      members.forEach((x, i) => update(x.spec, x.par, states[i], y[t]));
    }
    return rows;
  },
};

export default etsWeighted;
