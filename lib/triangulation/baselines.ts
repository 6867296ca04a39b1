/**
 * Baselines on questions (docs/methods.md §14.6): the organiser attaches a history — CSV
 * text or pasted values, optionally with explanatory columns and their values for the target
 * period, or an analogous product's history scaled by a stated factor — and the engine
 * (lib/forecast/baseline.ts) fits it, automatically or with a chosen method, and forecasts
 * the target period `horizon` steps after the last observation with 80% and 95% intervals.
 *
 * Storage: the inputs and the engine's result are stored together when the baseline is
 * attached or replaced (the result is a pure function of the stored inputs, so nothing can go
 * stale). Once a question's outcome is recorded, its baseline is part of the scored record and can no longer change.
 *
 * Errors: CSV problems give 422 naming the row and column (`errors[0].row`, `.column`); the
 * engine's input errors (too short, season too long for the series, a method that does not
 * apply) give 422 naming the option. Cells that look like spreadsheet formulas (`=…`) are not
 * numbers, so they are refused in the value column and ignored as labels elsewhere; they are
 * never evaluated.
 */
import { db } from "@/lib/db";
import { ConflictError, InvalidInputError, NotFoundError, type FieldError } from "@/lib/errors";
import type { Actor } from "@/lib/accounts/actor";
import type { Baseline, Question } from "@/lib/generated/prisma/client";
import { CsvError, readSeriesCsv, type SeriesTable } from "@/lib/csv/parse";
import type { BaselineResult } from "@/lib/forecast/baseline";
import { marketPotentialFromRange, type MarketPotential } from "@/lib/forecast/launch";
import { ForecastInputError, type MethodId } from "@/lib/forecast/types";
import { formatNumber } from "@/lib/ui/format";
import type { BASELINE_QUANTITIES, BaselineInput, HISTORY_PERIODS, LaunchInput } from "@/lib/validation/triangulation-inputs";
import { runJob } from "@/lib/work/pool";
import { authorisePanel } from "../panels/access";
import { recordAudit } from "../panels/audit";

export type BaselineQuantity = (typeof BASELINE_QUANTITIES)[number];
export type HistoryPeriod = (typeof HISTORY_PERIODS)[number];
/** Where a baseline's history comes from: CSV text, pasted values, or analogous launches (§19). */
export type BaselineSource = "csv" | "values" | "launch";

/** A launch baseline's market potential as used: the lognormal, its P10–P90, and its question (if any). */
export interface MarketAsUsed extends MarketPotential {
  readonly questionId: string | null;
}

/** One row of the history as read. */
export interface PreviewRow {
  /** CSV row number (header = 1), or the position of a pasted value (1-based). */
  readonly row: number;
  /** The value as read (null: missing). */
  readonly value: number | null;
  /** The value the engine used: value × scale factor (null: missing). */
  readonly scaled: number | null;
  /** Explanatory columns' values on this row. */
  readonly x: Readonly<Record<string, number | null>>;
}

/** What was read, for the preview before and after attaching. */
export interface BaselinePreview {
  readonly source: BaselineSource;
  readonly valueColumn: string;
  readonly explanatoryColumns: readonly string[];
  /** Columns left out because they are not numeric (dates, labels). */
  readonly ignoredColumns: readonly string[];
  readonly rows: readonly PreviewRow[];
  /** Explanatory columns' values for steps 1…horizon. */
  readonly futureRows: readonly { readonly step: number; readonly x: Readonly<Record<string, number>> }[];
  readonly observations: number;
  readonly missing: number;
  readonly scaleFactor: number;
}

/** The baseline's forecast of the quantity the question asks for. */
export interface BaselineTarget {
  /** Steps after the last observation (the horizon); for a total or average, the last period b. */
  readonly step: number;
  /** Total or average: the first period a of periods a..step (1 = the next period); value: `step`. */
  readonly firstPeriod: number;
  /** value: the value in period `step`; total or average: over periods firstPeriod..step. */
  readonly quantity: BaselineQuantity;
  /** What one history row is. */
  readonly period: HistoryPeriod;
  /** Plain words, e.g. "total of the next 12 months", "total of months 4 to 15 after the history". */
  readonly label: string;
  /** How the total's distribution was made (total and average; lib/forecast/total.ts). */
  readonly how: string | null;
  readonly mean: number | null;
  readonly lower80: number | null;
  readonly upper80: number | null;
  readonly lower95: number | null;
  readonly upper95: number | null;
}

