/**
 * `npm run bench`: accuracy and speed of the automatic baseline (docs/methods.md §20; or, with
 * --strategy best|combine, rolling-origin selection) against R's forecast package.
 *
 * Series: R's built-in `datasets` (monthly, quarterly, annual), exported by Rscript at bench
 * time to a temporary directory. Each series is split: the last season (monthly: 12 months;
 * quarterly: 2 years = 8 quarters) or, for annual and other non-seasonal data, the last ~10%
 * (at least 3 points) is held out. On each split:
 *   - ours: `baseline(train, { method: "auto", season, horizon })`;
 *   - R: `forecast(ets(train), h)` and `forecast(auto.arima(train), h)` (forecast package).
 * Test-set MASE for all three is computed here with the same formula (Hyndman & Koehler 2006:
 * test MAE divided by the in-sample MAE of the naive, or seasonal naive, forecast on the
 * training part). Summary: geometric mean over series of MASE(ours) / MASE(R), and the share of
 * held-out points inside each one's 80% and 95% intervals (R's forecast() bounds, ours from the
 * baseline): a check of the intervals on series the M3 bench never sees.
 * Time: our automatic selection over all series in one process (performance.now around the
 * loop, after the modules are loaded) against R's `ets()` over the same series (system.time
 * around the loop inside R, so R's start-up is excluded). The process's CPU time over our
 * passes (process.cpuUsage, all threads) is printed too: on a busy machine it varies less
 * than the wall time.
 *
 * Options: --origins N, --step N, --strategy best|combine, --combine K, --refit full|update,
 * --exclude id1,id2 (leave methods out of the candidates, to see what they cost),
 * --include id1,id2 (add methods that automatic selection leaves out by default, e.g. arima),
 * --cache DIR (keep R's export and timings in DIR and reuse them on the next run; for tuning),
 * --compare (also run
 * a grid of selection settings and print their summaries).
 * `npm run bench -- coverage`: accuracy and interval coverage on the M3 competition instead
 * (bench/m3-coverage.ts).
 */
import { execFileSync } from "node:child_process";
import { existsSync, mkdirSync, mkdtempSync, readFileSync, writeFileSync, rmSync } from "node:fs";
import { loadavg, tmpdir } from "node:os";
import { join } from "node:path";
import { parseArgs } from "node:util";
import { baseline, NOT_AUTOMATIC, type BaselineOptions } from "../lib/forecast/baseline";
import { readSeriesCsv, parseCsv } from "../lib/csv/parse";
import { METHODS } from "../lib/forecast/registry";
import type { Method } from "../lib/forecast/types";

/** The registered methods with their fit and forecast times accumulated (for the time breakdown). */
const fitTime = new Map<string, { ms: number; fits: number; fcMs: number; forecasts: number }>();
const entry = (id: string) => {
  const e = fitTime.get(id) ?? { ms: 0, fits: 0, fcMs: 0, forecasts: 0 };
  fitTime.set(id, e);
  return e;
};
const TIMED: Method[] = METHODS.map((m) => ({
  ...m,
  minLength: m.minLength.bind(m),
  applicable: m.applicable.bind(m),
  forecast(fit, h, levels, futureX) {
    const t0 = performance.now();
    try {
      return m.forecast(fit, h, levels, futureX);
    } finally {
      const e = entry(m.id);
      e.fcMs += performance.now() - t0;
      e.forecasts += 1;
    }
  },
  fit(input) {
    const t0 = performance.now();
    try {
      return m.fit(input);
    } finally {
      const e = entry(m.id);
      e.ms += performance.now() - t0;
      e.fits += 1;
    }
  },
}));

const SERIES = [
  // monthly
  "AirPassengers", "co2", "nottem", "ldeaths", "mdeaths", "fdeaths", "UKDriverDeaths", "USAccDeaths",
  // quarterly
  "UKgas", "JohnsonJohnson", "austres", "freeny.y",
  // annual and other non-seasonal
  "Nile", "lynx", "LakeHuron", "sunspot.year", "airmiles", "discoveries", "nhtemp", "uspop", "lh", "BJsales", "WWWusage",
];

