/**
 * `npm run bench -- coverage [--data FILE] [--every K] [--method M] [--members a,b] [--r] [--period P] [--threads N] [--total [--from A]]`:
 * accuracy and calibration of the automatic baseline on the M3 competition (Makridakis & Hibon
 * 2000, 3,003 series, as distributed by the R package Mcomp; one JSON object per line with id,
 * period, frequency, h, train and test).
 *
 * For each series: `baseline(train, { season: frequency, horizon: h, method })` and, on the h
 * held-out points, sMAPE = mean 200·|y − f| / (|y| + |f|) (the competition's measure), MASE
 * with the seasonal-naive in-sample scale at `frequency` (Hyndman & Koehler 2006), and the
 * share of held-out points inside the 80% and 95% intervals (bench/m3-score.ts). Figures are
 * means over series (sMAPE, MASE) and over points (coverage), by period and overall, with the
 * wall time. Goal for the intervals (issue 14): 77–83% and 92–97%. The held-out points are
 * never fitted on. The competition's own Theta forecasts are scored the same way beside them.
 *
 * The series are spread over worker threads (node:worker_threads; default: one per core, at
 * most 2 — this machine's cores), each taking the next series when it is done with one; the
 * time printed is the wall time of the whole run after the workers have loaded the code, with
 * the CPU time of all threads beside it, the main thread's part of it, and the tail (how long
 * after a worker first found no series left the last one was done).
 *
 * `--total` also asks for the total over the horizon (docs/methods.md §10, §20) and reports how
 * often the held-out sum lies inside its 80% and 95% intervals; with `--from A`, the total of
 * periods min(A, h)..h only (a window that starts after the next period).
 * `--members a,b,c`: the automatic combination of those methods instead of the default members
 * (to compare member sets on the same series).
 * Below the main table, by period: ours beside the competition's submitted Theta and single/Holt/
 * damped combination and, with `--r`, R's forecast::ets() and forecast::auto.arima() run live
 * on the same series (bench/m3-reference.ts, bench/m3-r.R; reference rows, several minutes).
 * `--every K` keeps every K-th series (a quick look while working; report full runs).
 * The data file defaults to $TRIANGULATE_M3 or ../shared/benchmark-data/m3.jsonl.
 */
import { readFileSync } from "node:fs";
import { availableParallelism, loadavg } from "node:os";
import { parseArgs } from "node:util";
import { meanAbsoluteScaledError, symmetricMape } from "../lib/forecast/accuracy";
import { createPool } from "../lib/work/pool";
import { emptyReference, runR, tallyReference, type ReferenceForecast, type ReferenceTally } from "./m3-reference";
import type { M3Series, SeriesScore } from "./m3-score";
import type { benchJobs } from "./m3-worker";

/** A reference tally plus the project's own counts: forecasts outside their own bounds, and the competition's Theta beside them. */
interface Tally extends ReferenceTally {
  incoherent: number;
  thetaSmape: number;
  thetaMase: number;
  thetaCount: number;
  totals: number;
  total80: number;
  total95: number;
}

const empty = (): Tally => ({ series: 0, smape: 0, mase: 0, maseCount: 0, points: 0, in80: 0, in95: 0, failures: 0, incoherent: 0, thetaSmape: 0, thetaMase: 0, thetaCount: 0, totals: 0, total80: 0, total95: 0 });

/** CPU seconds of this process's main thread so far (Linux /proc; NaN elsewhere). */
function mainThreadCpu(): number {
  try {
    const stat = readFileSync(`/proc/self/task/${process.pid}/stat`, "utf8");
    const f = stat.slice(stat.lastIndexOf(")") + 2).split(" ");
    return (Number(f[11]) + Number(f[12])) / 100; // utime, stime in clock ticks (USER_HZ = 100 on Linux)
  } catch {
    return NaN;
  }
}

/**
 * Scores every series on a pool of `threads` workers (lib/work/pool.ts), each taking the next
 * series when free. Also measured: the main thread's CPU (handing out series, collecting
 * answers) and the tail, from the moment a worker first found no series left to the end.
 */
