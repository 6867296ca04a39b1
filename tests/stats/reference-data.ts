/**
 * Test helper: reads the check-value data files kept in tests/reference-data/ (copies of the
 * files described in tests/reference-data/README.md, with their public sources).
 */
import { readFileSync } from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";

const DIR = path.join(path.dirname(fileURLToPath(import.meta.url)), "..", "reference-data");

/** Raw text of a reference file. */
export function referenceText(name: string): string {
  return readFileSync(path.join(DIR, name), "utf8");
}

/** Numeric columns of a reference CSV with a header row, by column name. Frozen arrays. */
export function referenceCsv(name: string): Readonly<Record<string, readonly number[]>> {
  const [header, ...rows] = referenceText(name).trim().split(/\r?\n/);
  const cols = header.split(",").map((c) => c.trim());
  const out: Record<string, number[]> = Object.fromEntries(cols.map((c) => [c, []]));
  for (const row of rows) {
    const cells = row.split(",");
    cols.forEach((c, j) => out[c].push(Number(cells[j])));
  }
  for (const c of cols) Object.freeze(out[c]);
  return Object.freeze(out);
}
