/**
 * SQL text shared by both databases: statements are written with `?` placeholders (SQLite's);
 * PostgreSQL numbers them. Quoted identifiers ("Answer") read the same on both.
 */

/** `?` → `$1, $2, …`, outside single-quoted literals. */
export function numberedPlaceholders(text: string): string {
  let n = 0;
  let quoted = false;
  let out = "";
  for (const ch of text) {
    if (ch === "'") quoted = !quoted;
    out += ch === "?" && !quoted ? `$${++n}` : ch;
  }
  return out;
}