export interface BaselineView {
  readonly questionId: string;
  readonly source: BaselineSource;
  readonly valueColumn: string;
  readonly analogue: { readonly scaleFactor: number; readonly note: string } | null;
  readonly season: number;
  /** The method asked for ("auto" or an id); `result.method` is the one used. */
  readonly requestedMethod: "auto" | MethodId;
  readonly horizon: number;
  readonly target: BaselineTarget;
  readonly result: BaselineResult;
  readonly preview: BaselinePreview;
  /** False for a preview that was not stored. */
  readonly stored: boolean;
  readonly createdAt: string | null;
  readonly updatedAt: string | null;
}

/** Everything computed from a baseline input (no I/O). */
interface Analysed {
  readonly source: BaselineSource;
  readonly data: string;
  readonly futureX: Record<string, number[]>;
  readonly horizon: number;
  readonly result: BaselineResult;
  readonly preview: BaselinePreview;
  readonly target: BaselineTarget;
}

/** Which option an engine error is about, from its message (for the problem's `field`). */
function engineField(message: string, source: "csv" | "values"): string {
  if (/first period/i.test(message)) return "firstPeriod";
  if (/season/i.test(message)) return "season";
  if (/horizon/i.test(message)) return "horizon";
  if (/method|regression/i.test(message)) return "method";
  return source;
}

function csvFieldError(err: CsvError): FieldError {
  return { field: "csv", message: err.message, ...(err.row !== undefined ? { row: err.row } : {}), ...(err.column !== undefined ? { column: err.column } : {}) };
}

/** Pasted values as the one-column CSV that is stored. */
function valuesCsv(values: readonly number[]): string {
  return ["value", ...values.map(String)].join("\n");
}

/**
 * Reads and fits a baseline input (no I/O). The fit, which takes up to seconds, runs on the
 * worker pool (lib/work/pool.ts), so the request thread goes on serving panelists meanwhile.
 * @throws InvalidInputError naming the field (and the CSV row and column).
 */
