/**
 * The shared size limits (lib/validation/limits.ts, issue 11 item 7): rows counted without
 * parsing, the baseline schema refusing a longer history by either field, and the refusal of a
 * full panel or roster. Expected counts are hand counts of the literal texts below.
 */
import { describe, expect, it } from "vitest";
import { InvalidInputError } from "../../lib/errors";
import { MAX_HISTORY_ROWS, csvDataRows, requireWithinLimit } from "../../lib/validation/limits";
import { baselineInput } from "../../lib/validation/triangulation-inputs";

const csvOf = (rows: number) => ["month,value", ...Array.from({ length: rows }, (_, i) => `${i + 1},${100 + (i % 7)}`)].join("\n");

describe("csvDataRows", () => {
  it("counts non-blank lines after the header, with LF, CR LF or CR line ends", () => {
    expect(csvDataRows("value\n1\n2\n\n3\n")).toBe(3); // hand count: lines 1, 2, 3; the blank line and the final newline are not rows
    expect(csvDataRows("value\r\n1\r\n2\r\n")).toBe(2); // hand count
    expect(csvDataRows("value\r1\r2\r3")).toBe(3); // hand count: lone CR ends a line as the CSV reader reads it
    expect(csvDataRows("value\n \t\n4")).toBe(1); // hand count: a line of blanks is not a row
    expect(csvDataRows("")).toBe(0);
    expect(csvDataRows("value")).toBe(0);
  });

  it("stops counting just past the limit it is given", () => {
    expect(csvDataRows(csvOf(50), 10)).toBe(11);
    expect(csvDataRows(csvOf(50))).toBe(50);
  });
});

describe("baseline history limit", () => {
  it(`accepts ${MAX_HISTORY_ROWS} rows of CSV and refuses one more, naming the field and the limit`, () => {
    expect(baselineInput.safeParse({ csv: csvOf(MAX_HISTORY_ROWS) }).success).toBe(true);
    const r = baselineInput.safeParse({ csv: csvOf(MAX_HISTORY_ROWS + 1) });
    expect(r.success).toBe(false);
    expect(r.error!.issues[0].path).toEqual(["csv"]);
    expect(r.error!.issues[0].message).toContain("at most 5000 data rows");
  });

  it(`accepts ${MAX_HISTORY_ROWS} pasted values and refuses one more`, () => {
    expect(baselineInput.safeParse({ values: Array.from({ length: MAX_HISTORY_ROWS }, (_, i) => i) }).success).toBe(true);
    const r = baselineInput.safeParse({ values: Array.from({ length: MAX_HISTORY_ROWS + 1 }, (_, i) => i) });
    expect(r.success).toBe(false);
    expect(r.error!.issues[0].path).toEqual(["values"]);
    expect(r.error!.issues[0].message).toContain("at most 5000 values");
  });
});

describe("requireWithinLimit", () => {
  it("lets a container fill up to its limit and refuses past it with 422 naming the field", () => {
    expect(() => requireWithinLimit({ current: 99, adding: 1, max: 100 }, "questions", "questions", "A panel")).not.toThrow();
    let err: unknown;
    try {
      requireWithinLimit({ current: 1999, adding: 2, max: 2000 }, "rosterMemberIds", "panelists", "A panel");
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(InvalidInputError);
    expect((err as InvalidInputError).status).toBe(422);
    expect((err as InvalidInputError).errors[0]).toEqual({ field: "rosterMemberIds", message: "A panel holds at most 2000 panelists; it has 1999 and this would add 2" });
  });
});
