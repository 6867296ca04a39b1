/**
 * `triangulate baseline FILE... [options]`: forecasts CSV series with the baseline engine.
 *
 * Output is built in memory for every file first; only when every file succeeded is anything
 * written to standard output. On any error, each failing file's message goes to standard
 * error (naming the file, and the row and column where the CSV reader knows them), the exit
 * code is 1 (2 for bad usage), and standard output stays empty.
 *
 * JSON shape: one file → one object; several files → an array in the order given.
 *
 * A batch (several files) is fitted on the worker pool of lib/work/pool.ts, `--jobs` threads
 * (default: one per core), with a progress line on standard error when it is a terminal. The
 * files are read and parsed on this thread; only the engine's fit runs on the workers, and it
 * gives the same result there as here (structured clone keeps every number).
 */
import { readFileSync } from "node:fs";
import { availableParallelism } from "node:os";
import { parseArgs } from "node:util";
import { readSeriesCsv } from "../csv/parse";
import { baseline, DEFAULT_LEVELS, type BaselineOptions, type BaselineResult } from "../forecast/baseline";
import type { RawSeries } from "../forecast/series";
import { METHOD_IDS, type MethodId } from "../forecast/types";
import { historyRowsMessage } from "../validation/limits";
import { runJob, setPoolThreads } from "../work/pool";
import type { CommandIo } from "./main";

/** Wraps text at spaces to lines of at most `width` characters, each indented by `indent`. */
function wrap(text: string, width: number, indent: number): string {
  const lines: string[] = [];
  let line = "";
  for (const word of text.split(" ")) {
    if (line && line.length + 1 + word.length > width) {
      lines.push(line);
      line = word;
    } else line = line ? `${line} ${word}` : word;
  }
  if (line) lines.push(line);
  return lines.map((l) => " ".repeat(indent) + l).join("\n");
}

const USAGE = `usage: triangulate baseline FILE... [options]

Forecasts each CSV file (a header row, one column holding the series; "-" reads standard
input). Other numeric columns are explanatory variables for the regression method; trailing
rows with an empty value but filled explanatory columns give their future values.

options:
  --value COLUMN      column holding the series (default: value)
  --season N          season length, e.g. 12 for monthly data, 4 for quarterly (default: 1)
  --horizon H         steps to forecast (default: the future rows if any, else 2 x season,
                      or 10 without a season)
  --method M          auto (default: the average of ETS weighted by AICc and Theta,
                      intervals widened to its own errors on the history) or one of:
${wrap(METHOD_IDS.join(", "), 68, 22)}
  --levels L1,L2      prediction interval levels in percent (default: ${DEFAULT_LEVELS.join(",")})
  --total             also forecast the sum of periods A..H ("total": from, to, mean,
                      lower and upper by level), from the distribution of the sum
  --from A            first period of the total (with --total; default 1, the next
                      period; at most H): e.g. --from 4 --horizon 15 sums periods 4..15
  --format F          json (default) or table
  --jobs N            worker threads for several files (default: one per core, here ${availableParallelism()})
  -h, --help          show this text

Several files are a batch: each file is one series, fitted on worker threads (--jobs),
with a progress line on standard error when it is a terminal. Nothing is written to
standard output until every file has been fitted.

JSON output: one object for one file, an array in the same order for several. Each has
file, method, parameters, season, horizon, levels, forecast (step, mean, lower and upper by
level), fitted (one-step in-sample values for the observations used, null where none),
accuracy.insample (mae, rmse, mape, smape, mase), candidates (auto only), total (with
--total) and notes.
Missing values: leading and trailing ones are dropped, interior ones filled by linear
interpolation (listed in notes).
Exit codes: 0 success, 1 bad input data, 2 bad usage.
`;

class UsageError extends Error {}

function positiveInteger(name: string, text: string | undefined): number | undefined {
  if (text === undefined) return undefined;
  if (!/^\d+$/.test(text.trim()) || Number(text) < 1) {
    throw new UsageError(`--${name} must be a whole number of at least 1 (got '${text}')`);
  }
  return Number(text);
}

function parseLevels(text: string | undefined): number[] | undefined {
  if (text === undefined) return undefined;
  const parts = text.split(",").map((p) => p.trim());
  return parts.map((p) => {
    const v = Number(p);
    if (p === "" || !Number.isFinite(v) || v <= 0 || v >= 100) {
      throw new UsageError(`--levels: '${p}' is not a percentage strictly between 0 and 100`);
    }
    return v;
  });
}

interface Options {
  readonly files: string[];
  readonly value: string;
  readonly season?: number;
  readonly horizon?: number;
  readonly method: "auto" | MethodId;
  readonly levels?: number[];
  readonly format: "json" | "table";
  readonly total: boolean;
  /** First period of the total (default 1). */
  readonly from?: number;
  readonly jobs: number;
  readonly help: boolean;
}

