"use client";
/**
 * The organiser's form for a question's baseline: the history as a CSV file (read in the
 * browser into the text box), pasted CSV, or pasted values; the value column and the
 * explanatory columns' values for the target period; optionally an analogous product's
 * history with its scale factor and a note; season, method; what the question asks for (the
 * value in period k, or the total or average over periods a..b after the history, a = 1 by
 * default) and what one history row is (month, quarter, …). "Preview" reads and
 * fits without storing and shows what was read (chart and rows) and the forecast it would
 * give; "Attach" stores it. Errors name the row and column (lib/csv messages).
 * For a product with no history, "Analogous launches" takes the adoptions of 1–5 analogous
 * products and the market potential (from another question's panel answers, or a low / median /
 * high), fits the Bass model to each analogue and previews the fits and the launch forecast
 * (docs/methods.md §19).
 */
import { startTransition, useActionState, useMemo, useState } from "react";
import type { FormState } from "../actions/form-state";
import BaselineChart from "./baseline-chart";
import ErrorBanner from "./error-banner";
import { useReady } from "./use-ready";
import Figure from "./figure";
import { formatNumber } from "./format";
import LaunchTable, { type LaunchPreview } from "./launch-table";

export interface BaselinePreviewPayload {
  readonly labels: readonly string[];
  readonly history: readonly (number | null)[];
  readonly valueColumn: string;
  readonly explanatoryColumns: readonly string[];
  readonly ignoredColumns: readonly string[];
  readonly observations: number;
  readonly missing: number;
  readonly scaleFactor: number;
  readonly method: string;
  readonly horizon: number;
  /** A launch baseline's analogues, carried p and q, market potential and periods. */
  readonly launch?: LaunchPreview;
  readonly target: {
    readonly label: string;
    readonly mean: number | null;
    readonly lower80: number | null;
    readonly upper80: number | null;
    readonly lower95: number | null;
    readonly upper95: number | null;
  };
}

export interface BaselineFormState extends FormState {
  readonly preview?: BaselinePreviewPayload;
  readonly attached?: boolean;
}

export type BaselineFormAction = (previous: BaselineFormState, formData: FormData) => Promise<BaselineFormState>;

export interface BaselineFormDefaults {
  readonly source: "csv" | "values" | "launch";
  readonly csv: string;
  readonly valueColumn: string;
  readonly season: number;
  readonly method: string;
  readonly horizon: number | null;
  /** First period a of a total or average (1 = the next period). */
  readonly firstPeriod: number;
  readonly quantity: string;
  readonly period: string;
  readonly analogue: { readonly scaleFactor: number; readonly note: string } | null;
}

const EMPTY: BaselineFormState = {};
const PERIODS = ["month", "quarter", "year", "week", "day", "other"] as const;

function FieldErr({ state, name }: { state: BaselineFormState; name: string }) {
  const errors = state.fieldErrors?.[name] ?? [];
  if (errors.length === 0) return null;
  return (
    <span className="field-error" role="alert" data-field={name}>
      {errors.join(" ")}
    </span>
  );
}

/** Every field error whose key starts with `prefix` (a launch baseline's nested fields). */
function PrefixErr({ state, prefix }: { state: BaselineFormState; prefix: string }) {
  const errors = Object.entries(state.fieldErrors ?? {}).filter(([k]) => k === prefix || k.startsWith(`${prefix}.`));
  if (errors.length === 0) return null;
  return (
    <span className="field-error" role="alert" data-field={prefix}>
      {errors.map(([k, msgs]) => `${k === prefix ? "" : `${k.slice(prefix.length + 1)}: `}${(msgs ?? []).join(" ")}`).join(" ")}
    </span>
  );
}

/** The header row's column names (quotes removed); enough to offer a choice. */
function headerColumns(csv: string): string[] {
  const first = csv.replace(/^\uFEFF/, "").split(/\r\n|\n|\r/).find((l) => l.trim() !== "");
  if (!first) return [];
  return first.split(",").map((c) => c.trim().replace(/^"(.*)"$/, "$1").trim()).filter((c) => c !== "");
}

