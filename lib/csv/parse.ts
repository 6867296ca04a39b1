/**
 * A small CSV reader (pure: strings in, plain objects out; no file system).
 *
 * `parseCsv` follows RFC 4180 (Shafranovich 2005, "Common Format and MIME Type for
 * Comma-Separated Values (CSV) Files"): fields separated by commas, records by CRLF or LF
 * (a lone CR is accepted too), fields optionally enclosed in double quotes, a double quote
 * inside a quoted field written as two double quotes, line breaks allowed inside quotes.
 * A UTF-8 byte-order mark at the start is dropped. Blank lines are skipped.
 *
 * `readSeriesCsv` turns a parsed table with a header row into a time series: the value
 * column, the explanatory (numeric) columns, and their future rows.
 */
import { numberProblem } from "../validation/numbers";

/** A CSV problem; `row` counts the header as row 1 (as a spreadsheet shows it). */
export class CsvError extends Error {
  readonly row?: number;
  readonly column?: string;
  constructor(message: string, row?: number, column?: string) {
    super(message);
    this.name = "CsvError";
    this.row = row;
    this.column = column;
  }
}

/**
 * Refuses text that was not UTF-8: a browser or `TextDecoder` reading a Latin-1 or Windows-1252
 * file as UTF-8 turns its accented bytes into U+FFFD (the replacement character), and a UTF-16
 * file read as UTF-8 is full of NUL characters. Neither can be repaired without knowing the
 * original encoding, so the message says how to save the file instead.
 * @throws CsvError naming the first row with such a character.
 */
function notUtf8Check(src: string): void {
  const at = src.search(/[\uFFFD\u0000]/);
  if (at < 0) return;
  const row = 1 + (src.slice(0, at).match(/\r\n|\r|\n/g)?.length ?? 0);
  throw new CsvError(`row ${row}: the file is not UTF-8 text (it has a character that could not be read); save it as "CSV UTF-8" and upload it again`, row);
}

/** One parsed record with the 1-based record number (header = 1, blank lines not counted). */
export interface CsvRecord {
  readonly row: number;
  readonly fields: readonly string[];
}

/**
 * Parses CSV text into records (RFC 4180, see the module comment).
 *
 * Rows are numbered 1, 2, … in the order they appear, skipping blank lines; a quoted field that
 * spans lines counts as one row.
 *
 * @throws CsvError for an unterminated quoted field or text after a closing quote
 *   (`row 3: text after closing quote`), or text that was not UTF-8 (U+FFFD or NUL characters).
 * Complexity O(length of text).
 * @example parseCsv('a,b\r\n1,"x, y"') → [{row:1, fields:["a","b"]}, {row:2, fields:["1","x, y"]}]
 */
export function parseCsv(text: string): CsvRecord[] {
  const src = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  notUtf8Check(src);
  const records: CsvRecord[] = [];
  let fields: string[] = [];
  let field = "";
  let i = 0;
  let row = 1;
  let quotedField = false;
  let recordHasContent = false;
  const n = src.length;

  const endField = () => {
    fields.push(field);
    field = "";
    quotedField = false;
  };
  const endRecord = () => {
    endField();
    const blank = !recordHasContent && fields.length === 1 && fields[0] === "";
    if (!blank) {
      records.push({ row, fields });
      row += 1;
    }
    fields = [];
    recordHasContent = false;
  };

  while (i < n) {
    const c = src[i];
    if (c === '"' && field === "" && !quotedField) {
      // Quoted field.
      quotedField = true;
      recordHasContent = true;
      i += 1;
      let closed = false;
      while (i < n) {
        const d = src[i];
        if (d === '"') {
          if (src[i + 1] === '"') {
            field += '"';
            i += 2;
          } else {
            i += 1;
            closed = true;
            break;
          }
        } else {
          field += d;
          i += 1;
        }
      }
      if (!closed) throw new CsvError(`row ${row}: a quoted field is not closed`, row);
      const next = src[i];
      if (i < n && next !== "," && next !== "\n" && next !== "\r") {
        throw new CsvError(`row ${row}: text after a closing quote`, row);
      }
      continue;
    }
    if (c === ",") {
      recordHasContent = true;
      endField();
      i += 1;
    } else if (c === "\r" || c === "\n") {
      endRecord();
      i += c === "\r" && src[i + 1] === "\n" ? 2 : 1;
    } else {
      if (quotedField) throw new CsvError(`row ${row}: text after a closing quote`, row);
      field += c;
      recordHasContent = true;
      i += 1;
    }
  }
  if (recordHasContent || field !== "" || fields.length > 0) endRecord();
  return records;
}

/** Options for {@link readSeriesCsv}. */
export interface ReadSeriesOptions {
  /** Name of the column holding the series (default "value"). */
  readonly value?: string;
}