const R_SCRIPT = `
suppressMessages(library(forecast))
args <- commandArgs(trailingOnly = TRUE)
dir <- args[1]
names <- strsplit(args[2], ",")[[1]]
split <- lapply(names, function(nm) {
  y <- get(nm, envir = as.environment("package:datasets"))
  f <- frequency(y)
  m <- if (f == 12) 12 else if (f == 4) 4 else 1
  h <- if (m == 12) 12 else if (m == 4) 8 else max(3, round(0.1 * length(y)))
  n <- length(y)
  train <- ts(as.numeric(y)[1:(n - h)], frequency = m)
  test <- as.numeric(y)[(n - h + 1):n]
  write.csv(data.frame(value = as.numeric(train)), file.path(dir, paste0(nm, ".train.csv")), row.names = FALSE)
  write.csv(data.frame(value = test), file.path(dir, paste0(nm, ".test.csv")), row.names = FALSE)
  list(name = nm, m = m, h = h, n = n - h, train = train)
})
manifest <- data.frame(name = sapply(split, function(s) s$name), season = sapply(split, function(s) s$m),
                       horizon = sapply(split, function(s) s$h), n = sapply(split, function(s) s$n))
write.csv(manifest, file.path(dir, "manifest.csv"), row.names = FALSE)
ets_fc <- vector("list", length(split))
t_ets <- system.time(for (i in seq_along(split)) {
  ets_fc[[i]] <- forecast(ets(split[[i]]$train), h = split[[i]]$h, level = c(80, 95))
})[["elapsed"]]
arima_fc <- vector("list", length(split))
t_arima <- system.time(for (i in seq_along(split)) {
  arima_fc[[i]] <- forecast(auto.arima(split[[i]]$train), h = split[[i]]$h, level = c(80, 95))
})[["elapsed"]]
rows <- function(i, model, fc) data.frame(name = split[[i]]$name, model = model, step = seq_len(split[[i]]$h),
  mean = as.numeric(fc$mean), lo80 = as.numeric(fc$lower[, 1]), hi80 = as.numeric(fc$upper[, 1]),
  lo95 = as.numeric(fc$lower[, 2]), hi95 = as.numeric(fc$upper[, 2]))
out <- do.call(rbind, lapply(seq_along(split), function(i) rbind(rows(i, "ets", ets_fc[[i]]), rows(i, "arima", arima_fc[[i]]))))
write.csv(out, file.path(dir, "r-forecasts.csv"), row.names = FALSE)
write.csv(data.frame(ets = t_ets, arima = t_arima), file.path(dir, "r-times.csv"), row.names = FALSE)
`;

/** A method's 80% and 95% bounds for steps 1..h (NaN where not known). */
interface Bounds {
  lo80: number[];
  hi80: number[];
  lo95: number[];
  hi95: number[];
}

interface Split {
  name: string;
  season: number;
  horizon: number;
  train: number[];
  test: number[];
  ets: number[];
  arima: number[];
  etsBounds: Bounds;
  arimaBounds: Bounds;
}

function column(text: string, name: string): string[] {
  const recs = parseCsv(text);
  const j = recs[0].fields.indexOf(name);
  return recs.slice(1).map((r) => r.fields[j]);
}

