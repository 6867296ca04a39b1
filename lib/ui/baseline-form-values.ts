/**
 * Turns the baseline form's fields (strings) into the object that lib/validation's
 * `baselineInput` parses: the CSV or the pasted values (each token must be a number; a token
 * that is not is reported with its position), the explanatory columns' target-period values
 * (`future.<column>`, comma-separated), the analogue's factor and note, season, method,
 * horizon, the first period of a total or average (firstPeriod; dropped for a value), what
 * the question asks for (quantity) and what one history row is (period). Empty optional fields are left out so the schema's defaults apply.
 * A launch baseline (`source` = launch) reads one analogue per line of `analogues`
 * ("Name: 120, 340, 610, …"), the market potential from a question (`marketSource` = question,
 * `marketQuestionId`) or as `marketLow` / `marketMedian` / `marketHigh`, and `launchNote`.
 */
import { typedNumberErrors, withNumbers } from "../actions/form-result";

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

/** One analogue per non-empty line, "Name: numbers" (a line without a name is "analogue N"). */
function launchValues(values: Record<string, string>, errors: Record<string, string[]>): Record<string, unknown> {
  const lines = (values.analogues ?? "").split(/\r\n|\n|\r/).filter((l) => l.trim() !== "");
  const analogues = lines.map((line, i) => {
    const colon = line.indexOf(":");
    const name = colon > 0 ? line.slice(0, colon).trim() : `analogue ${i + 1}`;
    return { name, values: numbers(colon > 0 ? line.slice(colon + 1) : line, "launch.analogues", errors) };
  });
  const market =
    values.marketSource === "question"
      ? { questionId: values.marketQuestionId ?? "" }
      : (() => {
          const m = withNumbers({ low: values.marketLow ?? "", median: values.marketMedian ?? "", high: values.marketHigh ?? "" }, ["low", "median", "high"]);
          return { low: m.low, median: m.median, high: m.high };
        })();
  return { analogues, market, note: values.launchNote ?? "" };
}

export function baselineFormValues(values: Record<string, string>): BaselineFormRead {
  const errors: Record<string, string[]> = {};
  const input: Record<string, unknown> = withNumbers(
    Object.fromEntries(
      Object.entries({
        season: values.season ?? "",
        horizon: values.horizon ?? "",
        // A value in one period has no first period: a field left over from a total is not read.
        firstPeriod: values.quantity === "value" ? "" : (values.firstPeriod ?? ""),
      }).filter(([, v]) => v.trim() !== ""),
    ),
    ["season", "horizon", "firstPeriod"],
  );
  if (values.method) input.method = values.method;
  if (values.quantity) input.quantity = values.quantity;
  if (values.period) input.period = values.period;
  if (values.source === "launch") {
    input.launch = launchValues(values, errors);
    input.method = "bass";
  } else if ((values.source ?? "csv") === "values") {
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
