import { checkHorizon, etsMinLength } from "../ets/model";
import { chooseMember, decodeModel, fitMember, memberOf, memberToFit } from "../ets/family";
import { makeState, specName, update } from "../ets/state-space";
import { memberForecast, pointForecasts } from "../ets/distribution";
import { ForecastInputError, type Fit, type FitInput, type Forecast, type Method } from "../types";

/**
 * The exponential-smoothing family in state-space form with the member chosen by AICc
 * (Hyndman, Koehler, Snyder & Grose 2002; Hyndman et al. 2008), additive and, for positive
 * data, multiplicative errors: see lib/forecast/ets/family.ts. Intervals: closed form for
 * classes 1 and 2, simulated sample paths otherwise (lib/forecast/ets/distribution.ts).
 *
 * `fixed` must name the member (`model`, the code in state.model) with its values; a fit
 * given back its own parameters and initial states reproduces itself. A `start` with a model
 * code re-estimates that member from those values (no new choice).
 */
const ets: Method = {
  id: "ets",
  /** As simple exponential smoothing, the smallest member. */
  minLength(): number {
    return etsMinLength({ trend: "N", season: "N" }, 1);
  },
  applicable(y: readonly number[]): boolean {
    return y.length >= etsMinLength({ trend: "N", season: "N" }, 1);
  },
  /** @throws ForecastInputError for unusable input or `fixed` without a model. */
  fit(input: FitInput): Fit {
    const fixed = input.fixed;
    if (fixed && Object.keys(fixed).length > 0) {
      if (typeof fixed.model !== "number") {
        throw new ForecastInputError("ets: fixed values need the member's model code (model); to fix parameters of one method, name it (ses, holt, …)");
      }
      const spec = decodeModel(fixed.model, input.season);
      if (spec.season !== "N" && !(input.season >= 2)) throw new ForecastInputError("ets: a seasonal member needs a season length of at least 2");
      return memberToFit(fitMember(spec, input.y, fixed), input.y, [`ETS(${specName(spec)}) with the values given`]);
    }
    const start = input.start;
    if (start && typeof start.model === "number") {
      // Warm start from the estimates at the forecast origins (automatic selection): the member
      // chosen there, re-estimated on the whole series from its values there.
      const spec = decodeModel(start.model, input.season);
      try {
        return memberToFit(fitMember(spec, input.y, undefined, undefined, start), input.y, [`ETS(${specName(spec)}), the member chosen by AICc at the forecast origins`]);
      } catch (e) {
        if (!(e instanceof ForecastInputError)) throw e;
      }
    }
    const choice = chooseMember(input.y, input.season);
    return memberToFit(choice.best, input.y, [
      `ETS(${specName(choice.best.spec)}) chosen by AICc among ${choice.table.length} members (${choice.table.map((t) => `${t.model} ${Number.isFinite(t.aicc) ? t.aicc.toFixed(1) : "-"}`).join("; ")})`,
    ]);
  },
  /** @throws ForecastInputError for a bad horizon or level. */
  forecast(fit: Fit, h: number, levels: readonly number[]): Forecast {
    checkHorizon("ets", h, levels);
    const { spec, par, origin } = memberOf(fit);
    const f = memberForecast(spec, par, origin, fit.sigma2, h, levels);
    const lower: Record<string, number[]> = {};
    const upper: Record<string, number[]> = {};
    levels.forEach((lv, l) => {
      lower[String(lv)] = f.lower[l];
      upper[String(lv)] = f.upper[l];
    });
    return { method: "ets", mean: f.mean, levels: [...levels], lower, upper, sd: f.sd };
  },
  /**
   * Row t: the member's point forecasts from the states after y_1..y_t, the recursions run
   * from the fit's initial states with its parameters (Hyndman et al. 2008 table 2.1).
   */
  originForecasts(fit: Fit, y: readonly number[], h: number): number[][] {
    const { spec, par } = memberOf(fit);
    const st = makeState(fit.state.l0 as number, (fit.state.b0 as number | undefined) ?? 0, (fit.state.initialSeason as readonly number[] | undefined) ?? []);
    const rows: number[][] = [];
    for (let t = 0; t < y.length; t++) {
      rows.push(pointForecasts(spec, par, st, h));
      update(spec, par, st, y[t]);
    }
    return rows;
  },
};

export default ets;