/** A series read from CSV. Missing observations are `null`; see {@link readSeriesCsv}. */
export interface SeriesTable {
  /** The value column, in file order, `null` where the cell is empty or `NA`. */
  readonly y: readonly (number | null)[];
  /** CSV row number of each element of `y` (header = row 1). */
  readonly rows: readonly number[];
  /** Names of the explanatory columns. */
  readonly xNames: readonly string[];
  /** Explanatory columns, one array per name, aligned with `y` (`null` where empty). */
  readonly x: readonly (readonly (number | null)[])[];
  /** Future values of the explanatory columns (rows after the last value), one array per name. */
  readonly futureX: readonly (readonly number[])[];
  /** Columns that were not used (not numeric, e.g. dates or labels). */
  readonly ignored: readonly string[];
}

const NUMBER = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;

/** Cells read as missing: empty (after trimming spaces) or R's `NA`. */
function isMissing(cell: string): boolean {
  const t = cell.trim();
  return t === "" || t === "NA";
}

function parseNumber(cell: string): number | undefined {
  const t = cell.trim();
  if (!NUMBER.test(t)) return undefined;
  const v = Number(t);
  return Number.isFinite(v) ? v : undefined;
}

/**
 * Reads a series from CSV text with a header row.
 *
 * Rules:
 * - The value column is named by `options.value` (default "value"); it must exist.
 * - Every other column whose first non-missing cell is a number is an explanatory column;
 *   columns whose first non-missing cell is not a number (dates, labels) are ignored and
 *   listed in `ignored`. After that, every cell of the value and explanatory columns must be a
 *   number or missing (empty or `NA`).
 * - Numbers: optional sign, digits with an optional decimal point, optional exponent
 *   (`1e3`). Thousands separators and decimal commas are refused, and so are magnitudes outside
 *   the range of lib/validation/numbers.ts (e.g. `5e-324`, `1e308`).
 * - Future rows: trailing rows whose value is missing while every explanatory cell is filled
 *   give `futureX`. (With no explanatory columns there are no future rows; trailing missing
 *   values stay in `y` as `null` for the series policy to trim.)
 * - A record with more fields than the header is an error; a shorter one is padded with
 *   missing cells.
 *
 * Pure: no I/O. Empty input or a header without data rows gives an empty series (`y = []`);
 * whether that is usable is the series policy's decision.
 *
 * @throws CsvError naming row and column, e.g. `row 14, column 'units': 'abc' is not a number`.
 */
export function readSeriesCsv(text: string, options: ReadSeriesOptions = {}): SeriesTable {
  const valueName = options.value ?? "value";
  const records = parseCsv(text);
  if (records.length === 0) throw new CsvError("the file is empty (a header row is needed)");
  const header = records[0].fields.map((h) => h.trim());
  const seen = new Set<string>();
  for (const h of header) {
    if (h === "") throw new CsvError("row 1: a column has an empty name", 1);
    if (seen.has(h)) throw new CsvError(`row 1: column '${h}' appears twice`, 1, h);
    seen.add(h);
  }
  const vIdx = header.indexOf(valueName);
  if (vIdx < 0) {
    throw new CsvError(
      `no column named '${valueName}' (columns: ${header.map((h) => `'${h}'`).join(", ")}); choose one with --value`,
      1,
      valueName,
    );
  }
  const body = records.slice(1);
  for (const r of body) {
    if (r.fields.length > header.length) {
      throw new CsvError(
        `row ${r.row}: ${r.fields.length} fields but the header has ${header.length}`,
        r.row,
      );
    }
  }
  const cell = (r: CsvRecord, j: number) => (j < r.fields.length ? r.fields[j] : "");

  // Classify the other columns by their first non-missing cell.
  const xIdx: number[] = [];
  const ignored: string[] = [];
  header.forEach((name, j) => {
    if (j === vIdx) return;
    const first = body.find((r) => !isMissing(cell(r, j)));
    if (first === undefined) {
      ignored.push(name);
    } else if (parseNumber(cell(first, j)) !== undefined) {
      xIdx.push(j);
    } else {
      ignored.push(name);
    }
  });

  const read = (r: CsvRecord, j: number): number | null => {
    const c = cell(r, j);
    if (isMissing(c)) return null;
    const v = parseNumber(c);
    if (v === undefined) {
      throw new CsvError(`row ${r.row}, column '${header[j]}': '${c.trim()}' is not a number`, r.row, header[j]);
    }
    const problem = numberProblem(v);
    if (problem) throw new CsvError(`row ${r.row}, column '${header[j]}': '${c.trim()}' ${problem}`, r.row, header[j]);
    return v;
  };

  const y: (number | null)[] = [];
  const rows: number[] = [];
  const x: (number | null)[][] = xIdx.map(() => []);
  for (const r of body) {
    y.push(read(r, vIdx));
    rows.push(r.row);
    xIdx.forEach((j, k) => x[k].push(read(r, j)));
  }

  // Future rows: trailing rows with a missing value and every explanatory cell filled.
  let cut = y.length;
  if (xIdx.length > 0) {
    while (cut > 0 && y[cut - 1] === null && x.every((col) => col[cut - 1] !== null)) cut -= 1;
  }
  const futureX = x.map((col) => col.slice(cut) as number[]);
  return {
    y: y.slice(0, cut),
    rows: rows.slice(0, cut),
    xNames: xIdx.map((j) => header[j]),
    x: x.map((col) => col.slice(0, cut)),
    futureX,
    ignored,
  };
}
