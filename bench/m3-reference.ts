/**
 * Reference rows of the M3 bench (bench/m3-coverage.ts): the competition's submitted Theta and
 * single/Holt/damped combination forecasts (fields `theta`, `comb_shd` of m3.jsonl) and, with
 * --r, R's forecast::ets() and forecast::auto.arima() with default settings, run live by
 * bench/m3-r.R on the same training parts and horizons (nothing cached). Scored as the project's
 * forecasts: sMAPE (Makridakis & Hibon 2000), MASE with the seasonal-naive in-sample scale
 * (Hyndman & Koehler 2006), and for R the share of held-out points inside its 80% / 95% intervals.
 */
import { spawn } from "node:child_process";
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { meanAbsoluteScaledError, symmetricMape } from "../lib/forecast/accuracy";
import type { M3Series } from "./m3-score";

/** One method's forecasts for one series: mean and, when known, the 80% / 95% bounds. */
export interface ReferenceForecast {
  readonly mean: readonly number[];
  readonly lo80?: readonly number[];
  readonly hi80?: readonly number[];
  readonly lo95?: readonly number[];
  readonly hi95?: readonly number[];
}

/** Runs bench/m3-r.R over the series in `parts` Rscript processes; forecasts by model and series id, and the wall time. */
export async function runR(series: readonly M3Series[], parts: number): Promise<{ byModel: Map<string, Map<string, ReferenceForecast>>; seconds: number; fitSeconds: number }> {
  const dir = mkdtempSync(join(tmpdir(), "triangulate-m3-r-"));
  try {
    const input = join(dir, "series.tsv");
    writeFileSync(input, series.map((s) => [s.id, s.frequency, s.h, s.train.join(" ")].join("\t")).join("\n") + "\n");
    const script = new URL("./m3-r.R", import.meta.url).pathname;
    const t0 = performance.now();
    await Promise.all(
      Array.from({ length: parts }, (_, i) =>
        new Promise<void>((resolve, reject) => {
          const child = spawn("Rscript", [script, input, join(dir, `out${i + 1}.tsv`), String(i + 1), String(parts)], { stdio: ["ignore", "ignore", "inherit"] });
          child.on("error", reject);
          child.on("exit", (code) => (code === 0 ? resolve() : reject(new Error(`Rscript exited with ${code}`))));
        }),
      ),
    );
    const seconds = (performance.now() - t0) / 1000;
    const byModel = new Map<string, Map<string, ReferenceForecast>>();
    let fitSeconds = 0;
    for (let i = 1; i <= parts; i++) {
      for (const line of readFileSync(join(dir, `out${i}.tsv`), "utf8").split("\n")) {
        if (!line.trim()) continue;
        const [id, model, secs, ...cells] = line.split("\t");
        fitSeconds += Number(secs);
        const [mean, lo80, hi80, lo95, hi95] = cells.map((c) => c.split(" ").map(Number));
        if (!byModel.has(model)) byModel.set(model, new Map());
        byModel.get(model)!.set(id, { mean, lo80, hi80, lo95, hi95 });
      }
    }
    return { byModel, seconds, fitSeconds };
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

/** Mean sMAPE and MASE over series, and points inside the 80% / 95% bounds (when given), of one reference method. */
export interface ReferenceTally {
  series: number;
  smape: number;
  mase: number;
  maseCount: number;
  points: number;
  in80: number;
  in95: number;
  failures: number;
}

/** Adds one series' reference forecast to a tally (a missing or non-finite forecast counts as a failure). */
export function tallyReference(t: ReferenceTally, s: M3Series, f: ReferenceForecast | undefined): void {
  t.series++;
  if (!f || f.mean.length !== s.h || !f.mean.every(Number.isFinite)) {
    t.failures++;
    return;
  }
  t.smape += symmetricMape(s.test, f.mean);
  const m = meanAbsoluteScaledError(s.test, f.mean, s.train, s.frequency);
  if (Number.isFinite(m)) {
    t.mase += m;
    t.maseCount++;
  }
  if (f.lo80 && f.hi80 && f.lo95 && f.hi95) {
    s.test.forEach((y, i) => {
      t.points++;
      if (f.lo80![i] <= y && y <= f.hi80![i]) t.in80++;
      if (f.lo95![i] <= y && y <= f.hi95![i]) t.in95++;
    });
  }
}

export const emptyReference = (): ReferenceTally => ({ series: 0, smape: 0, mase: 0, maseCount: 0, points: 0, in80: 0, in95: 0, failures: 0 });