export async function analyseBaseline(input: BaselineInput, market?: MarketAsUsed): Promise<Analysed> {
  if (input.launch) {
    if (!market) throw new Error("analyseBaseline: a launch baseline needs its market potential");
    return analyseLaunch(input, input.launch, market);
  }
  const source = input.csv !== undefined ? "csv" : "values";
  const data = input.csv !== undefined ? input.csv : valuesCsv(input.values ?? []);
  const valueColumn = source === "csv" ? input.valueColumn : "value";
  let table: SeriesTable;
  try {
    table = readSeriesCsv(data, { value: valueColumn });
  } catch (err) {
    if (err instanceof CsvError) {
      const fe = csvFieldError(err);
      // A missing value column is the valueColumn field's fault, not a cell's.
      throw new InvalidInputError([err.row === 1 && err.column === valueColumn ? { ...fe, field: "valueColumn" } : fe], "The history could not be read.");
    }
    throw err;
  }
  if (table.y.length === 0) throw new InvalidInputError([{ field: source, message: "the history has no data rows" }], "The history could not be read.");

  let futureX: (readonly number[])[] = table.futureX.map((c) => [...c]);
  let givenFuture: Record<string, number[]> = {};
  if (input.futureValues) {
    // A Map of the own entries: a column named `constructor` or `__proto__` must not find Object's.
    const given = new Map(Object.entries(input.futureValues));
    const errors: FieldError[] = [];
    for (const name of given.keys()) {
      if (!table.xNames.includes(name)) errors.push({ field: `futureValues.${name}`, message: `no explanatory column '${name}' in the CSV (columns: ${table.xNames.join(", ") || "none"})` });
    }
    for (const name of table.xNames) {
      if (!given.has(name)) errors.push({ field: `futureValues.${name}`, message: `give the values of '${name}' for the target period` });
    }
    if (errors.length > 0) throw new InvalidInputError(errors);
    futureX = table.xNames.map((name) => given.get(name)!);
    givenFuture = Object.fromEntries(table.xNames.map((name) => [name, [...given.get(name)!]]));
  }
  const futureLength = futureX.length > 0 ? Math.min(...futureX.map((c) => c.length)) : 0;
  const horizon = input.horizon ?? (futureLength > 0 ? futureLength : 1);
  const factor = input.analogue?.scaleFactor ?? 1;
  const y = table.y.map((v) => (v === null ? null : v * factor));

  let result: BaselineResult;
  try {
    result = await runJob("baseline", {
      series: { y, rows: table.rows, x: table.x, xNames: table.xNames, futureX },
      options: { season: input.season, horizon, method: input.method, levels: [80, 95], total: input.quantity !== "value", totalFrom: input.quantity !== "value" ? input.firstPeriod : 1 },
    });
  } catch (err) {
    // By name too: the worker pool lives on globalThis, so its rebuilt error may come from
    // another bundle layer's copy of the class (a route handler vs a server action).
    if (err instanceof ForecastInputError || err instanceof RangeError || (err instanceof Error && err.name === "ForecastInputError")) {
      throw new InvalidInputError([{ field: engineField(err.message, source), message: err.message }], "The baseline could not be computed.");
    }
    throw err;
  }
  if (factor !== 1) {
    result = { ...result, notes: [...result.notes, `the history is an analogous product's, multiplied by ${factor} before fitting: ${input.analogue!.note}`] };
  }
  const target = targetOf({ result, horizon, firstPeriod: input.firstPeriod, quantity: input.quantity, period: input.period });
  const preview: BaselinePreview = {
    source,
    valueColumn,
    explanatoryColumns: table.xNames,
    ignoredColumns: table.ignored,
    rows: table.y.map((v, i) => ({
      row: source === "csv" ? table.rows[i] : i + 1,
      value: v,
      scaled: y[i],
      x: Object.fromEntries(table.xNames.map((name, k) => [name, table.x[k][i]])),
    })),
    futureRows: Array.from({ length: futureLength }, (_, i) => ({ step: i + 1, x: Object.fromEntries(table.xNames.map((name, k) => [name, futureX[k][i]])) })),
    observations: table.y.filter((v) => v !== null).length,
    missing: table.y.filter((v) => v === null).length,
    scaleFactor: factor,
  };
  return { source, data, futureX: givenFuture, horizon, result, preview, target };
}

/**
 * A launch baseline (docs/methods.md §19): the Bass model fitted to each analogue and simulated
 * for the new product (lib/forecast/launch.ts, on the worker pool), periods counted from launch.
 * @throws InvalidInputError naming the analogue the fit refuses.
 */
async function analyseLaunch(input: BaselineInput, launch: LaunchInput, market: MarketAsUsed): Promise<Analysed> {
  const horizon = input.horizon ?? 1;
  let fc;
  try {
    fc = await runJob("launch", { analogues: launch.analogues, market: { median: market.median, sigmaLog: market.sigmaLog, low: market.low, high: market.high, how: market.how }, horizon, from: input.quantity !== "value" ? input.firstPeriod : 1 });
  } catch (err) {
    if (err instanceof RangeError || (err instanceof Error && err.name === "RangeError")) {
      throw new InvalidInputError([{ field: /first period/.test(err.message) ? "firstPeriod" : "launch.analogues", message: err.message }], "The launch baseline could not be computed.");
    }
    throw err;
  }
  const result: BaselineResult = {
    method: "bass",
    parameters: { p: fc.p.mean, q: fc.q.mean, m: market.median },
    season: 1,
    horizon,
    levels: [80, 95],
    forecast: fc.steps.map((st, i) => ({ step: i + 1, mean: st.mean, lower: st.lower, upper: st.upper })),
    fitted: [],
    accuracy: { insample: { mae: null, rmse: null, mape: null, smape: null, mase: null } },
    total: { from: input.quantity !== "value" ? input.firstPeriod : 1, to: horizon, ...fc.total, how: `the totals of ${fc.draws} simulated launches (docs/methods.md §19)` },
    launch: { analogues: fc.analogues, p: fc.p, q: fc.q, market, draws: fc.draws },
    notes: [...fc.notes, `Analogues chosen because: ${launch.note}`],
  };
  const preview: BaselinePreview = {
    source: "launch",
    valueColumn: "value",
    explanatoryColumns: [],
    ignoredColumns: [],
    rows: [],
    futureRows: [],
    observations: launch.analogues.reduce((n, a) => n + a.values.length, 0),
    missing: 0,
    scaleFactor: 1,
  };
  const data = JSON.stringify({ analogues: launch.analogues, market, note: launch.note });
  return { source: "launch", data, futureX: {}, horizon, result, preview, target: targetOf({ result, horizon, firstPeriod: input.firstPeriod, quantity: input.quantity, period: input.period }) };
}

