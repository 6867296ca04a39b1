/**
 * Run R code from a test and read back named numeric vectors.
 *
 * The code calls `out(name, x)` for each result; this prints `name=v1,v2,…` with 17
 * significant digits (no jsonlite needed). `NA` and `NaN` come back as NaN. The package
 * `forecast` is attached first. R must be installed (Debian `r-base-core r-cran-forecast`);
 * without it the tests that use this helper fail with R's error rather than being skipped.
 */
import { execFileSync } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { normalDensity, normalQuantile } from "../../lib/stats/normal";

/**
 * Runs an R script with `Rscript --vanilla` and returns what it printed. The script goes through
 * a file (`Rscript -e` truncates long expressions). Never skips: a missing Rscript fails the test
 * with a message saying what to install.
 */
export function runRscript(script: string): string {
  const dir = mkdtempSync(join(tmpdir(), "triangulate-r-"));
  const file = join(dir, "check.R");
  writeFileSync(file, script);
  try {
    return execFileSync("Rscript", ["--vanilla", file], {
      encoding: "utf8",
      stdio: ["ignore", "pipe", "pipe"],
      maxBuffer: 64 * 1024 * 1024,
    });
  } catch (err) {
    const e = err as { code?: string; stderr?: string; message: string };
    if (e.code === "ENOENT") {
      throw new Error("Rscript not found: install Debian r-base-core and r-cran-forecast (see .ci/run)");
    }
    throw new Error(`Rscript failed: ${e.stderr ?? e.message}`);
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

const PRELUDE = `suppressMessages(library(forecast))
out <- function(name, x) cat(name, "=", paste(format(as.numeric(x), digits = 17), collapse = ","), "\\n", sep = "")
`;

const PRELUDE_BASE = PRELUDE.replace("suppressMessages(library(forecast))\n", "");

/**
 * Evaluate R code; returns every vector printed with `out(name, x)`.
 * `withForecast: false` skips attaching the forecast package (faster start).
 */
export function rEval(code: string, options: { withForecast?: boolean } = {}): Record<string, number[]> {
  const prelude = options.withForecast === false ? PRELUDE_BASE : PRELUDE;
  return parseOut(runRscript(prelude + code));
}

/** Splits Rscript output into the sections that {@link batchScript} marked with `@@key` lines. */
export function sections<K extends string>(keys: readonly K[], text: string): Record<K, string> {
  const result = Object.fromEntries(keys.map((k) => [k, ""])) as Record<K, string>;
  let current: K | undefined;
  for (const line of text.split("\n")) {
    if (line.startsWith("@@")) current = line.slice(2) as K;
    else if (current !== undefined) result[current] += line + "\n";
  }
  return result;
}

/** One script running each snippet in its own environment (`local`, its value not printed), each output after a `@@key` line. */
export function batchScript(snippets: Record<string, string>): string {
  return Object.entries(snippets)
    .map(([key, code]) => `cat("@@${key}\\n")\ninvisible(local({\n${code}\n}))\n`)
    .join("");
}

/**
 * Several {@link rEval} snippets in one Rscript: one R start-up (and one `library(forecast)`)
 * per test file instead of one per check. Each snippet runs in its own environment, so names
 * do not leak from one to the next; the result maps each key to that snippet's `out` vectors.
 */
export function rEvalBatch<K extends string>(snippets: Record<K, string>, options: { withForecast?: boolean } = {}): Record<K, Record<string, number[]>> {
  const keys = Object.keys(snippets) as K[];
  const prelude = options.withForecast === false ? PRELUDE_BASE : PRELUDE;
  const text = sections(keys, runRscript(prelude + batchScript(snippets)));
  return Object.fromEntries(keys.map((k) => [k, parseOut(text[k])])) as Record<K, Record<string, number[]>>;
}

/** Lines `name=v1,v2,…` (from `out(name, x)`) as named vectors; `NA` as NaN. */
function parseOut(text: string): Record<string, number[]> {
  const result: Record<string, number[]> = {};
  for (const line of text.split("\n")) {
    const eq = line.indexOf("=");
    if (eq <= 0) continue;
    const name = line.slice(0, eq).trim();
    const body = line.slice(eq + 1).trim();
    result[name] = body === "" ? [] : body.split(",").map((v) => (v.trim() === "NA" ? NaN : Number(v)));
  }
  return result;
}


/** Formats numbers as an R vector literal (shortest round-trip decimals; NaN and ±Inf as R's). */
export function rVector(values: readonly number[]): string {
  return `c(${values.map((v) => (Number.isNaN(v) ? "NaN" : v === Infinity ? "Inf" : v === -Infinity ? "-Inf" : String(v))).join(", ")})`;
}

const seriesCache = new Map<string, { y: number[]; m: number }>();

/** Load several built-in R series (datasets package) in one R call and cache them. */
export function preloadSeries(names: readonly string[]): void {
  const missing = names.filter((nm) => !seriesCache.has(nm));
  if (missing.length === 0) return;
  const code = missing.map((nm) => `out("${nm}.y", ${nm}); out("${nm}.m", frequency(${nm}))`).join("\n");
  const r = rEval(code, { withForecast: false });
  for (const nm of missing) seriesCache.set(nm, { y: r[`${nm}.y`], m: r[`${nm}.m`][0] });
}

/** A built-in R series (datasets package): values and frequency (cached). */
export function rSeries(name: string): { y: number[]; m: number } {
  preloadSeries([name]);
  return seriesCache.get(name)!;
}

/** Relative difference |a − b| / max(|b|, floor). */
export function relDiff(a: number, b: number, floor = 1e-12): number {
  return Math.abs(a - b) / Math.max(Math.abs(b), floor);
}

/** Largest relative difference between two equal-length arrays. */
export function maxRelDiff(a: readonly number[], b: readonly number[], floor = 1e-12): number {
  if (a.length !== b.length) throw new Error(`length ${a.length} differs from ${b.length}`);
  let worst = 0;
  for (let i = 0; i < a.length; i++) worst = Math.max(worst, relDiff(a[i], b[i], floor));
  return worst;
}

/**
 * Tolerance for the difference of two sample quantiles at probability p from n1 and n2
 * independent simulated paths: 4 standard errors, the s.e. of a sample quantile being
 * √(p(1 − p)/n)/f(q) (asymptotic normality of sample quantiles; Serfling 1980 §2.3.3), the
 * density f(q) taken as that of a normal with standard deviation sd at its p-quantile.
 */
export function mcQuantileTolerance(p: number, sd: number, n1: number, n2: number): number {
  const density = normalDensity(normalQuantile(p)) / sd;
  return (4 * Math.sqrt(p * (1 - p) * (1 / n1 + 1 / n2))) / density;
}
