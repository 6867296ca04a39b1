/**
 * `npm run bench -- coverage [--data FILE] [--every K] [--method M] [--period P]`: accuracy
 * and calibration of the automatic baseline on the M3 competition (Makridakis & Hibon 2000,
 * 3,003 series, as distributed by the R package Mcomp; one JSON object per line with id,
 * period, frequency, h, train and test).
 *
 * For each series: `baseline(train, { season: frequency, horizon: h, method })` and, on the h
 * held-out points, sMAPE = mean 200·|y − f| / (|y| + |f|) (the competition's measure), MASE
 * with the seasonal-naive in-sample scale at `frequency` (Hyndman & Koehler 2006), and the
 * share of held-out points inside the 80% and 95% intervals. Figures are means over series
 * (sMAPE, MASE) and over points (coverage), by period and overall, with the wall time.
 * Goal for the intervals (issue 14): 77–83% and 92–97%.
 *
 * `--every K` keeps every K-th series (a quick look while working; report full runs).
 * The data file defaults to $TRIANGULATE_M3 or ../shared/benchmark-data/m3.jsonl.
 */
import { readFileSync } from "node:fs";
import { loadavg } from "node:os";
import { parseArgs } from "node:util";
import { meanAbsoluteScaledError, symmetricMape } from "../lib/forecast/accuracy";
import { baseline } from "../lib/forecast/baseline";
import type { MethodId } from "../lib/forecast/types";

interface M3Series {
  id: string;
  period: string;
  frequency: number;
  h: number;
  train: number[];
  test: number[];
}

interface Tally {
  series: number;
  smape: number;
  mase: number;
  maseCount: number;
  points: number;
  in80: number;
  in95: number;
  failures: number;
}

const empty = (): Tally => ({ series: 0, smape: 0, mase: 0, maseCount: 0, points: 0, in80: 0, in95: 0, failures: 0 });

export function runCoverage(args: string[]): void {
  const { values } = parseArgs({
    args,
    options: {
      data: { type: "string" },
      every: { type: "string" },
      method: { type: "string" },
      period: { type: "string" },
    },
  });
  const file = values.data ?? process.env.TRIANGULATE_M3 ?? "../shared/benchmark-data/m3.jsonl";
  const every = values.every ? Number(values.every) : 1;
  const method = (values.method ?? "auto") as "auto" | MethodId;
  const all: M3Series[] = readFileSync(file, "utf8")
    .split("\n")
    .filter((l) => l.trim() !== "")
    .map((l) => JSON.parse(l) as M3Series);
  const series = all.filter((s, i) => i % every === 0 && (!values.period || s.period === values.period));
  const tallies = new Map<string, Tally>();
  const chosen = new Map<string, number>();
  const t0 = performance.now();
  for (const s of series) {
    const t = tallies.get(s.period) ?? empty();
    tallies.set(s.period, t);
    t.series++;
    try {
      const r = baseline(s.train, { season: s.frequency, horizon: s.h, method, levels: [80, 95] });
      chosen.set(r.method, (chosen.get(r.method) ?? 0) + 1);
      const mean = r.forecast.map((f) => f.mean ?? NaN);
      t.smape += symmetricMape(s.test, mean);
      const mase = meanAbsoluteScaledError(s.test, mean, s.train, s.frequency);
      if (Number.isFinite(mase)) {
        t.mase += mase;
        t.maseCount++;
      }
      r.forecast.forEach((f, i) => {
        const y = s.test[i];
        t.points++;
        if ((f.lower["80"] ?? Infinity) <= y && y <= (f.upper["80"] ?? -Infinity)) t.in80++;
        if ((f.lower["95"] ?? Infinity) <= y && y <= (f.upper["95"] ?? -Infinity)) t.in95++;
      });
    } catch (e) {
      t.failures++;
      console.error(`${s.id}: ${e instanceof Error ? e.message : String(e)}`);
    }
  }
  const seconds = (performance.now() - t0) / 1000;
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
    ].join("  ");
  console.log(`M3 (${file}), method ${method}${every > 1 ? `, every ${every}th series` : ""}`);
  console.log(["period".padEnd(10), "series".padStart(6), "sMAPE".padStart(7), "MASE".padStart(7), "80% in".padStart(8), "95% in".padStart(8), "failures".padStart(8)].join("  "));
  for (const p of ["yearly", "quarterly", "monthly", "other"]) {
    const t = tallies.get(p);
    if (t) console.log(row(p, t));
  }
  console.log(row("all", total));
  console.log(`goal: 80% interval covers 77–83%, 95% covers 92–97% of held-out points`);
  console.log(`methods chosen: ${[...chosen.entries()].sort((a, b) => b[1] - a[1]).map(([k, v]) => `${k} ${v}`).join(", ")}`);
  console.log(`time: ${seconds.toFixed(1)} s wall (one process); load average ${loadavg().map((v) => v.toFixed(2)).join(", ")}`);
}