const plain = (v: number) => formatNumber(v, 4);

/**
 * The market potential of a launch baseline: as given (P10 / median / P90), or from another
 * question of the same panel, whose corrected panel figure and 80% range (docs/methods.md §15)
 * become the median and P10–P90 of a lognormal. Taken when the baseline is attached; attach
 * again after a later round to use that round. Undefined for other baselines.
 * @throws InvalidInputError when the question is this one, not in the panel, has no closed
 *   round, or its range cannot carry a lognormal (needs 0 < low < figure < high).
 */
async function launchMarket(actor: Actor, panelId: string, questionId: string, input: BaselineInput): Promise<MarketAsUsed | undefined> {
  const m = input.launch?.market;
  if (!m) return undefined;
  const field = "launch.market.questionId";
  if ("low" in m) {
    return { ...marketPotentialFromRange(m.low, m.median, m.high, `given: median ${plain(m.median)}, P10–P90 ${plain(m.low)} to ${plain(m.high)}`), questionId: null };
  }
  if (m.questionId === questionId) throw new InvalidInputError([{ field, message: "a question cannot take its market potential from itself; ask for it in another question" }]);
  const source = await db.question.findFirst({ where: { id: m.questionId, panelId } });
  if (!source) throw new InvalidInputError([{ field, message: "no question with this id in this panel" }]);
  // Loaded on use: the triangulation reads baselines, so a static import would be circular.
  const { getTriangulation } = await import("./triangulation");
  const t = await getTriangulation(actor, panelId, m.questionId);
  if (!t.panel) throw new InvalidInputError([{ field, message: "that question has no closed round yet; close a round or give low, median and high" }]);
  const figure = t.panel.corrected.figure as number;
  const i80 = t.panel.corrected.intervals.find((i) => i.level === 80);
  const low = i80?.lower as number | undefined;
  const high = i80?.upper as number | undefined;
  if (low === undefined || high === undefined || !(low > 0 && low < figure && figure < high)) {
    throw new InvalidInputError([{ field, message: "that question's panel range cannot serve as a market potential (it needs 0 < low < figure < high); give low, median and high" }]);
  }
  return {
    ...marketPotentialFromRange(low, figure, high, `from the panel's answers to "${source.text}" (round ${t.panel.round}): corrected figure ${plain(figure)}, 80% range ${plain(low)} to ${plain(high)}`),
    questionId: m.questionId,
  };
}

function toView(b: Baseline): BaselineView {
  return {
    questionId: b.questionId,
    source: b.source === "values" || b.source === "launch" ? b.source : "csv",
    valueColumn: b.valueColumn,
    analogue: b.analogue ? { scaleFactor: b.scaleFactor, note: b.scaleNote } : null,
    season: b.season,
    requestedMethod: b.method as BaselineView["requestedMethod"],
    horizon: b.horizon,
    target: storedTarget(b),
    result: JSON.parse(b.result) as BaselineResult,
    preview: JSON.parse(b.preview) as BaselinePreview,
    stored: true,
    createdAt: b.createdAt.toISOString(),
    updatedAt: b.updatedAt.toISOString(),
  };
}

const PERIOD_WORDS: Record<HistoryPeriod, readonly [string, string]> = {
  month: ["month", "months"],
  quarter: ["quarter", "quarters"],
  year: ["year", "years"],
  week: ["week", "weeks"],
  day: ["day", "days"],
  other: ["period", "periods"],
};

/**
 * Plain words for what a baseline answers, e.g. "total of the next 12 months", "total of months 4
 * to 15 after the history", "value in month 3 after the history"; for a launch baseline (periods
 * counted from launch) "total of the first 12 months after launch", "total of months 13 to 24
 * after launch", "value in month 3 after launch". `from` is the first period of a total or average.
 */