async function scoreAll(series: readonly M3Series[], method: string, threads: number, total: boolean, from: number, members?: readonly string[]): Promise<{ scores: SeriesScore[]; seconds: number; cpuSeconds: number; mainCpuSeconds: number; tailSeconds: number }> {
  const pool = createPool<typeof benchJobs>(new URL("./m3-worker-boot.mjs", import.meta.url), Math.min(threads, series.length));
  // Warm-up: one small series per worker, so that module loading is not counted in the time.
  await Promise.all(Array.from({ length: Math.min(threads, series.length) }, () => pool.run("score", { series: series[0], method, total, from, members })));
  const t0 = performance.now();
  const c0 = process.cpuUsage();
  const m0 = mainThreadCpu();
  let done = 0;
  let drained = NaN;
  const scores = await Promise.all(
    series.map((s) =>
      pool.run("score", { series: s, method, total, from, members }).then((r) => {
        // The (N − threads + 1)-th answer frees a worker with nothing left to take.
        if (++done === Math.max(series.length - Math.min(threads, series.length) + 1, 1)) drained = performance.now();
        return r;
      }),
    ),
  );
  const end = performance.now();
  const seconds = (end - t0) / 1000;
  const cpu = process.cpuUsage(c0);
  const mainCpuSeconds = mainThreadCpu() - m0;
  await pool.close();
  return { scores, seconds, cpuSeconds: (cpu.user + cpu.system) / 1e6, mainCpuSeconds, tailSeconds: (end - drained) / 1000 };
}

