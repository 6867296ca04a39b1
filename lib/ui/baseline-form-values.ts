/**
 * Turns the baseline form's fields (strings) into the object that lib/validation's
 * `baselineInput` parses: the CSV or the pasted values (each token must be a number; a token
 * that is not is reported with its position), the explanatory columns' target-period values
 * (`future.<column>`, comma-separated), the analogue's factor and note, season, method,
 * horizon, what the question asks for (quantity) and what one history row is (period). Empty optional fields are left out so the schema's defaults apply.
 */
import { typedNumberErrors, withNumbers } from "./form-result";

export type BaselineFormRead =
  | { readonly ok: true; readonly input: Record<string, unknown> }
  | { readonly ok: false; readonly fieldErrors: Record<string, string[]> };

function numbers(text: string, field: string, errors: Record<string, string[]>): number[] {
  const tokens = text.split(/[\s,;]+/).filter((t) => t !== "");
  const out: number[] = [];
  tokens.forEach((t, i) => {
    const v = Number(t);
    if (Number.isFinite(v)) out.push(v);
    else (errors[field] ??= []).push(`item ${i + 1}: '${t}' is not a number`);
  });
  return out;
}

export function baselineFormValues(values: Record<string, string>): BaselineFormRead {
  const errors: Record<string, string[]> = {};
  const input: Record<string, unknown> = withNumbers(
    Object.fromEntries(Object.entries({ season: values.season ?? "", horizon: values.horizon ?? "" }).filter(([, v]) => v.trim() !== "")),
    ["season", "horizon"],
  );
  if (values.method) input.method = values.method;
  if (values.quantity) input.quantity = values.quantity;
  if (values.period) input.period = values.period;
  if ((values.source ?? "csv") === "values") {
    const list = numbers(values.values ?? "", "values", errors);
    input.values = list;
  } else {
    input.csv = values.csv ?? "";
    if (values.valueColumn) input.valueColumn = values.valueColumn;
    // A Map, so that a column named `__proto__` is an entry like any other.
    const future = new Map<string, number[]>();
    for (const [key, raw] of Object.entries(values)) {
      if (!key.startsWith("future.") || raw.trim() === "") continue;
      const column = key.slice("future.".length);
      future.set(column, numbers(raw, `futureValues.${column}`, errors));
    }
    if (future.size > 0) input.futureValues = Object.fromEntries(future);
  }
  if (values.analogue === "yes") {
    const scale = withNumbers({ scaleFactor: values.scaleFactor ?? "" }, ["scaleFactor"]);
    for (const [, messages] of Object.entries(typedNumberErrors(scale)?.fieldErrors ?? {})) (errors["analogue.scaleFactor"] ??= []).push(...(messages ?? []));
    input.analogue = { scaleFactor: scale.scaleFactor, note: values.scaleNote ?? "" };
  }
  for (const [field, messages] of Object.entries(typedNumberErrors(input)?.fieldErrors ?? {})) (errors[field] ??= []).push(...(messages ?? []));
  return Object.keys(errors).length > 0 ? { ok: false, fieldErrors: errors } : { ok: true, input };
}
