/**
 * One worker thread of the M3 bench (bench/m3-coverage.ts, through lib/work/pool.ts): scores
 * each series it is sent and answers with the series' figures (plain data).
 */
import { serveJobs } from "../lib/work/serve";
import { scoreSeries, type M3Series, type SeriesScore } from "./m3-score";

/** The bench's job table. */
export const benchJobs = {
  score: (arg: { readonly series: M3Series; readonly method: string; readonly total: boolean; readonly from?: number; readonly members?: readonly string[] }): SeriesScore =>
    scoreSeries(arg.series, arg.method, arg.total, arg.from ?? 1, arg.members),
};

serveJobs(benchJobs);
