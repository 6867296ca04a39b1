/**
 * CSV uploads that are not what they claim: files in another encoding than UTF-8, and cells that
 * a spreadsheet would run as formulas; and the export side, where every cell goes through
 * csvCell (lib/csv/cell.ts). Expected values are hand-derived from the rules in the doc
 * comments (OWASP "CSV injection": =, +, -, @, tab and CR start a formula; RFC 4180 §2 for
 * quoting; a spreadsheet whose list separator is `;` or tab splits an unquoted cell there).
 */
import { describe, expect, it } from "vitest";
import { CsvError, parseCsv, readSeriesCsv } from "../../lib/csv/parse";
import { csvCell } from "../../lib/csv/cell";
import { analyseBaseline } from "../../lib/triangulation/baselines";
import { InvalidInputError } from "../../lib/errors";
import { baselineInput } from "../../lib/validation/triangulation-inputs";

/** Bytes as a browser's File.text() or TextDecoder (UTF-8, not fatal) turns them into a string. */
const asUtf8 = (bytes: Uint8Array) => new TextDecoder("utf-8").decode(bytes);

describe("uploads in the wrong encoding are refused with the row and what to do", () => {
  it("Windows-1252 / Latin-1 text (é as the single byte 0xE9)", () => {
    const latin1 = Uint8Array.from(Buffer.from("month,value,region\n1,10,Zurich\n2,12,Gen\xe8ve\n", "latin1"));
    const text = asUtf8(latin1);
    expect(() => parseCsv(text)).toThrow(CsvError);
    try {
      parseCsv(text);
    } catch (err) {
      expect((err as CsvError).row).toBe(3);
      expect((err as CsvError).message).toMatch(/not UTF-8.*CSV UTF-8/);
    }
  });

  it("UTF-16 text (every ASCII character followed by a NUL byte)", () => {
    const text = asUtf8(Uint8Array.from(Buffer.from("month,value\n1,10\n", "utf16le")));
    expect(() => readSeriesCsv(text)).toThrow(/not UTF-8/);
  });

  it("UTF-8 with a byte-order mark and accents is read", () => {
    const text = asUtf8(Uint8Array.from(Buffer.from("\ufeffmonth,value,région\n1,10,3\n2,12,4\n", "utf8")));
    expect(readSeriesCsv(text).y).toEqual([10, 12]);
  });
});

describe("formula cells in uploads are never numbers", () => {
  it("a formula in the value column is refused, naming row and column", () => {
    expect(() => readSeriesCsv("month,value\n1,=1+1\n2,5\n")).toThrow(/row 2, column 'value': '=1\+1' is not a number/);
    expect(() => readSeriesCsv("month,value\n1,@SUM(A1)\n2,5\n")).toThrow(/is not a number/);
  });

  it("formula text in a label column is ignored, not kept", () => {
    const t = readSeriesCsv('label,value\n=HYPERLINK("http://quillmoor.example"),4\n@cmd,5\n-2+3,6\n');
    expect(t.y).toEqual([4, 5, 6]);
    expect(t.ignored).toEqual(["label"]);
  });
});

describe("csvCell: exports never emit a cell a spreadsheet would run", () => {
  it.each([
    ["=SUM(A1:A9)", "'=SUM(A1:A9)"],
    ["+41 44 000", "'+41 44 000"],
    ["-2+3", "'-2+3"],
    ["@cmd", "'@cmd"],
    ["\tindented", "\"'\tindented\""],
    ["\r=x", "\"'\r=x\""],
    ['=HYPERLINK("x","y")', `"'=HYPERLINK(""x"",""y"")"`],
    ["Quillmoor, QF-2", '"Quillmoor, QF-2"'],
  ])("%j → %j", (input, expected) => {
    expect(csvCell(input)).toBe(expected);
  });

  it("numbers stay numbers, also negative ones and their text", () => {
    expect(csvCell(-12.5)).toBe("-12.5");
    expect(csvCell("-12.5")).toBe("-12.5");
    expect(csvCell("-1e-3")).toBe("-1e-3");
    expect(csvCell(Number.NaN)).toBe("");
    expect(csvCell(null)).toBe("");
  });
});

describe("csvCell: cells are quoted where any common list separator would split them", () => {
  it.each([
    ["Quillmoor;=2+3", '"Quillmoor;=2+3"'],
    ["a\t=2+3", '"a\t=2+3"'],
    ["line\n=2+3", '"line\n=2+3"'],
    ['say "hi"', '"say ""hi"""'],
    ["=2+3;x", `"'=2+3;x"`],
    ["plain text", "plain text"],
  ])("%j → %j", (input, expected) => {
    expect(csvCell(input)).toBe(expected);
  });
});

describe("CSV columns named like Object's own properties are columns like any other", () => {
  const parse = (body: unknown) => baselineInput.parse(body);
  it.each(["constructor", "__proto__", "toString", "hasOwnProperty"])("a column named %s", async (name) => {
    const csv = `month,${name},value\n1,3,10\n2,4,12\n3,5,13\n4,6,15\n5,7,16\n`;
    // Another column's target-period values given, this one's missing: a field error, not a crash.
    let error: unknown;
    try {
      await analyseBaseline(parse({ csv, futureValues: { month: [6] } }));
    } catch (err) {
      error = err;
    }
    expect(error).toBeInstanceOf(InvalidInputError);
    expect((error as InvalidInputError).errors.map((e) => e.field)).toContain(`futureValues.${name}`);
  });
});