export function quantityLabel(quantity: string, period: string, n: number, launch = false, from = 1): string {
  const [one, many] = PERIOD_WORDS[period as HistoryPeriod] ?? PERIOD_WORDS.other;
  if ((quantity === "total" || quantity === "average") && from > 1) {
    return from === n ? `${quantity} of ${one} ${n} after ${launch ? "launch" : "the history"}` : `${quantity} of ${many} ${from} to ${n} after ${launch ? "launch" : "the history"}`;
  }
  if (quantity === "total" || quantity === "average") {
    if (launch) return n === 1 ? `${quantity} of the first ${one} after launch` : `${quantity} of the first ${n} ${many} after launch`;
    return n === 1 ? `${quantity} of the next ${one}` : `${quantity} of the next ${n} ${many}`;
  }
  return `value in ${one} ${n} after ${launch ? "launch" : "the history"}`;
}

/**
 * The forecast of the quantity the question asks for: the value in period `horizon` (the
 * step forecast), or the total over periods a..b = firstPeriod..horizon (lib/forecast/total.ts:
 * the sum with the errors' correlation across steps, never the sum of step bounds), or the
 * average (the total's mean and bounds divided by the number of periods b − a + 1). The periods
 * come from the stored result's total (`from`, absent in results stored before windows = 1).
 */
export function targetOf(b: { result: BaselineResult; horizon: number; firstPeriod?: number; quantity: string; period: string }): BaselineTarget {
  const quantity: BaselineQuantity = b.quantity === "total" || b.quantity === "average" ? b.quantity : "value";
  const period = (b.period in PERIOD_WORDS ? b.period : "other") as HistoryPeriod;
  const from = quantity === "value" ? b.horizon : (b.result.total?.from ?? b.firstPeriod ?? 1);
  const head = { step: b.horizon, firstPeriod: from, quantity, period, label: quantityLabel(quantity, period, b.horizon, b.result.launch !== undefined, from) };
  if (quantity === "value") {
    const s = b.result.forecast[b.horizon - 1];
    return { ...head, how: null, mean: s?.mean ?? null, lower80: s?.lower["80"] ?? null, upper80: s?.upper["80"] ?? null, lower95: s?.lower["95"] ?? null, upper95: s?.upper["95"] ?? null };
  }
  const t = b.result.total;
  const k = quantity === "average" ? b.horizon - from + 1 : 1;
  const per = (v: number | null | undefined) => (v === null || v === undefined ? null : v / k);
  return {
    ...head,
    how: t?.how ?? null,
    mean: per(t?.mean),
    lower80: per(t?.lower["80"]),
    upper80: per(t?.upper["80"]),
    lower95: per(t?.lower["95"]),
    upper95: per(t?.upper["95"]),
  };
}

/** The stored baseline's target forecast. */
export function storedTarget(b: Pick<Baseline, "result" | "horizon" | "firstPeriod" | "quantity" | "period">): BaselineTarget {
  return targetOf({ result: JSON.parse(b.result) as BaselineResult, horizon: b.horizon, firstPeriod: b.firstPeriod, quantity: b.quantity, period: b.period });
}

async function findQuestion(panelId: string, questionId: string): Promise<Question> {
  const q = await db.question.findFirst({ where: { id: questionId, panelId } });
  if (!q) throw new NotFoundError("The question");
  return q;
}

function refuseIfCalibration(q: Question): void {
  if (q.calibration) throw new ConflictError("calibration-question", "A calibration question has a true value instead of a baseline: enter it on the panel page (or PUT …/true-value).");
}

async function refuseIfOutcomeRecorded(questionId: string): Promise<void> {
  if (await db.resolution.findUnique({ where: { questionId } })) {
    throw new ConflictError("outcome-recorded", "The question's outcome is recorded; its baseline is part of the scored record and can no longer change.");
  }
}

/**
 * Reads and fits a baseline without storing it: what was read and what the engine made of it
 * (organisers of the panel).
 */
