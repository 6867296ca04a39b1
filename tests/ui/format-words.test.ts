/**
 * Words and dates on pages (lib/ui/format.ts `countOf`, `formatDate`): a count agrees with its
 * noun, and a date alone is written in the same "2 Dec 2026" style as `formatDateTime`.
 * Expected strings are English grammar and the en-GB date style, written out by hand.
 */
import { describe, expect, it } from "vitest";
import { countOf, formatDate, formatDateTime } from "../../lib/ui/format";

describe("countOf", () => {
  it("puts the noun in the singular for one and the plural otherwise", () => {
    expect(countOf(1, "recorded action")).toBe("1 recorded action");
    expect(countOf(0, "recorded action")).toBe("0 recorded actions");
    expect(countOf(2, "closed round")).toBe("2 closed rounds");
    expect(countOf(1200, "answer")).toBe("1,200 answers");
    expect(countOf(3, "analysis", "analyses")).toBe("3 analyses");
  });
});

describe("formatDate", () => {
  it("writes a date as day, short month and year in UTC, like formatDateTime without the time", () => {
    expect(formatDate("2026-12-02T23:30:00Z")).toBe("2 Dec 2026");
    expect(formatDate(new Date(Date.UTC(2027, 0, 15)))).toBe("15 Jan 2027");
    expect(formatDateTime("2026-12-02T23:30:00Z")).toBe("2 Dec 2026, 23:30 UTC");
    expect(formatDate(null)).toBe("—");
  });
});