export async function runCoverage(args: string[]): Promise<void> {
  const { values } = parseArgs({
    args,
    options: {
      data: { type: "string" },
      every: { type: "string" },
      method: { type: "string" },
      period: { type: "string" },
      threads: { type: "string" },
      total: { type: "boolean" },
      from: { type: "string" },
      members: { type: "string" },
      r: { type: "boolean" },
    },
  });
  const file = values.data ?? process.env.TRIANGULATE_M3 ?? "../shared/benchmark-data/m3.jsonl";
  const every = values.every ? Number(values.every) : 1;
  const method = values.method ?? "auto";
  const threads = Math.max(1, values.threads ? Number(values.threads) : Math.min(2, availableParallelism()));
  const all: (M3Series & { theta?: number[]; comb_shd?: number[] })[] = readFileSync(file, "utf8")
    .split("\n")
    .filter((l) => l.trim() !== "")
    .map((l) => JSON.parse(l));
  const series = all.filter((s, i) => i % every === 0 && (!values.period || s.period === values.period));
  const from = values.from ? Number(values.from) : 1;
  if (!(Number.isInteger(from) && from >= 1)) throw new Error(`--from must be a whole number of at least 1 (got ${values.from})`);
  const members = values.members ? values.members.split(",") : undefined;
  const { scores, seconds, cpuSeconds, mainCpuSeconds, tailSeconds } = await scoreAll(series, method, threads, values.total === true, from, members);
  // R runs after our pass (not beside it), so that neither slows the other's timing.
  const r = values.r ? await runR(series, threads) : null;

  const tallies = new Map<string, Tally>();
  const chosen = new Map<string, number>();
  series.forEach((s, i) => {
    const t = tallies.get(s.period) ?? empty();
    tallies.set(s.period, t);
    t.series++;
    if (s.theta) {
      t.thetaSmape += symmetricMape(s.test, s.theta);
      t.thetaMase += meanAbsoluteScaledError(s.test, s.theta, s.train, s.frequency);
      t.thetaCount++;
    }
    const r = scores[i];
    if (r.error !== undefined) {
      t.failures++;
      console.error(`${s.id}: ${r.error}`);
      return;
    }
    chosen.set(r.method!, (chosen.get(r.method!) ?? 0) + 1);
    t.smape += r.smape!;
    if (Number.isFinite(r.mase)) {
      t.mase += r.mase!;
      t.maseCount++;
    }
    t.points += r.points!;
    t.in80 += r.in80!;
    t.in95 += r.in95!;
    t.incoherent += r.incoherent!;
    if (r.total80 !== undefined) {
      t.totals++;
      if (r.total80) t.total80++;
      if (r.total95) t.total95++;
    }
  });
  const total = empty();
  for (const t of tallies.values()) for (const k of Object.keys(total) as (keyof Tally)[]) total[k] += t[k];
  const row = (name: string, t: Tally) =>
    [
      name.padEnd(10),
      String(t.series).padStart(6),
      (t.smape / (t.series - t.failures)).toFixed(2).padStart(7),
      (t.mase / t.maseCount).toFixed(3).padStart(7),
      ((100 * t.in80) / t.points).toFixed(1).padStart(8),
      ((100 * t.in95) / t.points).toFixed(1).padStart(8),
      String(t.failures).padStart(8),
      (t.thetaCount ? (t.thetaSmape / t.thetaCount).toFixed(2) : "-").padStart(11),
      (t.thetaCount ? (t.thetaMase / t.thetaCount).toFixed(3) : "-").padStart(10),
    ].join("  ");
  console.log(`M3 (${file}), method ${method}${members ? ` (combination of ${members.join(", ")})` : ""}${every > 1 ? `, every ${every}th series` : ""}`);
  console.log(["period".padEnd(10), "series".padStart(6), "sMAPE".padStart(7), "MASE".padStart(7), "80% in".padStart(8), "95% in".padStart(8), "failures".padStart(8), "Theta sMAPE".padStart(11), "Theta MASE".padStart(10)].join("  "));
  for (const p of ["yearly", "quarterly", "monthly", "other"]) {
    const t = tallies.get(p);
    if (t) console.log(row(p, t));
  }
  console.log(row("all", total));
  console.log(`goal: 80% interval covers 77–83%, 95% covers 92–97% of held-out points; Theta = the competition's submitted forecasts`);
  if (total.totals > 0) {
    const share = (t: Tally) => `${((100 * t.total80) / t.totals).toFixed(1)}% / ${((100 * t.total95) / t.totals).toFixed(1)}%`;
    console.log(`total over ${from > 1 ? `periods min(${from}, h)..h` : "the horizon"} (--total): held-out sums inside the 80% / 95% intervals: ${["yearly", "quarterly", "monthly", "other"].filter((p) => tallies.get(p)?.totals).map((p) => `${p} ${share(tallies.get(p)!)}`).join(", ")}, all ${share(total)}`);
  }
  console.log(`points whose forecast lies outside its own 80% or 95% interval: ${total.incoherent}`);
  console.log(`methods: ${[...chosen.entries()].sort((a, b) => b[1] - a[1]).map(([k, v]) => `${k} ${v}`).join(", ")}`);
  console.log(`time: ${seconds.toFixed(1)} s wall on ${threads} worker thread${threads === 1 ? "" : "s"} (code loaded before timing); CPU ${cpuSeconds.toFixed(1)} s over all threads (process.cpuUsage; less disturbed by other processes than the wall time), of which the main thread ${mainCpuSeconds.toFixed(1)} s; the last series done ${tailSeconds.toFixed(2)} s after a worker first had none left; load average ${loadavg().map((v) => v.toFixed(2)).join(", ")}`);

  // The same series and horizons, by period: ours beside the competition's submitted Theta and
  // single/Holt/damped combination and, with --r, R's ets() and auto.arima() (reference rows).
  const refs: [string, (s: (typeof series)[number]) => ReferenceForecast | undefined][] = [
    ["Theta (M3 submitted)", (s) => (s.theta ? { mean: s.theta } : undefined)],
    ["comb S/H/D (M3 submitted)", (s) => (s.comb_shd ? { mean: s.comb_shd } : undefined)],
    ...(r
      ? ([
          ["R ets() (reference)", (s) => r.byModel.get("ets")?.get(s.id)],
          ["R auto.arima() (reference)", (s) => r.byModel.get("arima")?.get(s.id)],
        ] as [string, (s: (typeof series)[number]) => ReferenceForecast | undefined][])
      : []),
  ];
  const refTallies = refs.map(() => new Map<string, ReferenceTally>());
  series.forEach((s) =>
    refs.forEach(([, get], k) => {
      const t = refTallies[k].get(s.period) ?? emptyReference();
      refTallies[k].set(s.period, t);
      tallyReference(t, s, get(s));
    }),
  );
  const cell = (v: number, d: number, w: number) => (Number.isFinite(v) ? v.toFixed(d) : "-").padStart(w);
  const line = (period: string, name: string, t: ReferenceTally) =>
    console.log(
      [period.padEnd(10), name.padEnd(28), cell(t.smape / (t.series - t.failures), 2, 7), cell(t.mase / t.maseCount, 3, 7), cell((100 * t.in80) / t.points, 1, 7), cell((100 * t.in95) / t.points, 1, 7), String(t.failures).padStart(8)].join("  "),
    );
  console.log(`\nby period, same series and horizons:`);
  console.log(["period".padEnd(10), "method".padEnd(28), "sMAPE".padStart(7), "MASE".padStart(7), "80% in".padStart(7), "95% in".padStart(7), "failures".padStart(8)].join("  "));
  for (const p of ["yearly", "quarterly", "monthly", "other", "all"]) {
    const ours = p === "all" ? total : tallies.get(p);
    if (!ours) continue;
    line(p, "this project", ours);
    refs.forEach(([name], k) => {
      const t = p === "all" ? [...refTallies[k].values()].reduce((a, x) => { for (const key of Object.keys(a) as (keyof ReferenceTally)[]) a[key] += x[key]; return a; }, emptyReference()) : refTallies[k].get(p);
      if (t) line(p, name, t);
    });
  }
  if (r) console.log(`R (bench/m3-r.R, forecast package defaults, ${threads} Rscript process${threads === 1 ? "" : "es"}): ${r.seconds.toFixed(1)} s wall for ets() and auto.arima() on ${series.length} series (fit + forecast time summed inside R: ${r.fitSeconds.toFixed(1)} s)`);
}
