import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { CsvError, parseCsv, readSeriesCsv } from "../../lib/csv/parse";

const NIST12 = new URL("../reference-data/nist_handbook_6431_ses12.csv", import.meta.url).pathname;

describe("parseCsv (RFC 4180)", () => {
  it("reads quoted fields with commas, doubled quotes and line breaks", () => {
    const recs = parseCsv('a,b,c\r\n1,"x, y","say ""hi"""\r\n2,"two\nlines",z\r\n');
    expect(recs.map((r) => r.fields)).toEqual([
      ["a", "b", "c"],
      ["1", "x, y", 'say "hi"'],
      ["2", "two\nlines", "z"],
    ]);
    expect(recs.map((r) => r.row)).toEqual([1, 2, 3]);
  });

  it("drops a byte-order mark, accepts LF, CRLF and CR, and skips blank lines", () => {
    const recs = parseCsv("\uFEFFa,b\n1,2\r\n\r\n3,4\r5,6");
    expect(recs.map((r) => r.fields)).toEqual([["a", "b"], ["1", "2"], ["3", "4"], ["5", "6"]]);
  });

  it("keeps empty fields, including a trailing one", () => {
    expect(parseCsv("a,b,c\n1,,\n").map((r) => r.fields)).toEqual([["a", "b", "c"], ["1", "", ""]]);
  });

  it("refuses an unclosed quote and text after a closing quote, naming the row", () => {
    expect(() => parseCsv('a\n"open')).toThrow(/row 2: a quoted field is not closed/);
    expect(() => parseCsv('a\n"x"y')).toThrow(/row 2: text after a closing quote/);
  });
});

describe("readSeriesCsv", () => {
  it("reads the NIST 12-point series with its t column as an explanatory column", () => {
    // Values from the NIST/SEMATECH e-Handbook §6.4.3.1 (file in tests/reference-data).
    const t = readSeriesCsv(readFileSync(NIST12, "utf8"), { value: "y" });
    expect(t.y).toEqual([71, 70, 69, 68, 64, 65, 72, 78, 75, 75, 75, 70]);
    expect(t.xNames).toEqual(["t"]);
    expect(t.x[0]).toEqual([1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12]);
    expect(t.rows[0]).toBe(2);
    expect(t.futureX).toEqual([[]]);
  });

  it("names row and column of a cell that is not a number", () => {
    const text = "month,value,units\n2024-01,10,1\n2024-02,11,abc\n";
    expect(() => readSeriesCsv(text)).toThrow("row 3, column 'units': 'abc' is not a number");
    try {
      readSeriesCsv(text);
    } catch (e) {
      expect(e).toBeInstanceOf(CsvError);
      expect((e as CsvError).row).toBe(3);
      expect((e as CsvError).column).toBe("units");
    }
  });

  it("refuses thousands separators and decimal commas in the value column", () => {
    expect(() => readSeriesCsv('value\n1\n"1,234"\n')).toThrow("row 3, column 'value': '1,234' is not a number");
    expect(() => readSeriesCsv("value;x\n")).toThrow(/no column named 'value'/);
  });

  it("reads empty cells and NA as missing, ignores label columns", () => {
    const t = readSeriesCsv("month,value\nJan,1\nFeb,\nMar,NA\nApr,4\n");
    expect(t.y).toEqual([1, null, null, 4]);
    expect(t.ignored).toEqual(["month"]);
    expect(t.xNames).toEqual([]);
  });

  it("takes trailing rows with an empty value and filled explanatory columns as future rows", () => {
    const t = readSeriesCsv("value,price,promo\n10,2,0\n12,2.5,1\n,3,0\n,3.5,1\n");
    expect(t.y).toEqual([10, 12]);
    expect(t.xNames).toEqual(["price", "promo"]);
    expect(t.futureX).toEqual([[3, 3.5], [0, 1]]);
  });

  it("keeps a trailing empty value with an empty explanatory cell as a missing observation", () => {
    const t = readSeriesCsv("value,price\n10,2\n12,2.5\n,\n");
    expect(t.y).toEqual([10, 12, null]);
    expect(t.futureX).toEqual([[]]);
  });

  it("uses another value column when asked and reports a missing one", () => {
    expect(readSeriesCsv("a,b\n1,2\n3,4\n", { value: "b" }).y).toEqual([2, 4]);
    expect(() => readSeriesCsv("a,b\n1,2\n", { value: "units" })).toThrow("no column named 'units' (columns: 'a', 'b')");
  });

  it("refuses a record longer than the header and an empty file", () => {
    expect(() => readSeriesCsv("value\n1\n2,3\n")).toThrow("row 3: 2 fields but the header has 1");
    expect(() => readSeriesCsv("")).toThrow(/empty/);
  });
});
