/**
 * The computations that run in the worker pool (lib/work/pool.ts), by name. Each takes and
 * returns plain data (structured clone: no functions, no class instances; Maps are kept). Only the
 * pure core, and lib/triangulation/calibration-figures.ts, triangulation-figures.ts and track-record-figures.ts (which import only the core), is imported here:
 * a worker loads no database, framework or zod.
 */
import { baseline, type BaselineOptions } from "../forecast/baseline";
import type { RawSeries } from "../forecast/series";
import { launchForecast, type MarketPotential } from "../forecast/launch";
import { computeCalibration } from "../triangulation/calibration-figures";
import { blendsOf, computeTriangulation, triangulationWithEarlier, type TriangulationInput } from "../triangulation/triangulation-figures";
import { evaluateStoppingRules } from "../stats/stopping-rules";
import { trackRecordsOfText } from "../triangulation/track-record-figures";

export const jobs = {
  /** The baseline engine's fit and forecast (lib/forecast/baseline.ts). */
  baseline: (arg: { readonly series: RawSeries; readonly options: Omit<BaselineOptions, "methods"> }) => baseline(arg.series, arg.options),
  /** A launch baseline's simulation (lib/forecast/launch.ts). */
  launch: (arg: { readonly analogues: readonly { readonly name: string; readonly values: readonly number[] }[]; readonly market: MarketPotential; readonly horizon: number; readonly from?: number }) =>
    launchForecast(arg.analogues, arg.market, arg.horizon, [80, 95], undefined, arg.from ?? 1),
  /** Performance weights of a panel (lib/triangulation/calibration-figures.ts). */
  calibration: (arg: { readonly questions: Parameters<typeof computeCalibration>[0]; readonly answers: Parameters<typeof computeCalibration>[1] }) => computeCalibration(arg.questions, arg.answers),
  /** A question's triangulation (lib/triangulation/triangulation-figures.ts). */
  triangulation: (input: TriangulationInput) => computeTriangulation(input),
  /** A question's triangulation and the blend figure before its final round (the question report). */
  triangulationWithEarlier: (arg: { readonly input: TriangulationInput; readonly earlier: TriangulationInput | null }) => triangulationWithEarlier(arg.input, arg.earlier),
  /** The stopping rules' verdicts after a round (lib/stats/stopping-rules.ts). */
  stoppingRules: (input: Parameters<typeof evaluateStoppingRules>[0]) => evaluateStoppingRules(input),
  /** Track records per roster member from the outcomes that count, sent as one JSON text (lib/triangulation/track-record-figures.ts). */
  trackRecords: (arg: { readonly outcomes: string; readonly keep: readonly number[] | null }) => trackRecordsOfText(arg.outcomes, arg.keep),
  /** The blend figure and intervals of each question (a panel's report table). */
  blends: (inputs: readonly TriangulationInput[]) => blendsOf(inputs),
};

export type Jobs = typeof jobs;
export type JobName = keyof Jobs;