export async function previewBaseline(actor: Actor, panelId: string, questionId: string, input: BaselineInput): Promise<BaselineView> {
  await authorisePanel(actor, panelId, "manage");
  await findQuestion(panelId, questionId);
  const a = await analyseBaseline(input, await launchMarket(actor, panelId, questionId, input));
  return {
    questionId,
    source: a.source,
    valueColumn: a.preview.valueColumn,
    analogue: input.analogue ? { scaleFactor: input.analogue.scaleFactor, note: input.analogue.note } : null,
    season: input.season,
    requestedMethod: input.launch ? "bass" : input.method,
    horizon: a.horizon,
    target: a.target,
    result: a.result,
    preview: a.preview,
    stored: false,
    createdAt: null,
    updatedAt: null,
  };
}

/** Stores an analysed baseline on a question inside a transaction (also used by the demo). */
export async function storeBaseline(
  tx: Pick<typeof db, "baseline">,
  questionId: string,
  input: BaselineInput,
  a: Analysed,
  createdById: string | null,
): Promise<Baseline> {
  const data = {
    source: a.source,
    data: a.data,
    valueColumn: a.preview.valueColumn,
    futureX: JSON.stringify(a.futureX),
    analogue: input.analogue !== undefined,
    scaleFactor: input.analogue?.scaleFactor ?? 1,
    scaleNote: input.analogue?.note ?? "",
    season: input.season,
    method: input.launch ? "bass" : input.method,
    horizon: a.horizon,
    quantity: input.quantity,
    firstPeriod: input.quantity === "value" ? 1 : input.firstPeriod,
    period: input.period,
    result: JSON.stringify(a.result),
    preview: JSON.stringify(a.preview),
    createdById,
  };
  return tx.baseline.upsert({ where: { questionId }, create: { questionId, ...data }, update: data });
}

/**
 * Attaches a baseline to a question, or replaces the one it has (organisers of the panel;
 * audited). Returns the stored baseline with its preview.
 * @throws InvalidInputError (422) naming the field, and the CSV row and column.
 * @throws ConflictError (409) when the outcome is recorded.
 */
export async function attachBaseline(actor: Actor, panelId: string, questionId: string, input: BaselineInput): Promise<BaselineView> {
  const access = await authorisePanel(actor, panelId, "manage");
  refuseIfCalibration(await findQuestion(panelId, questionId));
  await refuseIfOutcomeRecorded(questionId);
  const a = await analyseBaseline(input, await launchMarket(actor, panelId, questionId, input));
  const stored = await db.$transaction(async (tx) => {
    const existed = (await tx.baseline.count({ where: { questionId } })) > 0;
    const b = await storeBaseline(tx, questionId, input, a, access.actor.userId);
    await recordAudit(tx, {
      actorId: access.actor.userId,
      panelId,
      action: existed ? "baseline.replaced" : "baseline.attached",
      detail: { questionId, method: a.result.method, horizon: a.horizon, quantity: input.quantity, firstPeriod: a.target.firstPeriod, period: input.period, observations: a.preview.observations, scaleFactor: input.analogue?.scaleFactor ?? 1 },
    });
    return b;
  });
  return toView(stored);
}

/** A question's baseline (organisers and reviewers of the panel). @throws NotFoundError when none. */
export async function getBaseline(actor: Actor, panelId: string, questionId: string): Promise<BaselineView> {
  await authorisePanel(actor, panelId, "read");
  await findQuestion(panelId, questionId);
  const b = await db.baseline.findUnique({ where: { questionId } });
  if (!b) throw new NotFoundError("The question's baseline");
  return toView(b);
}

/** Removes a question's baseline (organisers; audited). @throws ConflictError when the outcome is recorded. */
export async function removeBaseline(actor: Actor, panelId: string, questionId: string): Promise<{ id: string; deleted: true }> {
  const access = await authorisePanel(actor, panelId, "manage");
  await findQuestion(panelId, questionId);
  await refuseIfOutcomeRecorded(questionId);
  const b = await db.baseline.findUnique({ where: { questionId } });
  if (!b) throw new NotFoundError("The question's baseline");
  await db.$transaction(async (tx) => {
    await tx.baseline.delete({ where: { questionId } });
    await recordAudit(tx, { actorId: access.actor.userId, panelId, action: "baseline.removed", detail: { questionId } });
  });
  return { id: b.id, deleted: true };
}
