/**
 * Point forecasts and prediction intervals of a fitted additive-error member (the named
 * exponential-smoothing methods): closed-form variances for the linear members (class 1 of
 * Hyndman, Koehler, Ord & Snyder 2008, ch. 6), simulated sample paths for A,A,M
 * (./simulate.ts). Pure TypeScript.
 */
import { normalQuantile } from "../../stats/normal";
import type { Fit, Forecast, MethodId } from "../types";
import { checkHorizon, type EtsModel } from "./model";
import { simulateAam, SIMULATION_PATHS } from "./simulate";
import { pathBounds } from "./distribution";

/**
 * Point forecasts and prediction intervals of a fitted ETS model.
 *
 * Means: ŷ_{n+h} = ℓ_n + φ_h b_n (+ s | · s) with φ_h = φ + … + φ^h (h when undamped) and the
 * seasonal state of the same position in the last season (Hyndman et al. 2008 table 2.1).
 * Additive models (class 1, Hyndman et al. 2008 ch. 6): var_h = σ²[1 + Σ_{j=1}^{h−1} c_j²],
 * c_j = α + β·φ_j·[trend] + γ·[j mod m = 0], bounds ŷ ± z_{(1+L/100)/2}·√var_h.
 * A,A,M: the bounds are sample quantiles (Hyndman & Fan type 7) of SIMULATION_PATHS paths of
 * the model with N(0, σ²) errors from a deterministic generator (mulberry32, Box–Muller;
 * rng start SIMULATION_RNG_START); `sd` is the standard deviation of the simulated paths.
 * With no levels asked, A,A,M skips the simulation and `sd` is NaN.
 * @throws ForecastInputError for a bad horizon or level.
 */
export function etsForecast(what: string, method: MethodId, model: EtsModel, fit: Fit, h: number, levels: readonly number[]): Forecast {
  checkHorizon(what, h, levels);
  const alpha = fit.parameters.alpha;
  const trendOn = model.trend !== "N";
  const beta = trendOn ? fit.parameters.beta : 0;
  const phi = model.trend === "Ad" ? fit.parameters.phi : 1;
  const seasonal = model.season !== "N";
  const gamma = seasonal ? fit.parameters.gamma : 0;
  const m = seasonal ? fit.season : 1;
  const level = fit.state.level as number;
  const trend = trendOn ? (fit.state.trend as number) : 0;
  const seasonNext = seasonal ? (fit.state.season as readonly number[]) : [];
  const mean: number[] = [];
  let phiSum = 0;
  let phiPow = 1;
  for (let i = 1; i <= h; i++) {
    phiPow *= phi;
    phiSum += phiPow;
    const q = level + phiSum * trend;
    if (!seasonal) mean.push(q);
    else if (model.season === "M") mean.push(q * seasonNext[(i - 1) % m]);
    else mean.push(q + seasonNext[(i - 1) % m]);
  }
  const lower: Record<string, number[]> = {};
  const upper: Record<string, number[]> = {};
  const sd: number[] = [];
  const sigma2 = Math.max(fit.sigma2, 0);
  if (model.season !== "M") {
    let acc = 1;
    let phiJ = 0;
    let pw = 1;
    for (let i = 1; i <= h; i++) {
      sd.push(Math.sqrt(sigma2 * acc));
      // c_i for the next step.
      pw *= phi;
      phiJ += pw;
      const c = alpha + (trendOn ? beta * phiJ : 0) + (seasonal && i % m === 0 ? gamma : 0);
      acc += c * c;
    }
    for (const lv of levels) {
      const z = normalQuantile(0.5 + lv / 200);
      lower[String(lv)] = mean.map((v, i) => v - z * sd[i]);
      upper[String(lv)] = mean.map((v, i) => v + z * sd[i]);
    }
  } else if (levels.length === 0) {
    // No interval asked (automatic selection scores point forecasts only): skip the simulation.
    for (let i = 0; i < h; i++) sd.push(Number.NaN);
  } else {
    const paths = simulateAam(level, trend, seasonNext, m, alpha, beta, gamma, phi, Math.sqrt(sigma2), h, SIMULATION_PATHS);
    const b = pathBounds(paths, SIMULATION_PATHS, h, levels);
    sd.push(...b.sd);
    levels.forEach((lv, l) => {
      lower[String(lv)] = b.lower[l];
      upper[String(lv)] = b.upper[l];
    });
  }
  return { method, mean, levels: [...levels], lower, upper, sd };
}
