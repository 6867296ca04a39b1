/**
 * The one place that formats numbers and dates for people (pages, e-mails, the audit log, the
 * CLI): one locale, British English (Unicode CLDR en-GB: "11,400", "2 Dec 2026"), and UTC for
 * times, whatever the server's or the browser's settings. Figures are shown rounded for reading;
 * the exact value travels alongside in a data-value attribute (see <Figure/>) so that nothing is
 * lost to rounding. Machine formats (JSON, CSV) keep ISO 8601 dates and full numbers. The one
 * exception is a number put back into a form field, written in the panelist's own marks
 * (lib/ui/typed-number-input.tsx) so that they can edit it.
 */

const LOCALE = "en-GB";
const DATE = new Intl.DateTimeFormat(LOCALE, { day: "numeric", month: "short", year: "numeric", timeZone: "UTC" });
const DATE_TIME = new Intl.DateTimeFormat(LOCALE, { day: "numeric", month: "short", year: "numeric", hour: "2-digit", minute: "2-digit", hourCycle: "h23", timeZone: "UTC" });

/**
 * The number formats, made once per number of decimals: `value.toLocaleString(LOCALE, options)`
 * is defined as formatting with `new Intl.NumberFormat(LOCALE, options)` (ECMA-402, Number.prototype.toLocaleString),
 * so the text is the same, but building the format on each call took a third of a large page's
 * rendering (issue 13: the report page's convergence tables show thousands of figures).
 */
const NUMBER_FORMATS = new Map<string, Intl.NumberFormat>();
function numberFormat(minimumFractionDigits: number, maximumFractionDigits: number): Intl.NumberFormat {
  const key = `${minimumFractionDigits}/${maximumFractionDigits}`;
  let f = NUMBER_FORMATS.get(key);
  if (!f) {
    f = new Intl.NumberFormat(LOCALE, { minimumFractionDigits, maximumFractionDigits });
    NUMBER_FORMATS.set(key, f);
  }
  return f;
}

/** A figure with up to `digits` significant digits, thousands separated; "—" when undefined. */
export function formatNumber(value: number | null | undefined, digits = 4): string {
  if (value === null || value === undefined || Number.isNaN(value)) return "—";
  if (!Number.isFinite(value)) return value > 0 ? "∞" : "−∞";
  if (value === 0) return "0";
  const abs = Math.abs(value);
  const decimals = abs >= 10 ** digits ? 0 : Math.max(0, digits - 1 - Math.floor(Math.log10(abs)));
  return numberFormat(0, Math.min(decimals, 10)).format(value);
}

/**
 * A figure rounded as `formatNumber` shows it, for exports: `digits` significant digits, but never
 * into the integer part (7676.980381156674 → 7677; 123456.7 → 123457; 0.123456 → 0.1235 with 4).
 * Integers are unchanged; NaN and ±∞ pass through (the CSV writer leaves them empty).
 */
export function roundAsShown(value: number, digits = 4): number {
  if (!Number.isFinite(value) || Number.isInteger(value)) return value;
  return Math.abs(value) >= 10 ** digits ? Math.sign(value) * Math.round(Math.abs(value)) : Number(value.toPrecision(digits));
}

/**
 * A number in full, as it is stored: the shortest decimal that reads back as the same double
 * (ECMAScript Number::toString), thousands grouped with commas, e.g. 12500.75 → "12,500.75",
 * 1.5e-12 → "1.5e-12"; for confirming a value before it is saved, never rounded.
 */
export function formatExact(value: number): string {
  const s = String(value);
  if (!Number.isFinite(value) || /e/i.test(s)) return s;
  const [int, frac] = s.split(".");
  const grouped = int.replace(/\B(?=(\d{3})+(?!\d))/g, ",");
  return frac === undefined ? grouped : `${grouped}.${frac}`;
}

/** A number with exactly `decimals` decimals, thousands separated, e.g. 1234.56 → "1,234.6" with 1; "—" when undefined. */
export function formatDecimals(value: number | null | undefined, decimals: number): string {
  if (value === null || value === undefined || Number.isNaN(value) || !Number.isFinite(value)) return "—";
  return numberFormat(decimals, decimals).format(value);
}

/** A ratio as a percentage, e.g. 0.153 → "15.3%". */
export function formatPercent(value: number | null | undefined, digits = 1): string {
  if (value === null || value === undefined || Number.isNaN(value) || !Number.isFinite(value)) return "—";
  return `${formatDecimals(value * 100, digits)}%`;
}

function asDate(value: string | Date): Date | null {
  const d = typeof value === "string" ? new Date(value) : value;
  return Number.isNaN(d.getTime()) ? null : d;
}

/** A date and time in UTC, e.g. "1 Dec 2026, 21:50 UTC"; "—" when missing or not a date. */
export function formatDateTime(value: string | Date | null | undefined): string {
  const d = value ? asDate(value) : null;
  return d ? `${DATE_TIME.format(d)} UTC` : "—";
}

/** A date alone, in the same style as `formatDateTime` (UTC), e.g. "2 Dec 2026"; "—" when missing or not a date. */
export function formatDate(value: string | Date | null | undefined): string {
  const d = value ? asDate(value) : null;
  return d ? DATE.format(d) : "—";
}

/**
 * A count with its noun in the right number, e.g. countOf(1, "recorded action") → "1 recorded
 * action", countOf(3, "round") → "3 rounds"; `plural` for nouns that do not take an -s.
 */
export function countOf(n: number, singular: string, plural = `${singular}s`): string {
  return `${n.toLocaleString(LOCALE)} ${n === 1 ? singular : plural}`;
}
