/**
 * Departure: how far an answer, or the panel figure, sits from the baseline — in units, in
 * percent, in baseline standard errors (z), as a percentile of the baseline's predictive
 * distribution, and whether it falls outside the baseline's 80% and 95% intervals; and how
 * the panel's departure moved across rounds. Input policy: see `index.ts`.
 */
import { normalCdf, normalQuantile } from "../stats/normal";
import { baselineDistribution, type BaselineForecast, type BaselineSdSource } from "./distribution";
import { assertFinite, assertFiniteArray } from "../stats/validate";

/** The departure of one value from the baseline. */
export interface Departure {
  /** The answer or panel figure. */
  readonly value: number;
  /** The baseline's point forecast. */
  readonly baseline: number;
  /** value − baseline, in the question's unit. */
  readonly difference: number;
  /** 100·difference / |baseline|; NaN when the baseline is 0 (undefined). */
  readonly percent: number;
  /** difference / sd, sd the baseline's forecast standard deviation at the horizon. */
  readonly z: number;
  /** Where the value falls in the baseline's distribution, 100·Φ(z), in percent (0–100). */
  readonly percentile: number;
  /** Outside the baseline's central 80% interval: percentile below 10 or above 90. */
  readonly outside80: boolean;
  /** Outside the baseline's central 95% interval: percentile below 2.5 or above 97.5. */
  readonly outside95: boolean;
  /** The baseline sd used for z and the percentile, and where it came from. */
  readonly sd: number;
  readonly sdSource: BaselineSdSource;
}

/**
 * The departure of `value` from the baseline (docs/methods.md §16):
 * difference d = value − m; percent = 100·d/|m|; z = d/sd; percentile = 100·Φ(z); and the flags
 * read from the same distribution: outside the 80% interval when |z| > Φ⁻¹(0.90), outside the
 * 95% interval when |z| > Φ⁻¹(0.975). m is the baseline mean and sd its forecast standard
 * deviation at the horizon (from `baselineDistribution`: the given sd, else implied by the 80%
 * or 95% interval's width) — the same normal the blend uses, so a value at the 99.5th
 * percentile is always outside 95% (percentile and flags cannot disagree). An asymmetric
 * interval is summarised by its width, as in `baselineDistribution`. Φ by lib/stats (Cody 1969,
 * as R's pnorm). A value on a bound is inside.
 *
 * @throws RangeError for a non-finite value or an invalid baseline (see `baselineDistribution`).
 * @example departure(130, { mean: 100, sd: 10 }) // z 3, percentile 99.865, outside95 true
 */
export function departure(value: number, baseline: BaselineForecast): Departure {
  assertFinite(value, "departure", "value");
  const { distribution, sdSource } = baselineDistribution(baseline);
  const { mean, sd } = distribution;
  const difference = value - mean;
  const z = difference / sd;
  return {
    value,
    baseline: mean,
    difference,
    percent: mean === 0 ? NaN : (100 * difference) / Math.abs(mean),
    z,
    percentile: 100 * normalCdf(z),
    outside80: Math.abs(z) > normalQuantile(0.9),
    outside95: Math.abs(z) > normalQuantile(0.975),
    sd,
    sdSource,
  };
}

/**
 * {@link departure} of every answer in a round against the same baseline.
 *
 * Input: a non-empty array of finite answers.
 * @throws RangeError for an empty array, a non-finite answer (named by index), or an invalid baseline.
 */
export function answerDepartures(values: readonly number[], baseline: BaselineForecast): Departure[] {
  assertFiniteArray(values, "answerDepartures", "values");
  return values.map((v) => departure(v, baseline));
}

/** The panel's departure in one round and its change from the round before. */
export interface RoundDeparture extends Departure {
  /** Round number, 1-based. */
  readonly round: number;
  /** difference − previous round's difference (NaN in round 1). */
  readonly differenceChange: number;
  /** z − previous round's z (NaN in round 1). */
  readonly zChange: number;
  /** |z| smaller than in the round before (moved toward the baseline); null in round 1. */
  readonly closer: boolean | null;
}

/** How the panel's departure moved across rounds. */
export interface DepartureAcrossRounds {
  readonly rounds: readonly RoundDeparture[];
  /** z in the last round − z in round 1 (0 with one round). */
  readonly totalZChange: number;
}

/**
 * The panel figure's departure in each round (rounds 1…n in order) against one baseline, with
 * the round-to-round change of the difference and of z, and whether the panel moved toward the
 * baseline (|z| fell).
 *
 * Input: a non-empty array of panel figures, one per round, in round order.
 * @throws RangeError for an empty array, a non-finite figure, or an invalid baseline.
 */
export function departureAcrossRounds(panelFigures: readonly number[], baseline: BaselineForecast): DepartureAcrossRounds {
  assertFiniteArray(panelFigures, "departureAcrossRounds", "panelFigures");
  const rounds: RoundDeparture[] = [];
  panelFigures.forEach((v, i) => {
    const d = departure(v, baseline);
    const prev = i > 0 ? rounds[i - 1] : undefined;
    rounds.push({
      ...d,
      round: i + 1,
      differenceChange: prev ? d.difference - prev.difference : NaN,
      zChange: prev ? d.z - prev.z : NaN,
      closer: prev ? Math.abs(d.z) < Math.abs(prev.z) : null,
    });
  });
  return { rounds, totalZChange: rounds[rounds.length - 1].z - rounds[0].z };
}
