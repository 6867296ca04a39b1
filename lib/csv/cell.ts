/**
 * One cell of an exported CSV file (pure). Every export writes its cells through `csvCell`.
 */

const PLAIN_NUMBER = /^-?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;

/**
 * One CSV cell, neutralised against formula injection (OWASP "CSV Injection"): a cell starting
 * with = + - @ tab or CR gets a leading apostrophe unless it is exactly a decimal number. It is
 * enclosed in double quotes (RFC 4180, quotes inside doubled) when it holds a comma, a semicolon,
 * a tab, a double quote, CR or LF: spreadsheets set to another list separator (`;` in much of
 * Europe, tab) would otherwise split the cell there, and a part such as `=2+3` would start a
 * new cell that runs as a formula.
 */
export function csvCell(value: string | number | boolean | null | undefined): string {
  let s = value === null || value === undefined ? "" : typeof value === "number" ? (Number.isFinite(value) ? String(value) : "") : String(value);
  if (/^[=+\-@\t\r]/.test(s) && !PLAIN_NUMBER.test(s)) s = `'${s}`;
  return /[",;\t\r\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}