function parseOptions(args: string[]): Options {
  let parsed;
  try {
    parsed = parseArgs({
      args,
      allowPositionals: true,
      strict: true,
      options: {
        value: { type: "string" },
        season: { type: "string" },
        horizon: { type: "string" },
        method: { type: "string" },
        levels: { type: "string" },
        format: { type: "string" },
        total: { type: "boolean" },
        from: { type: "string" },
        jobs: { type: "string" },
        help: { type: "boolean", short: "h" },
      },
    });
  } catch (e) {
    // parseArgs names the option in its message ("Unknown option '--sesaon'").
    const msg = e instanceof Error ? e.message : String(e);
    throw new UsageError(msg.replace(/\. To specify a positional argument.*$/s, ""));
  }
  const v = parsed.values;
  const method = v.method ?? "auto";
  if (method !== "auto" && !(METHOD_IDS as readonly string[]).includes(method)) {
    throw new UsageError(`--method: unknown method '${method}' (use auto or one of: ${METHOD_IDS.join(", ")})`);
  }
  const format = v.format ?? "json";
  if (format !== "json" && format !== "table") {
    throw new UsageError(`--format must be json or table (got '${format}')`);
  }
  if (v.value !== undefined && v.value.trim() === "") throw new UsageError("--value needs a column name");
  const from = positiveInteger("from", v.from);
  if (from !== undefined && !v.total) throw new UsageError("--from is the first period of a total: give --total with it");
  const horizon = positiveInteger("horizon", v.horizon);
  if (from !== undefined && horizon !== undefined && from > horizon) throw new UsageError(`--from ${from} is after the last period, --horizon ${horizon}`);
  const files = parsed.positionals;
  if (files.filter((f) => f === "-").length > 1) throw new UsageError("standard input ('-') can be read only once");
  return {
    files,
    value: v.value ?? "value",
    season: positiveInteger("season", v.season),
    horizon,
    method: method as "auto" | MethodId,
    levels: parseLevels(v.levels),
    format,
    total: v.total ?? false,
    from,
    jobs: positiveInteger("jobs", v.jobs) ?? availableParallelism(),
    help: v.help ?? false,
  };
}

/** Result of one file, as printed. */
export type FileResult = { readonly file: string } & BaselineResult;

type FitOptions = Omit<Options, "files" | "format" | "help" | "jobs">;

/** Reads one CSV text into a series. Throws the row limit's or the reader's error unchanged. */
function readText(text: string, opts: FitOptions): RawSeries {
  const refusal = historyRowsMessage(text);
  if (refusal) throw new Error(refusal);
  const table = readSeriesCsv(text, { value: opts.value });
  return { y: table.y, rows: table.rows, x: table.x, xNames: table.xNames, futureX: table.futureX };
}

/** The engine's options from the command's. */
function engineOptions(opts: FitOptions): Omit<BaselineOptions, "methods"> {
  return { season: opts.season, horizon: opts.horizon, method: opts.method, levels: opts.levels, total: opts.total, totalFrom: opts.from };
}

/** Forecasts one CSV text. Throws the row limit's, the reader's or the engine's error unchanged. */
export function forecastText(file: string, text: string, opts: FitOptions): FileResult {
  return { file, ...baseline(readText(text, opts), engineOptions(opts)) };
}

/**
 * A progress line on standard error ("fitted 12 of 300 series"), rewritten in place at most
 * ten times a second, and cleared by `done`. Silent unless standard error is a terminal.
 */
function progressLine(io: CommandIo, total: number): { step: () => void; done: () => void } {
  if (!io.errIsTTY || total < 2) return { step: () => {}, done: () => {} };
  let count = 0;
  let shown = 0;
  const show = () => io.err(`\rtriangulate baseline: fitted ${count} of ${total} series`);
  show();
  return {
    step: () => {
      count++;
      const now = Date.now();
      if (count === total || now - shown >= 100) {
        shown = now;
        show();
      }
    },
    done: () => io.err("\r\x1b[K"),
  };
}

// ---------------------------------------------------------------- table format

/** Six significant digits, plain notation for everyday magnitudes. */
export function formatNumber(v: number | null | undefined): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return "-";
  if (v === 0) return "0";
  const a = Math.abs(v);
  if (a >= 1e9 || a < 1e-4) return v.toExponential(4);
  const s = v.toPrecision(6);
  return s.includes(".") ? s.replace(/\.?0+$/, "") : s;
}

/** A text table; the first column and any column listed in `left` are left-aligned, the rest right-aligned. */
function grid(header: string[], rows: string[][], left: number[] = []): string {
  const widths = header.map((h, j) => Math.max(h.length, ...rows.map((r) => r[j].length)));
  const line = (cells: string[]) =>
    cells.map((c, j) => (j === 0 || left.includes(j) ? c.padEnd(widths[j]) : c.padStart(widths[j]))).join("  ").trimEnd();
  return [line(header), widths.map((w) => "-".repeat(w)).join("  "), ...rows.map(line)].join("\n");
}

