/**
 * The baseline form's fields → the object lib/validation's `baselineInput` parses
 * (lib/ui/baseline-form-values.ts). Expected values are the typed numbers themselves (no
 * computation): what matters is which field each one lands in and which token is refused.
 */
import { describe, expect, it } from "vitest";
import { baselineFormValues } from "@/lib/ui/baseline-form-values";
import { baselineInput } from "@/lib/validation/triangulation-inputs";

describe("baselineFormValues", () => {
  it("reads pasted values separated by commas, spaces and new lines, oldest first", () => {
    const r = baselineFormValues({ source: "values", values: "71, 70\n69 68;64", season: "", horizon: "2", method: "naive" });
    expect(r).toEqual({ ok: true, input: { values: [71, 70, 69, 68, 64], horizon: 2, method: "naive" } });
    if (!r.ok) throw new Error("unreachable");
    expect(baselineInput.safeParse(r.input).success).toBe(true);
  });

  it("names the position of a pasted token that is not a number", () => {
    const r = baselineFormValues({ source: "values", values: "71 70 seventy 68" });
    expect(r).toEqual({ ok: false, fieldErrors: { values: ["item 3: 'seventy' is not a number"] } });
  });

  it("keeps the CSV and the value column, and reads each explanatory column's target-period values", () => {
    const r = baselineFormValues({ source: "csv", csv: "t,y,price\n1,5,2\n2,6,3", valueColumn: "y", "future.price": "3.5, 4", "future.t": "" });
    expect(r).toEqual({ ok: true, input: { csv: "t,y,price\n1,5,2\n2,6,3", valueColumn: "y", futureValues: { price: [3.5, 4] } } });
  });

  it("refuses a target-period value that is not a number, under the column's field", () => {
    const r = baselineFormValues({ source: "csv", csv: "y,x\n1,2", valueColumn: "y", "future.x": "3, n/a" });
    expect(r).toEqual({ ok: false, fieldErrors: { "futureValues.x": ["item 2: 'n/a' is not a number"] } });
  });

  it("passes an analogue's factor as a number and its note; the schema then asks for a missing note", () => {
    const r = baselineFormValues({ source: "values", values: "1 2 3", analogue: "yes", scaleFactor: "2.5", scaleNote: "" });
    expect(r).toEqual({ ok: true, input: { values: [1, 2, 3], analogue: { scaleFactor: 2.5, note: "" } } });
    if (!r.ok) throw new Error("unreachable");
    const parsed = baselineInput.safeParse(r.input);
    expect(parsed.success).toBe(false);
    expect(parsed.error?.issues.map((i) => i.path.join("."))).toEqual(["analogue.note"]);
  });

  it("refuses a typed non-number season on that field, saying what was wrong (not \"required\")", () => {
    const r = baselineFormValues({ source: "values", values: "1 2 3", season: "four" });
    if (r.ok) throw new Error("expected the season to be refused");
    expect(Object.keys(r.fieldErrors)).toEqual(["season"]);
    expect(r.fieldErrors.season?.[0]).toContain("contains letters");
  });

  it("reads the first period of a total, and leaves a stale one out for a value in one period", () => {
    const total = baselineFormValues({ source: "values", values: "1 2 3", quantity: "total", firstPeriod: "4", horizon: "15" });
    expect(total).toEqual({ ok: true, input: { values: [1, 2, 3], quantity: "total", firstPeriod: 4, horizon: 15 } });
    const value = baselineFormValues({ source: "values", values: "1 2 3", quantity: "value", firstPeriod: "4", horizon: "15" });
    expect(value).toEqual({ ok: true, input: { values: [1, 2, 3], quantity: "value", horizon: 15 } });
    if (!total.ok) throw new Error("unreachable");
    expect(baselineInput.parse(total.input)).toMatchObject({ firstPeriod: 4, horizon: 15, quantity: "total" });
  });
});
