/**
 * Test helper: runs R (Rscript, R 4.2.2 with package `forecast` on the CI image) and returns
 * the numbers it prints. Expected values in the tests come from R, outside this project.
 * The helper never skips: if Rscript is missing the test fails and says so.
 */
import { batchScript, runRscript, sections } from "../helpers/r";

export { rVector } from "../helpers/r";

/** R prelude: `out(x)` prints a numeric vector at full precision on one line. */
const PRELUDE = `
out <- function(x) cat(sprintf("%.17g", as.numeric(x)), "\\n")
suppressPackageStartupMessages({ library(stats) })
`;

function parseToken(tok: string): number {
  if (tok === "NA" || tok === "NaN") return NaN;
  if (tok === "Inf") return Infinity;
  if (tok === "-Inf") return -Infinity;
  const v = Number(tok);
  if (Number.isNaN(v)) throw new Error(`R printed a non-number: ${tok}`);
  return v;
}

/**
 * Runs `code` in Rscript and returns each printed line as an array of numbers
 * (each `out(x)` call gives one line).
 */
export function runR(code: string): number[][] {
  return lines(runRscript(PRELUDE + code));
}

/** Each printed line as an array of numbers. */
function lines(stdout: string): number[][] {
  return stdout
    .split("\n")
    .map((l) => l.trim())
    .filter((l) => l.length > 0)
    .map((l) => l.split(/\s+/).map(parseToken));
}

/**
 * Several {@link runR} snippets in one Rscript (one R start-up per test file instead of one per
 * check), each in its own environment; returns each key's printed lines.
 */
export function runRBatch<K extends string>(snippets: Record<K, string>): Record<K, number[][]> {
  const keys = Object.keys(snippets) as K[];
  const text = sections(keys, runRscript(PRELUDE + batchScript(snippets)));
  return Object.fromEntries(keys.map((k) => [k, lines(text[k])])) as Record<K, number[][]>;
}

/** Relative difference |a − b| / max(|b|, tiny); 0 when both are the same non-finite value. */
export function relErr(a: number, b: number): number {
  if (Object.is(a, b) || (Number.isNaN(a) && Number.isNaN(b))) return 0;
  if (a === b) return 0;
  return Math.abs(a - b) / Math.max(Math.abs(b), 1e-300);
}

/**
 * Asserts element-wise agreement: relative error ≤ rel, or absolute error ≤ absTol (for values
 * that are zero up to rounding). The message shows the index and both values.
 */
export function expectClose(
  actual: readonly number[],
  expected: readonly number[],
  rel: number,
  label = "",
  absTol = 0,
): void {
  if (typeof actual?.length !== "number" || typeof expected?.length !== "number") {
    throw new TypeError(`${label}: expectClose compares arrays (got ${typeof actual} and ${typeof expected})`);
  }
  if (actual.length !== expected.length) {
    throw new Error(`${label}: length ${actual.length} differs from expected ${expected.length}`);
  }
  for (let i = 0; i < actual.length; i++) {
    const e = relErr(actual[i], expected[i]);
    if (!(e <= rel) && !(Math.abs(actual[i] - expected[i]) <= absTol)) {
      throw new Error(`${label}[${i}]: got ${actual[i]}, expected ${expected[i]} (relative error ${e} > ${rel})`);
    }
  }
}
