/**
 * Values and text every way in refuses (lib/validation/numbers.ts through the zod schemas, and
 * lib/validation/nul.ts): numbers whose ratios or sums would overflow, text PostgreSQL cannot
 * store, and bodies nested deeper than any request of the app.
 * Reference values: IEEE 754-2019 binary64 — the smallest subnormal is 2^-1074 ≈ 4.94e-324 (JS
 * `Number.MIN_VALUE`), the largest finite 1.7976931348623157e308 (`Number.MAX_VALUE`); so
 * 100 / 5e-324 and 1e308 + 1e308 are Infinity. Unicode 15, §3.9 D91: a lone surrogate code unit
 * is ill-formed UTF-16.
 */
import { describe, expect, it } from "vitest";
import { answerInput, questionInput } from "../../lib/validation/inputs";
import { baselineInput, outcomeCorrection, outcomeInput } from "../../lib/validation/triangulation-inputs";
import { NUMBER_RANGE_MESSAGE } from "../../lib/validation/numbers";
import { DEPTH_MESSAGE, MAX_DEPTH, NUL_MESSAGE, SURROGATE_MESSAGE, textFieldErrors } from "../../lib/validation/nul";
import { readSeriesCsv } from "../../lib/csv/parse";

const messages = (r: { success: boolean; error?: { issues: { path: PropertyKey[]; message: string }[] } }) =>
  (r.error?.issues ?? []).map((i) => `${i.path.join(".")}: ${i.message}`);

describe("numbers whose ratios or sums overflow are refused at input", () => {
  it("IEEE 754 facts the rule rests on", () => {
    expect(100 / 5e-324).toBe(Infinity); // IEEE 754: 100 / 2^-1074 > MAX_VALUE
    expect(Math.log(100 / 5e-324)).toBe(Infinity);
    expect(1e308 + 1e308).toBe(Infinity); // 2e308 > 1.7976931348623157e308
  });

  it("answers: a subnormal value, 1e308 and its three-point values get the range message", () => {
    const base = { questionId: "q1", rationale: "" };
    expect(messages(answerInput.safeParse({ ...base, value: 5e-324 }))).toEqual([`value: ${NUMBER_RANGE_MESSAGE}`]);
    expect(messages(answerInput.safeParse({ ...base, value: 1e308 }))).toEqual([`value: ${NUMBER_RANGE_MESSAGE}`]);
    expect(messages(answerInput.safeParse({ ...base, value: 5, low: -2.2e-308, high: 1e16 }))).toEqual([
      `low: ${NUMBER_RANGE_MESSAGE}`,
      `high: ${NUMBER_RANGE_MESSAGE}`,
    ]);
  });

  it("the edges of the range and ordinary values are accepted", () => {
    for (const value of [0, -0, 1e-12, -1e-12, 1e15, -1e15, 12500, 0.35]) {
      expect(answerInput.safeParse({ questionId: "q1", value }).success, String(value)).toBe(true);
    }
    expect(answerInput.safeParse({ questionId: "q1", value: 9.99e-13 }).success).toBe(false);
    expect(answerInput.safeParse({ questionId: "q1", value: 1.01e15 }).success).toBe(false);
  });

  it("bounds of ±1e308 are refused with the message, not stored", () => {
    const q = { text: "Units sold?", unit: "units", targetPeriod: "2027", answerFormat: "single", aggregation: "shared" };
    expect(messages(questionInput.safeParse({ ...q, lowerBound: -1e308, upperBound: 1e308 }))).toEqual([
      `lowerBound: ${NUMBER_RANGE_MESSAGE}`,
      `upperBound: ${NUMBER_RANGE_MESSAGE}`,
    ]);
  });

  it("outcome values, part outcomes, corrections, pasted history, future values and scale factors", () => {
    expect(messages(outcomeInput.safeParse({ outcomeValue: 5e-324 }))).toEqual([`outcomeValue: ${NUMBER_RANGE_MESSAGE}`]);
    expect(messages(outcomeInput.safeParse({ outcomeValue: 10, parts: [{ pseudonym: "P1", outcomeValue: 1e300 }] }))).toEqual([`parts.0.outcomeValue: ${NUMBER_RANGE_MESSAGE}`]);
    expect(messages(outcomeCorrection.safeParse({ outcomeValue: -1e308, reason: "typo" }))).toEqual([`outcomeValue: ${NUMBER_RANGE_MESSAGE}`]);
    expect(messages(baselineInput.safeParse({ values: [1, 2, 5e-324] }))).toEqual([`values.2: ${NUMBER_RANGE_MESSAGE}`]);
    expect(messages(baselineInput.safeParse({ csv: "x,value\n1,2\n", futureValues: { x: [1e200] } }))).toEqual([`futureValues.x.0: ${NUMBER_RANGE_MESSAGE}`]);
    expect(messages(baselineInput.safeParse({ values: [1, 2], analogue: { scaleFactor: 5e-324, note: "n" } }))).toEqual([`analogue.scaleFactor: ${NUMBER_RANGE_MESSAGE}`]);
  });

  it("a CSV history cell out of range is refused naming row and column", () => {
    expect(() => readSeriesCsv("month,value\n1,10\n2,5e-324\n")).toThrow(`row 3, column 'value': '5e-324' ${NUMBER_RANGE_MESSAGE}`);
    expect(() => readSeriesCsv("price,value\n1e308,10\n2,12\n")).toThrow(`row 2, column 'price': '1e308' ${NUMBER_RANGE_MESSAGE}`);
  });
});

describe("text rules: NUL, lone surrogates, nesting depth", () => {
  it("a lone surrogate is named by its field; a surrogate pair (an emoji) is text", () => {
    expect(textFieldErrors({ rationale: "high \ud800 demand", note: "ok 😀" })).toEqual([{ field: "rationale", message: SURROGATE_MESSAGE }]);
    expect(textFieldErrors({ parts: [{ pseudonym: "\udc00" }] })).toEqual([{ field: "parts[0].pseudonym", message: SURROGATE_MESSAGE }]);
    expect(textFieldErrors({ ["k\ud800"]: 1 })).toEqual([{ field: "k\ud800", message: SURROGATE_MESSAGE }]);
  });

  it("NUL is still refused", () => {
    expect(textFieldErrors({ a: "x\u0000" })).toEqual([{ field: "a", message: NUL_MESSAGE }]);
  });

  it("JSON nested 10,000 deep gives one depth error instead of overflowing the stack", () => {
    const deep = JSON.parse("[".repeat(10_000) + "]".repeat(10_000));
    const errors = textFieldErrors({ body: deep });
    expect(errors).toHaveLength(1);
    expect(errors[0].message).toBe(DEPTH_MESSAGE);
    // MAX_DEPTH levels are walked: the error is on the path of MAX_DEPTH − 1 nested arrays below "body".
    expect(errors[0].field).toBe("body" + "[0]".repeat(MAX_DEPTH - 1));
  });

  it("nesting within the limit is walked to the end", () => {
    let v: unknown = "\u0000";
    for (let i = 0; i < 10; i++) v = [v];
    expect(textFieldErrors(v)).toEqual([{ field: "[0]".repeat(10), message: NUL_MESSAGE }]);
  });
});
