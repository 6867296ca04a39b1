/**
 * SQL text shared by both databases: statements are written with `?` placeholders (SQLite's);
 * PostgreSQL numbers them. Quoted identifiers ("Answer") read the same on both.
 */

/**
 * A timestamp as a statement parameter, in the form each database holds Prisma DateTime fields:
 * SQLite, ISO 8601 text with `+00:00` (as the better-sqlite3 adapter writes it, so comparisons in
 * SQL are between strings of one format); PostgreSQL, UTC text for a `timestamp(3)` column (a
 * Date parameter would be sent in the process's local time zone).
 */
export function timestampParam(dialect: "sqlite" | "postgresql", d: Date): string {
  return dialect === "postgresql" ? d.toISOString().replace("T", " ").replace("Z", "") : d.toISOString().replace("Z", "+00:00");
}

/**
 * A PostgreSQL `timestamp` value (OID 1114, text such as "2026-12-02 03:04:05.678") as a Date,
 * read as UTC: Prisma writes DateTime fields to `timestamp(3)` columns in UTC.
 */
export function parsePostgresTimestamp(text: string): Date {
  return new Date(`${text.replace(" ", "T")}Z`);
}

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
