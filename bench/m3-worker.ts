/**
 * One worker thread of the M3 bench (bench/m3-coverage.ts): scores each series it is sent and
 * answers with the series' figures (plain data).
 */
import { parentPort } from "node:worker_threads";
import { scoreSeries, type M3Series, type SeriesScore } from "./m3-score";

const port = parentPort!;
port.on("message", (m: { index: number; series: M3Series; method: string; total: boolean; from?: number }) => {
  const score: SeriesScore = scoreSeries(m.series, m.method, m.total, m.from ?? 1);
  port.postMessage({ index: m.index, score });
});
