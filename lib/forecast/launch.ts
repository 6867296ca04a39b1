/**
 * A launch baseline (docs/methods.md §19): the Bass model fitted to analogous products' adoptions
 * carries their p and q to a new product whose market potential m comes from the panel. Pure
 * TypeScript.
 *
 * The new product's adoptions in period t since launch are m·(F(t) − F(t−1)) with the analogues'
 * p, q (Bass 1969). The forecast distribution is simulated (fixed PRNG start value): each draw takes
 * the analogues in turn (an equal mixture over analogues, so their spread counts), draws (p, q) from
 * the normal approximation of that analogue's estimates (their covariance from the fit; a draw with
 * p ≤ 0 or q < 0 is drawn again), draws m from a lognormal through the panel's median and 80% range,
 * and adds each period's error with the analogue's residual sd scaled by m/m_analogue (errors
 * proportional to the market's size). Adoptions below 0 are held at 0. Bounds are the draws' type-7
 * quantiles; the mean is the draws' mean.
 *
 * Policy: at least one analogue, each accepted by `fitBass` (≥ 5 non-negative periods, positive
 * total); the market potential's low < median < high, all positive; otherwise a RangeError names
 * the input.
 */
import { bassShare, fitBass, type BassFit } from "./bass";
import { sampleBounds } from "./ets/distribution";
import { normalStream } from "./ets/state-space";
import { normalQuantile } from "../stats/normal";

/** Number of simulated draws. */
export const LAUNCH_DRAWS = 10000;
/** Fixed PRNG start value of the draws (the same inputs always give the same figures). */
export const LAUNCH_RNG_START = 0x1969b455;

/** The market potential's distribution: lognormal with this median and log-scale sd. */
export interface MarketPotential {
  readonly median: number;
  readonly sigmaLog: number;
  /** The P10 and P90 it was made from. */
  readonly low: number;
  readonly high: number;
  /** Where it comes from, for people. */
  readonly how: string;
}

/**
 * A lognormal through a median and a central 80% range (P10, P90): σ = ln(high/low)/(2·z_0.9),
 * z_0.9 = Φ⁻¹(0.9) = 1.2816; an asymmetric range is read by its log width.
 * @throws RangeError unless 0 < low < median < high, all finite.
 */
export function marketPotentialFromRange(low: number, median: number, high: number, how: string): MarketPotential {
  if (!(Number.isFinite(low) && Number.isFinite(median) && Number.isFinite(high) && low > 0 && low < median && median < high)) {
    throw new RangeError(`market potential: needs 0 < low < median < high (got ${low}, ${median}, ${high})`);
  }
  return { median, sigmaLog: Math.log(high / low) / (2 * normalQuantile(0.9)), low, high, how };
}

/** One analogue's fit as shown to people. */
export interface AnalogueFit {
  readonly name: string;
  readonly periods: number;
  readonly p: number;
  readonly q: number;
  readonly m: number;
  readonly se: { readonly p: number; readonly q: number; readonly m: number };
  readonly peak: number;
  /** Its adoptions as given, and the fitted curve m·(F(t) − F(t−1)). */
  readonly values: readonly number[];
  readonly fitted: readonly number[];
  readonly notes: readonly string[];
}

/** Mean and bounds (by level, "80", "95") of one simulated quantity. */
export interface SimulatedQuantity {
  readonly mean: number;
  readonly lower: Record<string, number>;
  readonly upper: Record<string, number>;
}

export interface LaunchForecast {
  readonly analogues: readonly AnalogueFit[];
  /** p and q carried to the new product: the draws' mean and 80% range. */
  readonly p: SimulatedQuantity;
  readonly q: SimulatedQuantity;
  readonly market: MarketPotential;
  /** Periods 1..horizon since launch. */
  readonly steps: readonly SimulatedQuantity[];
  /** Total of periods from..horizon (launchForecast's `from`, default 1). */
  readonly total: SimulatedQuantity;
  readonly draws: number;
  readonly notes: readonly string[];
}

function summarise(values: Float64Array, levels: readonly number[]): SimulatedQuantity {
  const sorted = Array.from(values).sort((a, b) => a - b);
  const b = sampleBounds(sorted, levels);
  const lower: Record<string, number> = {};
  const upper: Record<string, number> = {};
  levels.forEach((lv, i) => {
    lower[String(lv)] = b.lower[i];
    upper[String(lv)] = b.upper[i];
  });
  return { mean: sorted.reduce((a, v) => a + v, 0) / sorted.length, lower, upper };
}

