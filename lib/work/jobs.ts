/**
 * The computations that run in the worker pool (lib/work/pool.ts), by name. Each takes and
 * returns plain data (structured clone: no functions, no class instances). Only the pure core
 * is imported here: a worker loads no database, framework or zod.
 */
import { baseline, type BaselineOptions } from "../forecast/baseline";
import type { RawSeries } from "../forecast/series";
import { launchForecast, type MarketPotential } from "../forecast/launch";

export const jobs = {
  /** The baseline engine's fit and forecast (lib/forecast/baseline.ts). */
  baseline: (arg: { readonly series: RawSeries; readonly options: Omit<BaselineOptions, "methods"> }) => baseline(arg.series, arg.options),
  /** A launch baseline's simulation (lib/forecast/launch.ts). */
  launch: (arg: { readonly analogues: readonly { readonly name: string; readonly values: readonly number[] }[]; readonly market: MarketPotential; readonly horizon: number; readonly from?: number }) =>
    launchForecast(arg.analogues, arg.market, arg.horizon, [80, 95], undefined, arg.from ?? 1),
};

export type Jobs = typeof jobs;
export type JobName = keyof Jobs;