function exportFromR(cache?: string): { splits: Split[]; etsSeconds: number; arimaSeconds: number } {
  const dir = cache ?? mkdtempSync(join(tmpdir(), "triangulate-bench-"));
  try {
    if (!cache || !existsSync(join(dir, "r-times.csv"))) {
      mkdirSync(dir, { recursive: true });
      const script = join(dir, "export.R");
      writeFileSync(script, R_SCRIPT);
      execFileSync("Rscript", [script, dir, SERIES.join(",")], { stdio: ["ignore", "ignore", "inherit"] });
    }
    const manifest = parseCsv(readFileSync(join(dir, "manifest.csv"), "utf8")).slice(1);
    const rfc = parseCsv(readFileSync(join(dir, "r-forecasts.csv"), "utf8")).slice(1);
    const times = readFileSync(join(dir, "r-times.csv"), "utf8");
    const splits = manifest.map((r) => {
      const [name, season, horizon] = [r.fields[0], Number(r.fields[1]), Number(r.fields[2])];
      const read = (suffix: string) =>
        readSeriesCsv(readFileSync(join(dir, `${name}.${suffix}.csv`), "utf8")).y.map((v) => v as number);
      // Columns: name, model, step, mean, lo80, hi80, lo95, hi95 (a --cache from before the bounds has none: NaN).
      const fc = (model: string, k = 3) => rfc.filter((x) => x.fields[0] === name && x.fields[1] === model).map((x) => Number(x.fields[k] ?? NaN));
      const bounds = (model: string): Bounds => ({ lo80: fc(model, 4), hi80: fc(model, 5), lo95: fc(model, 6), hi95: fc(model, 7) });
      return { name, season, horizon, train: read("train"), test: read("test"), ets: fc("ets"), arima: fc("arima"), etsBounds: bounds("ets"), arimaBounds: bounds("arima") };
    });
    return { splits, etsSeconds: Number(column(times, "ets")[0]), arimaSeconds: Number(column(times, "arima")[0]) };
  } finally {
    if (!cache) rmSync(dir, { recursive: true, force: true });
  }
}

/** Test-set MASE (Hyndman & Koehler 2006), scale = in-sample MAE of the (seasonal) naive forecast. */
function mase(train: readonly number[], test: readonly number[], fc: readonly number[], m: number): number {
  let scale = 0;
  for (let t = m; t < train.length; t++) scale += Math.abs(train[t] - train[t - m]);
  scale /= train.length - m;
  let e = 0;
  for (let j = 0; j < test.length; j++) e += Math.abs(test[j] - fc[j]);
  return e / test.length / scale;
}

/** Held-out points inside a method's 80% and 95% bounds, and how many points had bounds. */
function held(test: readonly number[], b: Bounds | null): { points: number; in80: number; in95: number } {
  let points = 0;
  let in80 = 0;
  let in95 = 0;
  test.forEach((y, j) => {
    if (!b || !Number.isFinite(b.lo95[j])) return;
    points++;
    if (b.lo80[j] <= y && y <= b.hi80[j]) in80++;
    if (b.lo95[j] <= y && y <= b.hi95[j]) in95++;
  });
  return { points, in80, in95 };
}

const geomean = (xs: number[]) => Math.exp(xs.reduce((a, x) => a + Math.log(x), 0) / xs.length);

interface RunSummary {
  label: string;
  rows: { name: string; season: number; n: number; h: number; method: string; ours: number; ets: number; arima: number }[];
  seconds: number;
  /** CPU time of this process over the same loop (all its threads: compilers and GC included). */
  cpuSeconds: number;
  vsEts: number;
  vsArima: number;
  failures: string[];
  /** Held-out points inside the 80% / 95% intervals: ours, R ets(), R auto.arima(). */
  coverage: Record<"ours" | "ets" | "arima", { points: number; in80: number; in95: number }>;
}

