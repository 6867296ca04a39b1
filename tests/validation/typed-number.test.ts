/**
 * Numbers as panelists type them (lib/validation/typed-number.ts). The marks per locale are
 * those of the Unicode CLDR (common/main/*.xml, symbols: en-GB decimal "." and group ",";
 * de-DE decimal "," and group "."; fr-FR decimal "," and group U+202F; de-CH group "’" or "'"),
 * as the ICU in Node carries them; the expected numbers are the typed digits read by hand.
 */
import { describe, expect, it } from "vitest";
import { numberMarks, parseTypedNumber } from "../../lib/validation/typed-number";

const value = (raw: string, locale?: string) => {
  const r = parseTypedNumber(raw, locale);
  if (!("value" in r)) throw new Error(`${raw} (${locale}) not read: ${JSON.stringify(r)}`);
  return r.value;
};
const error = (raw: string, locale?: string) => {
  const r = parseTypedNumber(raw, locale);
  if (!("error" in r)) throw new Error(`${raw} (${locale}) was not refused: ${JSON.stringify(r)}`);
  return r.error;
};

describe("numberMarks (CLDR through Intl)", () => {
  it("gives each locale's decimal mark and thousands separator", () => {
    expect(numberMarks("en-GB")).toEqual({ decimal: ".", group: "," });
    expect(numberMarks("de-DE")).toEqual({ decimal: ",", group: "." });
    expect(numberMarks("fr-FR")).toEqual({ decimal: ",", group: "\u202f" });
    // A malformed locale falls back to English.
    expect(numberMarks("not a locale!")).toEqual({ decimal: ".", group: "," });
  });
});

describe("parseTypedNumber", () => {
  it("reads the locale's decimal mark: 12,5 in a comma-decimal locale, 12.5 in English", () => {
    expect(value("12,5", "de-DE")).toBe(12.5);
    expect(value("12.5", "en-GB")).toBe(12.5);
    expect(value("1 000,5", "fr-FR")).toBe(1000.5);
  });

  it("reads thousands separators: 1,000 and 1 000 in English, 1.000 in German, 1'000 in Swiss German", () => {
    expect(value("1,000", "en-GB")).toBe(1000);
    expect(value("1 000", "en-GB")).toBe(1000);
    expect(value("1\u00a0000", "en-GB")).toBe(1000);
    expect(value("1.000", "de-DE")).toBe(1000);
    expect(value("1'000", "de-CH")).toBe(1000);
    expect(value("-1,234.5", "en-GB")).toBe(-1234.5);
    expect(value("−3", "en-GB")).toBe(-3); // U+2212 minus sign
  });

  it("refuses hexadecimal, binary, octal and underscores, which Number() would accept", () => {
    expect(Number("0x10")).toBe(16); // what the old reading let through
    expect(error("0x10")).toContain("hexadecimal, binary and octal");
    expect(error("0b101")).toContain("hexadecimal, binary and octal");
    expect(error("0o17")).toContain("hexadecimal, binary and octal");
    expect(error("1_000")).toContain("underscores");
  });

  it("says what is wrong with a filled field it cannot read, never that it is required", () => {
    expect(error("12k")).toContain("contains letters");
    expect(error("1e3")).toContain("contains letters");
    expect(error("12,5", "en-GB")).toContain("groups of three digits");
    expect(error("12,5", "en-GB")).toContain("12.5");
    expect(error("12.5", "de-DE")).toContain("12,5");
    expect(error("1.2.3", "en-GB")).toContain("more than one decimal mark");
    expect(error("12#5", "en-GB")).toContain("“#” is not allowed");
    expect(error("-", "en-GB")).toContain("no digits");
    for (const raw of ["12k", "0x10", "1_000", "12,5", "abc"]) expect(error(raw, "en-GB")).not.toMatch(/required/i);
  });

  it("leaves an empty field to the caller", () => {
    expect(parseTypedNumber("   ", "en-GB")).toEqual({ empty: true });
  });
});
