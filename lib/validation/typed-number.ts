/**
 * Reads a number a person typed into a form, in their locale's marks: the decimal mark and the
 * thousands separator of `locale` as the Unicode CLDR data in Intl.NumberFormat gives them
 * ("12,5" is 12.5 in de-DE; "1,000" is 1000 in en-GB), spaces (also no-break and thin spaces)
 * and apostrophes as thousands separators in any locale ("1 000", "1'000"), a leading + or −.
 * Everything else is refused with a message saying what was wrong: letters and suffixes
 * ("12k", "1e3"), hexadecimal, binary and octal forms ("0x10", "0b101", "0o17"), underscores
 * ("1_000"), a thousands separator not followed by groups of three digits ("12,5" in en-GB,
 * "12.5" in de-DE), two decimal marks. The same function serves the browser form and the
 * server action (lib/actions/form-result.ts); the JSON API takes JSON numbers and never calls it.
 *
 * Policy: empty or blank text is `{ empty: true }` (the caller decides whether it is required);
 * an unknown or malformed locale falls back to "en"; the number's range is checked elsewhere
 * (lib/validation/numbers.ts), only that it is finite here.
 */
export type TypedNumber = { readonly value: number } | { readonly empty: true } | { readonly error: string };

/** The decimal mark and thousands separator of `locale` (CLDR through Intl), "en" when unknown. */
export function numberMarks(locale: string | undefined): { decimal: string; group: string } {
  let format: Intl.NumberFormat;
  try {
    format = new Intl.NumberFormat(locale || "en");
  } catch {
    format = new Intl.NumberFormat("en");
  }
  const parts = format.formatToParts(12345.6);
  return { decimal: parts.find((p) => p.type === "decimal")?.value ?? ".", group: parts.find((p) => p.type === "group")?.value ?? "," };
}

const SPACES = /[\s\u00a0\u2009\u202f]/g;

/** Reads `raw` as typed in `locale` (see the module comment). */
export function parseTypedNumber(raw: string, locale?: string): TypedNumber {
  const text = raw.trim();
  if (text === "") return { empty: true };
  const shown = `“${text.length > 40 ? `${text.slice(0, 40)}…` : text}”`;
  if (/^[+\-−]?0[xXbBoO]/.test(text)) return { error: `${shown} is not a decimal number: hexadecimal, binary and octal forms are not accepted` };
  if (text.includes("_")) return { error: `${shown}: leave out the underscores (write the digits only)` };
  if (/\p{L}/u.test(text)) return { error: `${shown} contains letters: write the number in full, in digits (e.g. 12000, not 12k or 1.2e4)` };
  const { decimal, group } = numberMarks(locale);
  const groupMark = group.replace(SPACES, " ");
  let body = text.replace(SPACES, " ");
  let sign = "";
  if (/^[+\-−]/.test(body)) {
    sign = body[0] === "+" ? "" : "-";
    body = body.slice(1).trimStart();
  }
  const pieces = body.split(decimal);
  if (pieces.length > 2) return { error: `${shown} has more than one decimal mark (“${decimal}” in your number format)` };
  const [whole, fraction = ""] = pieces;
  const isGroup = (c: string) => c === " " || c === "'" || c === "’" || c === groupMark;
  const stray = [...whole].find((c) => !/\d/.test(c) && !isGroup(c)) ?? [...fraction].find((c) => !/\d/.test(c));
  if (stray !== undefined) {
    return {
      error:
        stray === "." || stray === ","
          ? `${shown}: in your number format the decimal mark is “${decimal}” and the thousands separator “${group}”, e.g. 12${decimal}5 or 1${group}250`
          : `${shown} is not a number: “${stray}” is not allowed`,
    };
  }
  if (whole === "" && fraction === "") return { error: `${shown} is not a number: it has no digits` };
  const chunks = [...whole].reduce<string[]>((acc, c) => (isGroup(c) ? [...acc, ""] : [...acc.slice(0, -1), acc[acc.length - 1] + c]), [""]);
  if (chunks.length > 1 && (chunks[0].length < 1 || chunks[0].length > 3 || chunks.slice(1).some((c) => c.length !== 3))) {
    return {
      error: `${shown}: a thousands separator must be followed by groups of three digits (in your number format “${group}” separates thousands and “${decimal}” marks decimals, e.g. 12${decimal}5)`,
    };
  }
  const value = Number(`${sign}${chunks.join("") || "0"}.${fraction || "0"}`);
  if (!Number.isFinite(value)) return { error: `${shown} is too large` };
  return { value };
}
