import { bassForecastSum, fitBass, MIN_PERIODS, type BassFit } from "../bass";
import { checkForecastArgs, makeFit, normalForecast } from "../simple";
import { ForecastInputError, type Fit, type FitInput, type Forecast, type Method } from "../types";

/**
 * The Bass diffusion model as a baseline method (docs/methods.md §19): the history is
 * adoptions per period since launch (period 1 first); the fit is nonlinear least squares on
 * m·(F(t) − F(t−1)) (lib/forecast/bass.ts) and the forecast continues the curve for periods
 * n+1..n+h, each with its prediction interval from the residual variance and the parameters'
 * covariance (delta method, Student's t with n − 3 degrees of freedom), the lower bound held at 0.
 * Not compared automatically: it answers a different question (a launch's course) and needs
 * adoptions, not any series. Needs MIN_PERIODS (5) non-negative values.
 */
const bass: Method = {
  id: "bass",
  minLength(): number {
    return MIN_PERIODS;
  },
  applicable(y: readonly number[]): boolean {
    return y.length >= MIN_PERIODS && y.every((v) => v >= 0) && y.some((v) => v > 0);
  },
  /** @throws ForecastInputError for too few periods, a negative value or a zero total. */
  fit(input: FitInput): Fit {
    let f: BassFit;
    try {
      f = fitBass(input.y);
    } catch (e) {
      throw new ForecastInputError(e instanceof Error ? e.message : String(e));
    }
    return makeFit(
      "bass",
      input.y,
      input.season,
      f.fitted,
      { p: f.p, q: f.q, m: f.m },
      { covariance: f.covariance.flat(), se: [f.se.p, f.se.q, f.se.m], peak: f.peak, periodsBeforePeak: f.periodsBeforePeak },
      f.sigma2,
      [...f.notes],
    );
  },
  /** @throws ForecastInputError for a bad horizon or level. */
  forecast(fit: Fit, h: number, levels: readonly number[]): Forecast {
    checkForecastArgs("bass", h, levels);
    const bf = asBassFit(fit);
    const steps = Array.from({ length: h }, (_, i) => bassForecastSum(bf, [fit.n + i + 1], levels));
    const fc = normalForecast("bass", steps.map((s) => s.mean), steps.map((s) => s.sd), levels);
    const lower: Record<string, number[]> = {};
    const upper: Record<string, number[]> = {};
    for (const lv of levels) {
      lower[String(lv)] = steps.map((s) => s.lower[String(lv)]);
      upper[String(lv)] = steps.map((s) => s.upper[String(lv)]);
    }
    return { ...fc, lower, upper };
  },
};

/** The Bass fit kept in a method Fit's parameters and state. */
export function asBassFit(fit: Fit): BassFit {
  const c = fit.state.covariance as readonly number[];
  const se = fit.state.se as readonly number[];
  return {
    p: fit.parameters.p,
    q: fit.parameters.q,
    m: fit.parameters.m,
    sigma2: fit.sigma2,
    sse: fit.sse,
    n: fit.n,
    covariance: [c.slice(0, 3), c.slice(3, 6), c.slice(6, 9)],
    se: { p: se[0], q: se[1], m: se[2] },
    fitted: fit.fitted,
    peak: fit.state.peak as number,
    periodsBeforePeak: fit.state.periodsBeforePeak as number,
    notes: fit.notes,
  };
}

export default bass;