function runOurs(splits: Split[], label: string, opts: BaselineOptions): RunSummary {
  const rows: RunSummary["rows"] = [];
  const failures: string[] = [];
  const forecasts: (number[] | null)[] = [];
  const bounds: (Bounds | null)[] = [];
  const methods: string[] = [];
  const t0 = performance.now();
  const c0 = process.cpuUsage();
  for (const s of splits) {
    try {
      const r = baseline(s.train, { ...opts, method: "auto", season: s.season, horizon: s.horizon, levels: [80, 95] });
      forecasts.push(r.forecast.map((f) => f.mean ?? NaN));
      const at = (side: "lower" | "upper", level: string) => r.forecast.map((f) => f[side][level] ?? NaN);
      bounds.push({ lo80: at("lower", "80"), hi80: at("upper", "80"), lo95: at("lower", "95"), hi95: at("upper", "95") });
      methods.push(r.method === "combination" ? `comb(${r.combination!.map((c) => c.method).join("+")})` : r.method);
    } catch (e) {
      forecasts.push(null);
      bounds.push(null);
      methods.push("FAILED");
      failures.push(`${s.name}: ${e instanceof Error ? e.message : String(e)}`);
    }
  }
  const seconds = (performance.now() - t0) / 1000;
  const cpu = process.cpuUsage(c0);
  const cpuSeconds = (cpu.user + cpu.system) / 1e6;
  splits.forEach((s, i) => {
    const f = forecasts[i];
    rows.push({
      name: s.name,
      season: s.season,
      n: s.train.length,
      h: s.horizon,
      method: methods[i],
      ours: f ? mase(s.train, s.test, f, s.season) : NaN,
      ets: mase(s.train, s.test, s.ets, s.season),
      arima: mase(s.train, s.test, s.arima, s.season),
    });
  });
  const ok = rows.filter((r) => Number.isFinite(r.ours));
  const coverage = { ours: { points: 0, in80: 0, in95: 0 }, ets: { points: 0, in80: 0, in95: 0 }, arima: { points: 0, in80: 0, in95: 0 } };
  splits.forEach((s, i) => {
    for (const [key, b] of [["ours", bounds[i]], ["ets", s.etsBounds], ["arima", s.arimaBounds]] as const) {
      const c = held(s.test, b);
      coverage[key].points += c.points;
      coverage[key].in80 += c.in80;
      coverage[key].in95 += c.in95;
    }
  });
  return {
    coverage,
    label,
    rows,
    seconds,
    cpuSeconds,
    vsEts: geomean(ok.map((r) => r.ours / r.ets)),
    vsArima: geomean(ok.map((r) => r.ours / r.arima)),
    failures,
  };
}

const fmt = (v: number, d = 3) => (Number.isFinite(v) ? v.toFixed(d) : "-");

function printTable(r: RunSummary) {
  const head = ["series", "m", "n", "h", "our method", "MASE ours", "MASE ets", "MASE arima", "ours/ets", "ours/arima"];
  const body = r.rows.map((x) => [x.name, String(x.season), String(x.n), String(x.h), x.method, fmt(x.ours), fmt(x.ets), fmt(x.arima), fmt(x.ours / x.ets), fmt(x.ours / x.arima)]);
  const w = head.map((h, j) => Math.max(h.length, ...body.map((b) => b[j].length)));
  const line = (c: string[]) => c.map((s, j) => (j === 0 || j === 4 ? s.padEnd(w[j]) : s.padStart(w[j]))).join("  ");
  console.log(line(head));
  console.log(w.map((n) => "-".repeat(n)).join("  "));
  for (const b of body) console.log(line(b));
}

