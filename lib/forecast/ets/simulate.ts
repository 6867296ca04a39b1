/**
 * Simulated future paths of the Holt-Winters multiplicative method, ETS(A,A,M), whose forecast
 * distribution has no closed form (Hyndman, Koehler, Ord & Snyder 2008 §6.1; R's forecast::ets
 * simulates too). Deterministic: the same fit always gives the same paths. Pure TypeScript.
 */
import { normalStream, sharedNormals, PATHS, PATH_RNG_START } from "./state-space";

/** Number of simulated paths for the intervals of the multiplicative-season model. */
export const SIMULATION_PATHS = PATHS;
/** Fixed rng start of the simulation, so that the same fit always gives the same intervals. */
export const SIMULATION_RNG_START = PATH_RNG_START;

/**
 * Simulated future paths of ETS(A,A,M) (or A,Ad,M), stored step-major:
 * out[i·paths + p] is step i + 1 of path p. Each path runs the model's recursions with
 * ε ~ N(0, σ²) drawn by Box–Muller (Box & Muller 1958) from the mulberry32 generator, started
 * at SIMULATION_RNG_START, so the output is deterministic (Hyndman et al. 2008 §6.1: the
 * simulation route to forecast distributions of the nonlinear models).
 * Input: finite states and parameters, sigma ≥ 0, h ≥ 1, paths ≥ 1 (not checked; internal use).
 */
export function simulateAam(
  level: number,
  trend: number,
  seasonNext: readonly number[],
  m: number,
  alpha: number,
  beta: number,
  gamma: number,
  phi: number,
  sigma: number,
  h: number,
  paths: number,
): Float64Array {
  const out = new Float64Array(h * paths);
  const ring = new Float64Array(m);
  const z = sharedNormals(SIMULATION_RNG_START, h * paths);
  const gauss = z ? null : normalStream(SIMULATION_RNG_START);
  let draw = 0;
  for (let p = 0; p < paths; p++) {
    for (let j = 0; j < m; j++) ring[j] = seasonNext[j];
    let l = level;
    let b = trend;
    let k = 0;
    for (let i = 0; i < h; i++) {
      const q = l + phi * b;
      const sv = ring[k];
      const e = sigma * (z ? z[draw++] : gauss!());
      out[i * paths + p] = q * sv + e;
      l = q + (alpha * e) / sv;
      b = phi * b + (beta * e) / sv;
      ring[k] = sv + (gamma * e) / q;
      if (++k === m) k = 0;
    }
  }
  return out;
}