export default function BaselineForm({
  action,
  panelId,
  questionId,
  methods,
  unit,
  defaults,
  marketQuestions,
}: {
  action: BaselineFormAction;
  panelId: string;
  questionId: string;
  methods: readonly string[];
  unit: string;
  defaults: BaselineFormDefaults;
  /** Other questions of the panel that can give a launch baseline its market potential. */
  marketQuestions: readonly { readonly id: string; readonly text: string }[];
}) {
  const [state, formAction, pending] = useActionState(action, EMPTY);
  const ready = useReady();
  const [source, setSource] = useState<"csv" | "values" | "launch">(defaults.source);
  const [marketSource, setMarketSource] = useState<"question" | "range">(marketQuestions.length > 0 ? "question" : "range");
  const [csv, setCsv] = useState(defaults.csv);
  const [analogue, setAnalogue] = useState(defaults.analogue !== null);
  const columns = useMemo(() => headerColumns(csv), [csv]);
  const [valueColumn, setValueColumn] = useState(defaults.valueColumn);
  const chosen = columns.includes(valueColumn) ? valueColumn : (columns.find((c) => c.toLowerCase() === "value") ?? columns.at(-1) ?? valueColumn);
  const others = columns.filter((c) => c !== chosen);
  const p = state.preview;
  return (
    <form
      className="baseline-form"
      aria-label="Baseline"
      noValidate
      data-ready={ready ? "" : undefined}
      onSubmit={(event) => {
        event.preventDefault();
        const submitter = (event.nativeEvent as SubmitEvent).submitter;
        const data = new FormData(event.currentTarget, submitter instanceof HTMLButtonElement ? submitter : null);
        startTransition(() => formAction(data));
      }}
    >
      <input type="hidden" name="panelId" value={panelId} />
      <input type="hidden" name="questionId" value={questionId} />
      {state.message && !state.ok ? (
        <ErrorBanner>{state.message}</ErrorBanner>
      ) : null}
      <fieldset>
        <legend>History</legend>
        <label className="inline">
          <input type="radio" name="source" value="csv" checked={source === "csv"} onChange={() => setSource("csv")} /> CSV with a header row
        </label>
        <label className="inline">
          <input type="radio" name="source" value="values" checked={source === "values"} onChange={() => setSource("values")} /> Pasted values, oldest first
        </label>
        <label className="inline">
          <input type="radio" name="source" value="launch" checked={source === "launch"} onChange={() => setSource("launch")} /> Analogous launches (no history
          yet: Bass diffusion)
        </label>
        {source === "launch" ? (
          <>
            <label>
              Analogous products&apos; adoptions{" "}
              <span className="hint">one product per line, its name, a colon, then adoptions per period from its launch, e.g. &ldquo;Wren-1: 120, 340, 610&rdquo;; at least 5 periods each, at most 5 products</span>
              <textarea name="analogues" rows={4} defaultValue="" spellCheck={false} className="mono" />
              <PrefixErr state={state} prefix="launch.analogues" />
            </label>
            <fieldset>
              <legend>Market potential of the new product</legend>
              <label className="inline">
                <input type="radio" name="marketSource" value="question" checked={marketSource === "question"} disabled={marketQuestions.length === 0} onChange={() => setMarketSource("question")} /> From
                the panel&apos;s answers to another question
              </label>
              <label className="inline">
                <input type="radio" name="marketSource" value="range" checked={marketSource === "range"} onChange={() => setMarketSource("range")} /> Low, median and high
                (P10, P50, P90)
              </label>
              {marketSource === "question" ? (
                <label>
                  Question <span className="hint">its corrected panel figure and 80% range become the market potential&apos;s median and P10–P90</span>
                  <select name="marketQuestionId" defaultValue={marketQuestions[0]?.id}>
                    {marketQuestions.map((q) => (
                      <option key={q.id} value={q.id}>
                        {q.text}
                      </option>
                    ))}
                  </select>
                </label>
              ) : (
                <div className="row">
                  <label>
                    Low (P10)
                    <input name="marketLow" inputMode="decimal" />
                  </label>
                  <label>
                    Median
                    <input name="marketMedian" inputMode="decimal" />
                  </label>
                  <label>
                    High (P90)
                    <input name="marketHigh" inputMode="decimal" />
                  </label>
                </div>
              )}
              <PrefixErr state={state} prefix="launch.market" />
            </fieldset>
            <label>
              Why these analogues <span className="hint">similar adoption drivers: price, channel, who adopts and why</span>
              <input name="launchNote" maxLength={500} />
              <PrefixErr state={state} prefix="launch.note" />
            </label>
            <PrefixErr state={state} prefix="launch" />
          </>
        ) : source === "csv" ? (
          <>
            <label>
              CSV file <span className="hint">read in your browser into the box below; nothing is sent until you preview or attach</span>
              <input
                type="file"
                accept=".csv,text/csv,text/plain"
                onChange={async (e) => {
                  const f = e.currentTarget.files?.[0];
                  if (f) setCsv(await f.text());
                }}
              />
            </label>
            <label>
              CSV text
              <textarea name="csv" rows={8} value={csv} onChange={(e) => setCsv(e.currentTarget.value)} spellCheck={false} className="mono" />
              <FieldErr state={state} name="csv" />
            </label>
            <div className="row">
              <label>
                Value column
                <select name="valueColumn" value={chosen} onChange={(e) => setValueColumn(e.currentTarget.value)}>
                  {columns.length === 0 ? <option value={valueColumn}>{valueColumn}</option> : null}
                  {columns.map((c) => (
                    <option key={c} value={c}>
                      {c}
                    </option>
                  ))}
                </select>
                <FieldErr state={state} name="valueColumn" />
              </label>
            </div>
            {others.length > 0 ? (
              <fieldset>
                <legend>Explanatory columns</legend>
                <p className="hint">
                  Other numeric columns are read as explanatory columns (used by multiple regression; columns that are not numbers, such as dates, are left
                  out). For regression, give each one&apos;s values for steps 1…horizon, comma-separated — or leave these empty and end the CSV with rows
                  whose value column is empty.
                </p>
                {others.map((c) => (
                  <label key={c}>
                    Values of <code>{c}</code> for the target period
                    <input name={`future.${c}`} inputMode="decimal" placeholder="e.g. 13, 14" />
                    <FieldErr state={state} name={`futureValues.${c}`} />
                  </label>
                ))}
              </fieldset>
            ) : null}
          </>
        ) : (
          <label>
            Values <span className="hint">separated by commas, spaces or new lines</span>
            <textarea name="values" rows={5} defaultValue="" spellCheck={false} className="mono" />
            <FieldErr state={state} name="values" />
          </label>
        )}
      </fieldset>
      {source === "launch" ? null : (
      <fieldset>
        <legend>Analogous product</legend>
        <label className="inline">
          <input type="checkbox" name="analogue" value="yes" checked={analogue} onChange={(e) => setAnalogue(e.currentTarget.checked)} /> The history is an
          analogous product&apos;s launch history, scaled by a factor
        </label>
        {analogue ? (
          <div className="row">
            <label>
              Scale factor <span className="hint">every value is multiplied by it</span>
              <input name="scaleFactor" inputMode="decimal" defaultValue={defaults.analogue?.scaleFactor ?? ""} />
              <FieldErr state={state} name="analogue.scaleFactor" />
            </label>
            <label style={{ flexBasis: "24rem" }}>
              Note <span className="hint">which product, and why this factor</span>
              <input name="scaleNote" defaultValue={defaults.analogue?.note ?? ""} maxLength={500} />
              <FieldErr state={state} name="analogue.note" />
            </label>
          </div>
        ) : null}
        <FieldErr state={state} name="analogue" />
      </fieldset>
      )}
      <fieldset>
        <legend>{source === "launch" ? "What the question asks for" : "Method"}</legend>
        {source === "launch" ? null : (
        <div className="row">
          <label>
            Season length <span className="hint">1 none, 4 quarterly, 12 monthly</span>
            <input name="season" inputMode="numeric" defaultValue={defaults.season} />
            <FieldErr state={state} name="season" />
          </label>
          <label>
            Method
            <select name="method" defaultValue={defaults.method}>
              {methods.map((m) => (
                <option key={m} value={m}>
                  {m === "auto" ? "automatic (ETS and Theta combined)" : m}
                </option>
              ))}
            </select>
            <FieldErr state={state} name="method" />
          </label>
        </div>
        )}
        <div className="row">
          <label>
            What the question asks for
            <select name="quantity" defaultValue={defaults.quantity}>
              <option value="value">the value in period k</option>
              <option value="total">the total over periods a to b</option>
              <option value="average">the average over periods a to b</option>
            </select>
            <FieldErr state={state} name="quantity" />
          </label>
          <label>
            First period a{" "}
            <span className="hint">total or average only; 1 = the {source === "launch" ? "first period after launch" : "next period after the history"}</span>
            <input name="firstPeriod" inputMode="numeric" defaultValue={defaults.firstPeriod} placeholder="1" />
            <FieldErr state={state} name="firstPeriod" />
          </label>
          <label>
            Horizon: k, or the last period b{" "}
            <span className="hint">{source === "launch" ? "periods after launch" : "periods after the last history row"}</span>
            <input name="horizon" inputMode="numeric" defaultValue={defaults.horizon ?? ""} placeholder="1" />
            <FieldErr state={state} name="horizon" />
          </label>
          <label>
            Each history row is one
            <select name="period" defaultValue={defaults.period}>
              {PERIODS.map((p) => (
                <option key={p} value={p}>
                  {p === "other" ? "other period" : p}
                </option>
              ))}
            </select>
            <FieldErr state={state} name="period" />
          </label>
        </div>
      </fieldset>
      {p ? (
        <div className="card preview" data-baseline-preview>
          <h3>{state.attached ? "Attached: what was read" : "Preview: what was read (not stored yet)"}</h3>
          <p className="small">
            Column <code>{p.valueColumn}</code>: <strong><Figure value={p.observations} name="preview-observations" /></strong> observations
            {p.missing > 0 ? `, ${p.missing} missing` : ""}
            {p.explanatoryColumns.length > 0 ? `; explanatory columns ${p.explanatoryColumns.join(", ")}` : ""}
            {p.ignoredColumns.length > 0 ? `; left out (not numeric): ${p.ignoredColumns.join(", ")}` : ""}
            {p.scaleFactor !== 1 ? `; values multiplied by ${p.scaleFactor}` : ""}. With method {p.method}, the baseline answers the{" "}
            <strong data-preview-target>{p.target.label}</strong>: <Figure value={p.target.mean} name="preview-target-mean" /> {unit}, 80%{" "}
            <Figure value={p.target.lower80} name="preview-target-lower80" /> to <Figure value={p.target.upper80} name="preview-target-upper80" />, 95%{" "}
            {formatNumber(p.target.lower95)} to {formatNumber(p.target.upper95)}.
          </p>
          {p.launch ? (
            <>
              <BaselineChart labels={[]} history={[]} forecast={p.launch.steps} targetStep={p.horizon} unit={unit} launch caption="The launch forecast by period after launch, with its 80% and 95% bands" />
              <LaunchTable launch={p.launch} unit={unit} />
            </>
          ) : null}
          {p.launch ? null : <BaselineChart labels={p.labels} history={p.history} unit={unit} caption={`The history as read from column ${p.valueColumn}`} />}
          {p.launch ? null : (
          <details>
            <summary>Rows as read</summary>
            <table className="small">
              <thead>
                <tr>
                  <th>Row</th>
                  <th className="num">Value</th>
                </tr>
              </thead>
              <tbody>
                {p.labels.map((l, i) => (
                  <tr key={l}>
                    <td>{l}</td>
                    <td className="num" data-preview-row={l}>{p.history[i] === null ? "missing" : <Figure value={p.history[i]} name="preview-value" digits={8} />}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </details>
          )}
        </div>
      ) : null}
      {state.ok && state.message ? (
        <p className="notice" role="status">
          {state.message}
        </p>
      ) : null}
      <div className="actions">
        <button type="submit" name="intent" value="preview" className="secondary" disabled={!ready || pending}>
          {pending ? "Reading…" : "Preview"}
        </button>
        <button type="submit" name="intent" value="attach" disabled={!ready || pending}>
          {pending ? "Fitting…" : "Attach baseline"}
        </button>
        {state.ok === false && state.fieldErrors && Object.keys(state.fieldErrors).length > 0 ? (
          <span className="field-error">Not read: see the messages in red above.</span>
        ) : null}
      </div>
    </form>
  );
}
