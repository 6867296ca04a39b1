/**
 * The one number and date formatter of every page (lib/ui/format.ts), and rounding for exports
 * (`roundAsShown`): the digits the pages show.
 * Expected values: R's signif(x, 4) where the number has fewer than 5 integer digits (computed
 * in the test); beyond that, the nearest integer, ties away from zero as Intl.NumberFormat's
 * default rounding mode "halfExpand" (ECMA-402) shows it, written out by hand. Expected strings
 * are written out by hand from the Unicode CLDR en-GB data: decimal ".", grouping "," every three
 * digits, minus "-"; date pattern "d MMM y" with abbreviated months "Jan" … "Dec" and "Sept"
 * for September (CLDR's en-GB abbreviation since CLDR 38), time "HH:mm".
 */
import { readdirSync, readFileSync, statSync } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { countOf, formatDate, formatDateTime, formatDecimals, formatExact, formatNumber, formatPercent, roundAsShown } from "../../lib/ui/format";
import { runR, rVector } from "../stats/rscript";

const SMALL = [7676.980381156674, 0.123456, -62.64549, 1.5e-7, 9999.94];

describe("roundAsShown", () => {
  it("gives R's signif(x, 4) below 10,000", () => {
    const [r] = runR(`out(signif(${rVector(SMALL)}, 4))`);
    expect(SMALL.map((x) => roundAsShown(x))).toEqual(r);
    expect(roundAsShown(7676.980381156674)).toBe(7677);
  });
  it("rounds to whole numbers from 10,000 up, never into the integer part", () => {
    expect(roundAsShown(123456.7)).toBe(123457);
    expect(roundAsShown(-12345.5)).toBe(-12346);
    expect(roundAsShown(12345.5)).toBe(12346);
  });
  it("agrees with what the page shows, and leaves integers, NaN and infinities alone", () => {
    for (const x of [...SMALL.slice(0, 3), 123456.7, 0.5, 3.14159]) expect(formatNumber(roundAsShown(x))).toBe(formatNumber(x));
    expect(roundAsShown(0.0123456, 3)).toBe(0.0123);
    expect(roundAsShown(42)).toBe(42);
    expect(roundAsShown(12_345_678)).toBe(12_345_678);
    expect(roundAsShown(Number.NaN)).toBeNaN();
    expect(roundAsShown(Infinity)).toBe(Infinity);
  });
});

describe("formatNumber: figures on every page", () => {
  it("groups thousands with commas and keeps 4 significant digits, never rounding into the integer part", () => {
    expect(formatNumber(11400)).toBe("11,400");
    expect(formatNumber(7676.980381156674)).toBe("7,677");
    expect(formatNumber(123456.7)).toBe("123,457");
    expect(formatNumber(12.3456)).toBe("12.35");
    expect(formatNumber(0.000123456)).toBe("0.0001235");
    expect(formatNumber(-1234.5)).toBe("-1,235");
    expect(formatNumber(2600.5, 8)).toBe("2,600.5");
    expect(formatNumber(0)).toBe("0");
  });
  it("writes missing and infinite values as signs, not as NaN", () => {
    expect(formatNumber(null)).toBe("—");
    expect(formatNumber(undefined)).toBe("—");
    expect(formatNumber(Number.NaN)).toBe("—");
    expect(formatNumber(Infinity)).toBe("∞");
  });
  it("writes fixed decimals, percentages, exact values and counts in the same marks", () => {
    expect(formatDecimals(1234.56, 1)).toBe("1,234.6");
    expect(formatDecimals(45, 1)).toBe("45.0");
    expect(formatPercent(0.153)).toBe("15.3%");
    expect(formatPercent(12.345)).toBe("1,234.5%");
    expect(formatPercent(null)).toBe("—");
    expect(formatExact(11400)).toBe("11,400");
    expect(formatExact(7676.980381156674)).toBe("7,676.980381156674");
    expect(countOf(11400, "answer")).toBe("11,400 answers");
  });
});

describe("formatDate and formatDateTime: dates on every page", () => {
  it("write day, short month and year in UTC, whatever the offset the value was given with", () => {
    expect(formatDate("2026-12-02")).toBe("2 Dec 2026");
    expect(formatDate("2026-12-02T23:30:00-05:00")).toBe("3 Dec 2026");
    expect(formatDateTime("2026-12-02T23:30:00-05:00")).toBe("3 Dec 2026, 04:30 UTC");
    expect(formatDateTime("2026-09-02T08:05:00Z")).toBe("2 Sept 2026, 08:05 UTC");
    expect(formatDateTime(new Date(Date.UTC(2027, 0, 1, 0, 0)))).toBe("1 Jan 2027, 00:00 UTC");
  });
  it("write a missing or unreadable date as a dash, never 'Invalid Date'", () => {
    expect(formatDate("")).toBe("—");
    expect(formatDate("not a date")).toBe("—");
    expect(formatDateTime(undefined)).toBe("—");
    expect(formatDateTime(new Date(Number.NaN))).toBe("—");
  });
});

/** Every source file under `dir` (relative to the repository), recursively. */
function sources(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const p = path.join(dir, name);
    return statSync(p).isDirectory() ? sources(p) : /\.tsx?$/.test(name) ? [p] : [];
  });
}

describe("one formatter", () => {
  it("no page, e-mail or page helper formats a number or a date itself", () => {
    // lib/ui/typed-number-input.tsx writes a number back into a field in the panelist's own
    // marks, so that they can edit it: the one exception (see lib/ui/format.ts).
    const allowed = new Set(["lib/ui/format.ts", "lib/ui/typed-number-input.tsx"]);
    const offenders = ["app", "lib/ui", "lib/mail", "lib/panels"]
      .flatMap(sources)
      .filter((f) => !allowed.has(f))
      .flatMap((f) =>
        readFileSync(f, "utf8")
          .split("\n")
          .map((line, i) => [f, i + 1, line] as const)
          .filter(([, , line]) => /toLocale(Date|Time)?String\(|Intl\.(NumberFormat|DateTimeFormat)|\.toFixed\(|At\.slice\(0, 1[06]\)/.test(line))
          .map(([file, n, line]) => `${file}:${n}: ${line.trim()}`),
      );
    expect(offenders).toEqual([]);
  });
});