/** The `--format table` text for one result. */
export function formatTable(r: FileResult): string {
  const out: string[] = [];
  out.push(`${r.file}`);
  out.push(`method ${r.method}, season ${r.season}, horizon ${r.horizon}`);
  const p = Object.entries(r.parameters);
  if (p.length > 0) out.push(`parameters: ${p.map(([k, v]) => `${k} = ${formatNumber(v)}`).join(", ")}`);
  out.push("");
  const header = ["step", "mean"];
  for (const l of r.levels) header.push(`lower ${l}%`, `upper ${l}%`);
  out.push(
    grid(
      header,
      r.forecast.map((s) => {
        const row = [String(s.step), formatNumber(s.mean)];
        for (const l of r.levels) row.push(formatNumber(s.lower[String(l)]), formatNumber(s.upper[String(l)]));
        return row;
      }),
    ),
  );
  if (r.total) {
    const t = r.total;
    out.push("");
    out.push(
      `total of steps ${t.from ?? 1}-${t.to ?? r.horizon}: ${formatNumber(t.mean)}${r.levels.map((l) => `, ${l}% ${formatNumber(t.lower[String(l)])} to ${formatNumber(t.upper[String(l)])}`).join("")} (${t.how})`,
    );
  }
  const a = r.accuracy.insample;
  out.push("");
  out.push(`in-sample accuracy: MAE ${formatNumber(a.mae)}, RMSE ${formatNumber(a.rmse)}, MAPE ${formatNumber(a.mape)}, sMAPE ${formatNumber(a.smape)}, MASE ${formatNumber(a.mase)}`);
  if (r.candidates && r.candidates.length > 0) {
    out.push("");
    out.push("candidates (rolling-origin MASE, lower is better):");
    out.push(grid(["method", "MASE", "note"], r.candidates.map((c) => [c.method, formatNumber(c.mase), c.error ?? ""]), [2]));
  }
  if (r.notes.length > 0) {
    out.push("");
    out.push("notes:");
    for (const n of r.notes) out.push(`  - ${n}`);
  }
  return out.join("\n") + "\n";
}

// ---------------------------------------------------------------- entry point

/** `triangulate baseline …`; resolves to the exit code. */
export async function run(args: string[], io: CommandIo): Promise<number> {
  let opts: Options;
  try {
    opts = parseOptions(args);
  } catch (e) {
    if (e instanceof UsageError) {
      io.err(`triangulate baseline: ${e.message}\n(triangulate baseline --help shows the options)\n`);
      return 2;
    }
    throw e;
  }
  if (opts.help) {
    io.out(USAGE);
    return 0;
  }
  if (opts.files.length === 0) {
    io.err(`triangulate baseline: no input file (give one or more CSV files, or - for standard input)\n\n${USAGE}`);
    return 2;
  }

  // Each file's outcome in the order given: its result, or the message naming it.
  const outcomes: ({ ok: true; result: FileResult } | { ok: false; message: string })[] = [];
  const series: (RawSeries | null)[] = opts.files.map((file, i) => {
    const name = file === "-" ? "(standard input)" : file;
    let text: string;
    try {
      text = file === "-" ? io.stdin() : readFileSync(file, "utf8");
    } catch (e) {
      const code = (e as NodeJS.ErrnoException).code;
      outcomes[i] = { ok: false, message: `${name}: cannot read the file${code ? ` (${code})` : ""}` };
      return null;
    }
    try {
      return readText(text, opts);
    } catch (e) {
      outcomes[i] = { ok: false, message: `${name}: ${e instanceof Error ? e.message : String(e)}` };
      return null;
    }
  });
  const options = engineOptions(opts);
  const pending = series.flatMap((s, i) => (s === null ? [] : [i]));
  const threads = Math.min(opts.jobs, pending.length);
  const progress = progressLine(io, pending.length);
  const settle = (i: number, fit: () => BaselineResult | Promise<BaselineResult>) =>
    Promise.resolve()
      .then(fit)
      .then(
        (result) => (outcomes[i] = { ok: true, result: { file: opts.files[i], ...result } }),
        (e: unknown) => (outcomes[i] = { ok: false, message: `${opts.files[i] === "-" ? "(standard input)" : opts.files[i]}: ${e instanceof Error ? e.message : String(e)}` }),
      )
      .then(progress.step);
  if (threads >= 2) {
    setPoolThreads(threads);
    await Promise.all(pending.map((i) => settle(i, () => runJob("baseline", { series: series[i]!, options }))));
  } else {
    for (const i of pending) await settle(i, () => baseline(series[i]!, options));
  }
  progress.done();
  const results = outcomes.flatMap((o) => (o.ok ? [o.result] : []));
  const errors = outcomes.flatMap((o) => (o.ok ? [] : [o.message]));
  if (errors.length > 0) {
    io.err(errors.map((m) => `triangulate baseline: ${m}\n`).join(""));
    return 1;
  }
  const text =
    opts.format === "table"
      ? results.map(formatTable).join("\n")
      : JSON.stringify(results.length === 1 ? results[0] : results, null, 2) + "\n";
  io.out(text);
  return 0;
}