/** Cholesky factor of the (p, q) block of a fit's covariance; zeros when it is not usable. */
function pqFactor(f: BassFit): [number, number, number] {
  const a = f.covariance[0][0];
  const b = f.covariance[0][1];
  const c = f.covariance[1][1];
  if (!(a > 0 && c > 0 && Number.isFinite(b))) return [0, 0, 0];
  const l11 = Math.sqrt(a);
  const l21 = b / l11;
  return [l11, l21, Math.sqrt(Math.max(c - l21 * l21, 0))];
}

/**
 * The launch forecast for periods 1..horizon (see the file comment); its total is over periods
 * `from`..horizon (default 1: all of them).
 * @throws RangeError for no analogue, an analogue the Bass fit refuses (named), a horizon
 *   outside 1..1000, or a first period outside 1..horizon.
 */
export function launchForecast(
  analogues: readonly { readonly name: string; readonly values: readonly number[] }[],
  market: MarketPotential,
  horizon: number,
  levels: readonly number[],
  draws = LAUNCH_DRAWS,
  from = 1,
): LaunchForecast {
  if (analogues.length === 0) throw new RangeError("launch: give at least one analogous product's adoptions");
  if (!(Number.isInteger(horizon) && horizon >= 1 && horizon <= 1000)) throw new RangeError(`launch: the horizon must be a whole number from 1 to 1000 (got ${horizon})`);
  if (!(Number.isInteger(from) && from >= 1 && from <= horizon)) throw new RangeError(`launch: the total's first period must be a whole number from 1 to the horizon ${horizon} (got ${from})`);
  const fits = analogues.map((a) => {
    try {
      return fitBass(a.values);
    } catch (e) {
      throw new RangeError(`analogue '${a.name}': ${e instanceof Error ? e.message : String(e)}`);
    }
  });
  const factors = fits.map(pqFactor);
  const z = normalStream(LAUNCH_RNG_START);
  const ps = new Float64Array(draws);
  const qs = new Float64Array(draws);
  const steps = Array.from({ length: horizon }, () => new Float64Array(draws));
  const totals = new Float64Array(draws);
  for (let d = 0; d < draws; d++) {
    const j = d % fits.length;
    const f = fits[j];
    const [l11, l21, l22] = factors[j];
    let p = f.p;
    let q = f.q;
    for (let tries = 0; tries < 50; tries++) {
      const z1 = z();
      const z2 = z();
      const pp = f.p + l11 * z1;
      const qq = f.q + l21 * z1 + l22 * z2;
      if (pp > 0 && qq >= 0) {
        p = pp;
        q = qq;
        break;
      }
    }
    const m = market.median * Math.exp(market.sigmaLog * z());
    const noise = Math.sqrt(f.sigma2) * (m / f.m);
    ps[d] = p;
    qs[d] = q;
    let prev = 0;
    let total = 0;
    for (let t = 1; t <= horizon; t++) {
      const share = bassShare(t, p, q);
      const v = Math.max(0, m * (share - prev) + noise * z());
      prev = share;
      steps[t - 1][d] = v;
      if (t >= from) total += v;
    }
    totals[d] = total;
  }
  const notes: string[] = [
    `Bass model (Bass 1969) fitted to ${fits.length} analogous product${fits.length === 1 ? "" : "s"} by nonlinear least squares (Srinivasan & Mason 1986); their p and q carried to the new product, its market potential m ${market.how}; ${draws} simulated draws (docs/methods.md §19).`,
    "Analogues should be chosen for similar adoption drivers (price, channel, who adopts and why); the curve's shape comes from them alone.",
  ];
  fits.forEach((f, i) => f.notes.forEach((n) => notes.push(`analogue '${analogues[i].name}': ${n}`)));
  return {
    analogues: fits.map((f, i) => ({
      name: analogues[i].name,
      periods: f.n,
      p: f.p,
      q: f.q,
      m: f.m,
      se: f.se,
      peak: f.peak,
      values: [...analogues[i].values],
      fitted: f.fitted,
      notes: f.notes,
    })),
    p: summarise(ps, [80]),
    q: summarise(qs, [80]),
    market,
    steps: steps.map((s) => summarise(s, levels)),
    total: summarise(totals, levels),
    draws,
    notes,
  };
}
