import { autoArima, fitArima, forecastArima, MAX_AR, MAX_MA, type ArimaFit, type ArimaSpec } from "../arima";
import { checkForecastArgs, checkSeriesFor, makeFit, normalForecast } from "../simple";
import { ForecastInputError, type Fit, type FitInput, type Forecast, type Method } from "../types";

/** Smallest series for which ARIMA is offered. */
const ARIMA_MIN_LENGTH = 10;

/**
 * ARIMA(p, d, q) with an optional constant (mean for d = 0, drift for d = 1), non-seasonal,
 * by exact Gaussian maximum likelihood through the Kalman filter; see lib/forecast/arima.ts
 * for the model, likelihood, sources and forecast variance.
 *
 * Parameters (published names; each estimated unless given in `fixed`): `p`, `d`, `q`
 * (orders), `includeConstant` (0/1), `ar1`…`arp`, `ma1`…`maq`, `constant`. With p and q not
 * both given the order is chosen automatically: d by KPSS tests (unless given), then every
 * p, q ≤ 3 (with and without the constant when d ≤ 1) by AICc, as forecast::auto.arima with
 * `stepwise = FALSE, seasonal = FALSE`. Seasonal terms are not modelled: with season > 1 the
 * fit says so in its notes (the seasonal methods cover seasonality).
 *
 * Intervals: normal, ŷ ± z·sd_h with the finite-sample Kalman variance and
 * σ² = Σ(v²/F)/(N − k), as forecast::forecast.Arima.
 */
const arima: Method = {
  id: "arima",
  minLength(): number {
    return ARIMA_MIN_LENGTH;
  },
  applicable(y: readonly number[]): boolean {
    return y.length >= ARIMA_MIN_LENGTH;
  },
  /** @throws ForecastInputError for too few values, a non-finite value or unusable fixed values. */
  fit(input: FitInput): Fit {
    checkSeriesFor("arima", input.y, ARIMA_MIN_LENGTH);
    const fx = input.fixed ?? {};
    for (const [k, v] of Object.entries(fx)) {
      if (!Number.isFinite(v)) throw new ForecastInputError(`arima: fixed ${k} must be a finite number (got ${v})`);
    }
    const notes: string[] = [];
    let fit: ArimaFit;
    try {
      if (fx.p !== undefined && fx.q !== undefined) {
        const d = fx.d ?? 0;
        const spec: ArimaSpec = { p: fx.p, d, q: fx.q, constant: (fx.includeConstant ?? (d <= 1 ? 1 : 0)) === 1 };
        fit = fitArima(input.y, spec, {
          ar: Array.from({ length: spec.p }, (_, i) => fx[`ar${i + 1}`]),
          ma: Array.from({ length: spec.q }, (_, i) => fx[`ma${i + 1}`]),
          constant: fx.constant,
        });
      } else {
        const auto = autoArima(input.y, { d: fx.d, maxP: fx.p ?? MAX_AR, maxQ: fx.q ?? MAX_MA });
        fit = auto.fit;
        const tried = auto.candidates.filter((c) => Number.isFinite(c.aicc)).length;
        notes.push(`order chosen by AICc among ${tried} admissible ARIMA models (d = ${fit.spec.d} by KPSS tests unless given)`);
      }
    } catch (e) {
      if (e instanceof RangeError) throw new ForecastInputError(e.message);
      throw e;
    }
    if (input.season > 1) notes.push(`seasonal ARIMA terms are not modelled (season ${input.season})`);
    if (!fit.converged) notes.push("the likelihood optimiser stopped at its evaluation limit");
    const { p, d, q, constant } = fit.spec;
    const parameters: Record<string, number> = { p, d, q, includeConstant: constant ? 1 : 0 };
    fit.ar.forEach((v, i) => (parameters[`ar${i + 1}`] = v));
    fit.ma.forEach((v, i) => (parameters[`ma${i + 1}`] = v));
    if (constant) parameters.constant = fit.constant;
    const base = makeFit(
      "arima",
      input.y,
      input.season,
      fit.fitted,
      parameters,
      {
        ar: fit.ar,
        ma: fit.ma,
        constant: fit.constant,
        d,
        a: fit.state,
        P: fit.stateCov,
        lastValues: fit.lastValues,
        loglik: fit.loglik,
        aicc: fit.aicc,
      },
      fit.sigma2,
      notes,
    );
    return base;
  },
  /** @throws ForecastInputError for a bad horizon or level. */
  forecast(fit: Fit, h: number, levels: readonly number[]): Forecast {
    checkForecastArgs("arima", h, levels);
    const st = fit.state;
    const { mean, sd } = forecastArima(
      {
        spec: { d: st.d as number },
        ar: st.ar as readonly number[],
        ma: st.ma as readonly number[],
        constant: st.constant as number,
        sigma2: fit.sigma2,
        state: st.a as readonly number[],
        stateCov: st.P as readonly number[],
        lastValues: st.lastValues as readonly number[],
      },
      h,
    );
    return normalForecast("arima", mean, sd, levels);
  },
};

export default arima;