function main() {
  const { values } = parseArgs({
    options: {
      origins: { type: "string" },
      step: { type: "string" },
      strategy: { type: "string" },
      combine: { type: "string" },
      refit: { type: "string" },
      compare: { type: "boolean" },
      cache: { type: "string" },
      exclude: { type: "string" },
      include: { type: "string" },
    },
  });
  const opts: BaselineOptions = {
    origins: values.origins ? Number(values.origins) : undefined,
    step: values.step ? Number(values.step) : undefined,
    strategy: (values.strategy as "combination" | "best" | "combine" | undefined) ?? undefined,
    combine: values.combine ? Number(values.combine) : undefined,
    refit: (values.refit as "full" | "update" | undefined) ?? undefined,
    methods:
      values.exclude || values.include
        ? METHODS.filter(
            (m) =>
              (values.include?.split(",").includes(m.id) || !(m.id in NOT_AUTOMATIC)) &&
              !(values.exclude ?? "").split(",").includes(m.id),
          )
        : undefined,
  };
  console.log(`exporting ${SERIES.length} series from R's datasets and timing ets()/auto.arima() in R …`);
  const { splits, etsSeconds, arimaSeconds } = exportFromR(values.cache);

  const main = runOurs(splits, "default", opts);
  // The same work again in the same process: the JavaScript engine has compiled the hot code by now.
  const warm = runOurs(splits, "warm", opts);
  console.log("");
  printTable(main);
  console.log("");
  console.log(`series: ${splits.length} (${splits.filter((s) => s.season === 12).length} monthly, ${splits.filter((s) => s.season === 4).length} quarterly, ${splits.filter((s) => s.season === 1).length} non-seasonal)`);
  console.log(`geometric mean of MASE ratios: ours/ets = ${fmt(main.vsEts)}, ours/auto.arima = ${fmt(main.vsArima)}`);
  const pct = (c: { points: number; in80: number; in95: number }) => (c.points ? `${fmt((100 * c.in80) / c.points, 1)}% / ${fmt((100 * c.in95) / c.points, 1)}%` : "-");
  console.log(`held-out points inside the 80% / 95% intervals (${main.coverage.ours.points} points): ours ${pct(main.coverage.ours)}, R ets() ${pct(main.coverage.ets)}, R auto.arima() ${pct(main.coverage.arima)}`);
  console.log(`time: ours ${fmt(main.seconds, 2)} s (automatic selection, all series, one process); R ets() ${fmt(etsSeconds, 2)} s; R auto.arima() ${fmt(arimaSeconds, 2)} s (inside R, start-up excluded)`);
  console.log(`second pass in the same process (compiled code warm): ours ${fmt(warm.seconds, 2)} s, ratio to ets ${fmt(warm.seconds / etsSeconds)}`);
  // CPU time is less disturbed than wall time by other processes on a loaded machine.
  console.log(`CPU time of our passes (process.cpuUsage, all threads): first ${fmt(main.cpuSeconds, 2)} s, second ${fmt(warm.cpuSeconds, 2)} s`);
  console.log(`load average when our pass ended: ${loadavg().map((v) => v.toFixed(2)).join(", ")} (other processes slow both sides)`);
  console.log(`time ratio ours/ets (first pass) = ${fmt(main.seconds / etsSeconds)} (goal ≤ 0.1); MASE goal ours/ets ≤ 1.00: ${main.vsEts <= 1 ? "met" : "not met"}`);
  if (main.failures.length > 0) console.log(`failures:\n  ${main.failures.join("\n  ")}`);

  // Where the time goes: the same run again with each method's fit and forecast timed (warm passes).
  const timed = TIMED.filter((m) => (opts.methods ? opts.methods.some((k) => k.id === m.id) : !(m.id in NOT_AUTOMATIC)));
  const t0 = performance.now();
  runOurs(splits, "timed", { ...opts, methods: timed, strategy: opts.strategy ?? "combination" });
  const wall = (performance.now() - t0) / 1000;
  const total = [...fitTime.values()].reduce((a, e) => a + e.ms + e.fcMs, 0);
  console.log(`\ntime by method (a third, instrumented pass: ${fmt(wall, 2)} s wall, ${fmt(total / 1000, 2)} s in fit + forecast):`);
  for (const [id, e] of [...fitTime.entries()].sort((a, b) => b[1].ms + b[1].fcMs - a[1].ms - a[1].fcMs)) {
    console.log(`  ${id.padEnd(28)} fit ${fmt(e.ms / 1000, 3)} s (${e.fits} fits)  forecast ${fmt(e.fcMs / 1000, 3)} s (${e.forecasts} calls)`);
  }

  if (values.compare) {
    console.log("\nselection settings compared (same splits):");
    const grid: [string, BaselineOptions][] = [
      ["best, 1 origin", { origins: 1 }],
      ["best, 3 origins, full refit", { origins: 3, refit: "full" }],
      ["best, 3 origins step 1", { origins: 3, step: 1 }],
      ["best, 5 origins step 1", { origins: 5, step: 1 }],
      ["best, 3 origins step 2", { origins: 3, step: 2 }],
      ["combine 2, 3 origins", { origins: 3, strategy: "combine", combine: 2 }],
      ["combine 3, 3 origins", { origins: 3, strategy: "combine", combine: 3 }],
      ["combine 3, 5 origins", { origins: 5, strategy: "combine", combine: 3 }],
    ];
    for (const [label, o] of grid) {
      const r = runOurs(splits, label, o);
      console.log(`  ${label.padEnd(26)} ours/ets ${fmt(r.vsEts)}  ours/arima ${fmt(r.vsArima)}  time ${fmt(r.seconds, 2)} s${r.failures.length ? `  failures ${r.failures.length}` : ""}`);
    }
  }
}

if (process.argv[2] === "coverage") {
  const { runCoverage } = await import("./m3-coverage");
  await runCoverage(process.argv.slice(3));
} else main();
