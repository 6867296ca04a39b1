/**
 * Point forecasts and prediction intervals of a fitted additive-error member (the named
 * exponential-smoothing methods): closed-form variances for the linear members (class 1 of
 * Hyndman, Koehler, Ord & Snyder 2008, ch. 6), simulated sample paths for A,A,M
 * (./simulate.ts). Pure TypeScript.
 */
import { normalQuantile } from "../../stats/normal";
import { quantileOfSorted } from "../../stats/quantile";
import type { Fit, Forecast, MethodId } from "../types";
import { checkHorizon, type EtsModel } from "./model";
import { simulateAam, SIMULATION_PATHS } from "./simulate";

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
    for (const lv of levels) {
      lower[String(lv)] = [];
      upper[String(lv)] = [];
    }
    // Positions (0-based, ascending) of the order statistics the quantiles below read.
    const orderIndices = [
      ...new Set(
        levels.flatMap((lv) =>
          [0.5 - lv / 200, 0.5 + lv / 200].flatMap((p) => [Math.floor((SIMULATION_PATHS - 1) * p), Math.ceil((SIMULATION_PATHS - 1) * p)]),
        ),
      ),
    ].sort((a, b) => a - b);
    for (let i = 0; i < h; i++) {
      const col = paths.subarray(i * SIMULATION_PATHS, (i + 1) * SIMULATION_PATHS);
      let s1 = 0;
      for (let p = 0; p < col.length; p++) s1 += col[p];
      const avg = s1 / col.length;
      let s2 = 0;
      for (let p = 0; p < col.length; p++) s2 += (col[p] - avg) ** 2;
      sd.push(Math.sqrt(s2 / (col.length - 1)));
      let sorted: readonly number[];
      if (Number.isFinite(s1)) {
        // Type 7 quantiles read only the order statistics at ⌊(n − 1)p⌋ and ⌈(n − 1)p⌉: put just
        // those in their sorted places (same values as a full sort, in linear expected time).
        selectOrderStatistics(col, orderIndices);
        sorted = col as unknown as readonly number[];
      } else {
        col.sort(); // a non-finite path: the full sort orders NaN last
        sorted = Array.from(col);
      }
      for (const lv of levels) {
        lower[String(lv)].push(quantileOfSorted(sorted, 0.5 - lv / 200, 7));
        upper[String(lv)].push(quantileOfSorted(sorted, 0.5 + lv / 200, 7));
      }
    }
  }
  return { method, mean, levels: [...levels], lower, upper, sd };
}

/**
 * Rearranges finite values `a` in place so that a[k] holds the k-th smallest value (0-based)
 * for every k in `ks` (ascending, within range), with no larger value before and no smaller
 * one after each such position: the values a full sort would put there. Hoare's selection
 * (Hoare 1961, "Algorithm 65: Find", CACM 4(7); Wirth's formulation) on the part of the array
 * to the right of the previous position, O(n) expected per position; no allocation.
 */
function selectOrderStatistics(a: Float64Array, ks: readonly number[]): void {
  let from = 0;
  const last = a.length - 1;
  for (const k of ks) {
    let left = from;
    let right = last;
    while (left < right) {
      const x = a[k];
      let i = left;
      let j = right;
      do {
        while (a[i] < x) i++;
        while (x < a[j]) j--;
        if (i <= j) {
          const tmp = a[i];
          a[i] = a[j];
          a[j] = tmp;
          i++;
          j--;
        }
      } while (i <= j);
      if (j < k) left = i;
      if (k < i) right = j;
    }
    from = k + 1;
  }
}

