/**
 * The report of one question (docs/methods.md §14.8), a read model for the reviewer report
 * page and the JSON/CSV exports: the blended figure and range first; the three legs side by
 * side (panel raw and corrected with ranges, baseline with method and interval, track-record
 * summary); convergence across rounds; departures; the bias correction applied per panelist;
 * the outcome when one is recorded; method notes, inputs and cautions.
 *
 * Panelists appear under their pseudonyms. Names, and every per-person figure drawn from a
 * panelist's history across panels (track record, bias factor, corrected answer), are added only
 * for an organiser of the panel who has revealed the identities (an audited action,
 * lib/panels/rounds.ts `revealIdentities`); until then the correction is shown as the panel's
 * aggregate (lib/triangulation/report-views.ts).
 *
 * CSV export: one row per figure (section, item, measure, value, unit). Any cell that a
 * spreadsheet could run as a formula — one starting with =, +, -, @, a tab or a carriage
 * return — gets a leading apostrophe (the OWASP "CSV injection" advice), except a cell that is
 * exactly a decimal number such as -12.5, which a spreadsheet reads as a number, not a formula.
 */
import { db } from "@/lib/db";
import type { Actor } from "@/lib/accounts/actor";
import { trackRecord, type TrackRecord } from "@/lib/blend";
import type { BaselineResult } from "@/lib/forecast/baseline";
import { authorisePanel, type PanelRole } from "../panels/access";
import type { BaselinePreview } from "./baselines";
import type { ConvergencePoint } from "../panels/rounds";
import { outcomeView, type OutcomeView } from "./outcome";
import { runJob } from "@/lib/work/pool";
import { loadTriangulation, type CorrectedAnswer, type DepartureReport, type LoadedTriangulation, type TriangulationInput } from "./triangulation";
import { panelReads, type PanelReads } from "../panels/panel-reads";
import { jsonSafe, type JsonSafe } from "../panels/json";
import { correctionSummary, namesRevealed } from "./report-views";
import type { BlendInterval, Distribution } from "@/lib/blend";
import { consensusApplies, type QuestionVerdict } from "@/lib/stats/stopping-rules";
import { csvCell } from "@/lib/csv/cell";
import { fileSlug } from "@/lib/csv/file-name";
import { roundAsShown } from "@/lib/ui/format";
import { legWarnings } from "./warnings";
import { reportSummary } from "./report-summary";
import { loadCalibration, type CalibrationReport, type TargetPools } from "./calibration";

type Intervals = readonly { readonly level: number; readonly lower: number | null; readonly upper: number | null }[];

export interface ReportPanelist {
  readonly pseudonym: string;
  /** Only for an organiser who revealed identities; otherwise null. */
  readonly name: string | null;
}

export interface QuestionReport {
  readonly generatedAt: string;
  /** The sentence the report leads with: figure, 80% range, outcome, main disagreement (lib/triangulation/report-summary.ts). */
  readonly summary: string;
  readonly panel: { readonly id: string; readonly title: string; readonly status: string };
  readonly question: {
    readonly id: string;
    readonly text: string;
    readonly unit: string;
    readonly targetPeriod: string;
    readonly aggregation: "shared" | "sum-of-parts";
    readonly answerFormat: "single" | "three-point";
    readonly calibration: boolean;
  };
  readonly viewer: { readonly role: PanelRole; readonly namesShown: boolean };
  /** The blended figure and range (null without a baseline or without a panel figure). */
  readonly blend: {
    readonly figure: number | null;
    readonly median: number | null;
    readonly mean: number | null;
    readonly intervals: Intervals;
    readonly panelWeight: number | null;
    readonly baselineWeight: number | null;
    readonly ruleRequested: string;
    readonly ruleApplied: string;
    readonly ruleFrom: "question" | "panel";
    readonly reason: string;
    readonly outcomesBehindWeight: number | null;
    readonly msePanel: number | null;
    readonly mseBaseline: number | null;
    /** How the blend's range was made (lib/triangulation/triangulation.ts). */
    readonly rangeHow: string;
  } | null;
  readonly legs: {
    readonly panel: {
      readonly round: number;
      readonly n: number;
      readonly rule: string;
      readonly raw: { readonly figure: number | null; readonly intervals: Intervals };
      readonly corrected: { readonly figure: number | null; readonly intervals: Intervals };
      /** How the panel's range was made: track record with its prior, or the three-point pool. */
      readonly rangeHow: string;
    } | null;
    readonly baseline: {
      readonly method: string;
      readonly requestedMethod: string;
      readonly parameters: Readonly<Record<string, number | null>>;
      readonly season: number;
      readonly horizon: number;
      readonly target: { readonly mean: number | null; readonly lower80: number | null; readonly upper80: number | null; readonly lower95: number | null; readonly upper95: number | null; readonly label: string };
      readonly sd: number | null;
      readonly sdSource: string | null;
      readonly holdout: { readonly chosenMase: number | null; readonly candidates: readonly { readonly method: string; readonly mase: number | null; readonly error?: string }[] };
      readonly insample: Readonly<Record<string, number | null>>;
      readonly source: string;
      readonly observations: number;
      readonly analogue: { readonly scaleFactor: number; readonly note: string } | null;
      readonly notes: readonly string[];
      /** How the baseline's range was made: the fitted model's own prediction interval. */
      readonly rangeHow: string;
    } | null;
    readonly trackRecord: {
      readonly panelistsWithRecord: number;
      /** Mean bias factor applied to the final answers (1 for a panelist without a record). */
      readonly meanFactor: number | null;
      /** Per person: only when names are shown (`viewer.namesShown`); otherwise empty. */
      readonly panelists: readonly (ReportPanelist & JsonSafe<Omit<TrackRecord, "bias" | "intervalHitRate">> & {
        readonly biasFactor: number | null;
        readonly unshrunkFactor: number | null;
        readonly credibility: number | null;
        readonly intervalHits: number;
        readonly intervalCount: number;
        readonly intervalHitRate: number | null;
      })[];
    };
  };
  readonly convergence: {
    readonly rounds: readonly ConvergencePoint[];
    readonly verdict: JsonSafe<QuestionVerdict> | null;
    readonly recommendation: "stop" | "another-round" | null;
    readonly reasons: readonly string[];
  };
  readonly departures: JsonSafe<DepartureReport> | null;
  /** Per person: only when names are shown (`viewer.namesShown`); otherwise empty. */
  readonly biasCorrection: readonly (ReportPanelist & JsonSafe<Omit<CorrectedAnswer, "invitationId" | "pseudonym">>)[];
  readonly outcome: OutcomeView | null;
  /**
   * How the blended figure moved since the previous closed round: the blend computed from the
   * same stored inputs (baseline, weight rule, track records) with the panel's answers up to the
   * closed round before the latest one, and the change to today's figure. Null without a blend
   * now, or with fewer than two closed rounds with answers.
   */
  readonly movement: { readonly fromRound: number; readonly toRound: number; readonly previousFigure: number; readonly change: number } | null;
  /** Cooke's classical model on the panel's calibration questions (lib/triangulation/calibration.ts); null on a panel without them. */
  readonly performanceWeights:
    | (Omit<JsonSafe<CalibrationReport>, "targets"> & { readonly panelLeg: "equal" | "performance"; readonly thisQuestion: JsonSafe<TargetPools> | null })
    | null;
  /** The distributions behind the ranges, for charts. */
  readonly distributions: { readonly panelRaw: Distribution | null; readonly panelCorrected: Distribution | null; readonly baseline: Distribution | null; readonly blend: Distribution | null };
  readonly methodNotes: readonly string[];
  readonly inputs: readonly string[];
  /** Also at the head of `cautions` (lib/triangulation/warnings.ts). */
  readonly warnings: readonly string[];
  readonly cautions: readonly string[];
}

const safeIntervals = (iv: readonly BlendInterval[]): Intervals => jsonSafe(iv) as Intervals;

/** The inputs up to the previous closed round with answers, for the blend's move since then (`QuestionReport.movement`); null without one. */
function earlierInput(input: TriangulationInput): { input: TriangulationInput; fromRound: number; toRound: number } | null {
  const rounds = [...input.rounds];
  const latest = rounds.pop();
  while (rounds.length > 0 && rounds.at(-1)!.answers.length === 0) rounds.pop();
  const previous = rounds.at(-1);
  if (!latest || !previous) return null;
  return { input: { ...input, rounds }, fromRound: previous.round, toRound: latest.round };
}

/** The blend's move since the previous closed round (see `QuestionReport.movement`). */
function blendMovement(earlier: ReturnType<typeof earlierInput>, now: number | null, before: number | null): QuestionReport["movement"] {
  if (now === null || !Number.isFinite(now) || !earlier) return null;
  if (before === null || !Number.isFinite(before)) return null;
  return { fromRound: earlier.fromRound, toRound: earlier.toRound, previousFigure: before, change: now - before };
}

/**
 * The report of one question (organisers and reviewers of the panel). Computed on read from the
 * stored answers, baseline, outcomes and rules (see lib/triangulation/triangulation.ts). A page that
 * shows several questions passes one `reads` (lib/panels/panel-reads.ts) to them all.
 */
export async function getQuestionReport(actor: Actor, panelId: string, questionId: string, reads: PanelReads = panelReads()): Promise<QuestionReport> {
  return (await getQuestionReportWithRule(actor, panelId, questionId, reads)).report;
}

/**
 * {@link getQuestionReport} with the blend weight rule the question follows now, as stored (the
 * organiser's question page shows the report and sets the rule: the triangulation is loaded and
 * computed once for both).
 */
export async function getQuestionReportWithRule(
  actor: Actor,
  panelId: string,
  questionId: string,
  reads: PanelReads = panelReads(),
): Promise<{ report: QuestionReport; weightRule: LoadedTriangulation["rule"] }> {
  const access = await authorisePanel(actor, panelId, "read");
  const loaded = await loadTriangulation(panelId, questionId, reads);
  // On the worker pool: a panelist's answer need not wait for the figures (issue 13).
  const earlier = earlierInput(loaded.input);
  const { now: t, before } = await runJob("triangulationWithEarlier", { input: loaded.input, earlier: earlier?.input ?? null });
  const namesShown = await namesRevealed(actor, panelId, access.canManage);
  const names = new Map((await reads.invitations(panelId)).map((i) => [i.id, i.name]));
  const nameOf = (invitationId: string) => (namesShown ? (names.get(invitationId) ?? null) : null);
  const stored = await db.baseline.findUnique({ where: { questionId } });
  const outcomeRow = await db.resolution.findUnique({ where: { questionId } });
  const convergence = await reads.convergence(actor, panelId);
  const cq = convergence.questions.find((q) => q.questionId === questionId);
  const verdict = convergence.evaluation?.questions.find((v) => v.questionId === questionId) ?? null;
  const records = await reads.trackRecords(loaded.ownerId, { excludeQuestionId: questionId, ...(loaded.recordedAt ? { before: loaded.recordedAt } : {}) });

  const panelists = t.panel?.answers ?? [];
  const trackPanelists = panelists.map((a) => {
    const rec = records.get(loaded.members.get(a.invitationId) ?? "")?.record ?? trackRecord([]);
    const { bias, intervalHitRate, ...rest } = rec;
    return {
      pseudonym: a.pseudonym,
      name: nameOf(a.invitationId),
      ...jsonSafe(rest),
      biasFactor: jsonSafe(bias.factor),
      unshrunkFactor: jsonSafe(bias.raw),
      credibility: jsonSafe(bias.credibility),
      intervalHits: intervalHitRate.hits,
      intervalCount: intervalHitRate.count,
      intervalHitRate: jsonSafe(intervalHitRate.rate),
    };
  });

  let baselineLeg: QuestionReport["legs"]["baseline"] = null;
  const inputs: string[] = [];
  if (stored) {
    const result = JSON.parse(stored.result) as BaselineResult;
    const preview = JSON.parse(stored.preview) as BaselinePreview;
    const chosen = result.candidates?.find((c) => c.method === result.method);
    baselineLeg = {
      method: result.method,
      requestedMethod: stored.method,
      parameters: result.parameters,
      season: result.season,
      horizon: stored.horizon,
      target: {
        mean: loaded.baselineTarget?.mean ?? null,
        lower80: loaded.baselineTarget?.lower80 ?? null,
        upper80: loaded.baselineTarget?.upper80 ?? null,
        lower95: loaded.baselineTarget?.lower95 ?? null,
        upper95: loaded.baselineTarget?.upper95 ?? null,
        label: loaded.baselineTarget?.label ?? "",
      },
      sd: t.baseline ? jsonSafe(t.baseline.sd) : null,
      sdSource: t.baseline?.sdSource ?? null,
      holdout: { chosenMase: chosen?.mase ?? null, candidates: result.candidates ?? [] },
      insample: { ...result.accuracy.insample },
      source: stored.source,
      observations: preview.observations,
      analogue: stored.analogue ? { scaleFactor: stored.scaleFactor, note: stored.scaleNote } : null,
      notes: result.notes,
      rangeHow:
        `Baseline range: the fitted ${result.method} model's own prediction interval for the ${loaded.baselineTarget?.label || "target"}` +
        `${loaded.baselineTarget?.how ? ` (${loaded.baselineTarget.how})` : ""}, from the model's error variance on this history; the uncertainty of choosing the model is not in it.` +
        (t.baseline ? ` The blend reads it as a normal with sd ${t.baseline.sd.toPrecision(4)} implied by its ${t.baseline.sdSource}.` : ""),
    };
    const first = preview.rows[0]?.row;
    const last = preview.rows.at(-1)?.row;
    inputs.push(
      `Baseline: ${stored.source === "csv" ? `CSV column '${stored.valueColumn}'` : "pasted values"}, ${preview.observations} observations${first !== undefined ? ` (rows ${first}–${last})` : ""}${preview.explanatoryColumns.length > 0 ? `, explanatory columns ${preview.explanatoryColumns.join(", ")}` : ""}; season ${stored.season}; method ${stored.method === "auto" ? `chosen automatically: ${result.method}` : result.method}; the baseline answers the ${loaded.baselineTarget?.label ?? ""}${loaded.baselineTarget?.how ? ` (${loaded.baselineTarget.how})` : ""}; the question's target period: ${loaded.question.targetPeriod}.`,
    );
    if (stored.analogue) inputs.push(`The baseline history is an analogous product's, multiplied by ${stored.scaleFactor}: ${stored.scaleNote}`);
  } else {
    inputs.push("No baseline is attached.");
  }
  if (t.panel) inputs.push(`Panel: ${t.panel.n} final answers of round ${t.panel.round} (the last closed round with answers).`);
  const correction = correctionSummary(panelists);
  const withRecord = correction.panelistsWithRecord;
  const outcomesBehind = Math.max(0, ...trackPanelists.map((p) => p.count ?? 0));
  inputs.push(
    `Track records: the organiser's questions with a recorded outcome${loaded.recordedAt ? ", recorded before this one's" : ""}, this question excluded; ${withRecord} of ${trackPanelists.length} panelists have one (up to ${outcomesBehind} answers with an outcome each).`,
  );
  inputs.push(`Weight rule: ${loaded.rule.rule}${loaded.rule.rule === "organiser" ? ` (${loaded.rule.panelWeight} on the panel)` : ""}, set on the ${loaded.rule.from}.`);

  const warnings = legWarnings(loaded.question, loaded.baselineTarget, t.panel?.corrected.figure ?? null);
  const cautions = [...warnings, ...t.cautions];
  if (t.weights && t.weights.applied !== t.weights.requested) cautions.push(t.weights.reason);
  if (t.panel && t.panel.n < 5) cautions.push(`Only ${t.panel.n} panelists answered: the panel's median and range rest on very few people.`);
  if (outcomeRow) cautions.push("This question's outcome is recorded: the figures above are recomputed from the stored inputs; the scores use the figures as they stood when the outcome was recorded.");

  const c = await loadCalibration(panelId, reads);
  let calibration: QuestionReport["performanceWeights"] = null;
  if (c.report.calibrationQuestions > 0) {
    const { targets, ...rest } = jsonSafe(c.report);
    calibration = { ...rest, panelLeg: loaded.panelLeg, thisQuestion: targets.find((x) => x.questionId === questionId) ?? null };
  }

  const w = t.weights;
  const report: Omit<QuestionReport, "summary"> = {
    generatedAt: new Date().toISOString(),
    panel: { id: access.panel.id, title: access.panel.title, status: access.panel.status },
    question: loaded.question,
    viewer: { role: access.role, namesShown },
    blend:
      t.blend && w
        ? {
            figure: jsonSafe(t.blend.figure),
            median: jsonSafe(t.blend.median),
            mean: jsonSafe(t.blend.mean),
            intervals: safeIntervals(t.blend.intervals),
            panelWeight: w.panel,
            baselineWeight: w.baseline,
            ruleRequested: w.requested,
            ruleApplied: w.applied,
            ruleFrom: loaded.rule.from,
            reason: w.reason,
            outcomesBehindWeight: w.nOutcomes,
            msePanel: jsonSafe(w.msePanel),
            mseBaseline: jsonSafe(w.mseBaseline),
            rangeHow: t.blendRangeHow ?? "",
          }
        : null,
    legs: {
      panel: t.panel
        ? {
            round: t.panel.round,
            n: t.panel.n,
            rule: t.panel.rule,
            raw: { figure: jsonSafe(t.panel.raw.figure), intervals: safeIntervals(t.panel.raw.intervals) },
            corrected: { figure: jsonSafe(t.panel.corrected.figure), intervals: safeIntervals(t.panel.corrected.intervals) },
            rangeHow: t.panel.rangeHow,
          }
        : null,
      baseline: baselineLeg,
      trackRecord: { panelistsWithRecord: withRecord, meanFactor: jsonSafe(correction.meanFactor), panelists: namesShown ? trackPanelists : [] },
    },
    convergence: {
      rounds: cq?.rounds ?? [],
      verdict: verdict ? jsonSafe(verdict) : null,
      recommendation: convergence.evaluation?.recommendation ?? null,
      reasons: convergence.evaluation?.reasons ?? [],
    },
    departures: t.departures ? jsonSafe(t.departures) : null,
    biasCorrection: namesShown ? panelists.map(({ invitationId, pseudonym, ...rest }) => ({ pseudonym, name: nameOf(invitationId), ...jsonSafe(rest) })) : [],
    outcome: outcomeRow ? outcomeView(outcomeRow) : null,
    movement: blendMovement(earlier, t.blend?.figure ?? null, before),
    performanceWeights: calibration,
    distributions: {
      panelRaw: t.panel?.raw.distribution ?? null,
      panelCorrected: t.panel?.corrected.distribution ?? null,
      baseline: t.baseline ? { kind: "normal", mean: t.baseline.mean, sd: t.baseline.sd } : null,
      blend: t.blend?.distribution ?? null,
    },
    methodNotes: t.notes,
    inputs,
    warnings,
    cautions,
  };
  const { generatedAt, ...rest } = report;
  return { report: { generatedAt, summary: reportSummary(report), ...rest }, weightRule: loaded.rule };
}

export { csvCell };

type Cell = string | number | boolean | null;

/**
 * The report's CSV rows (section, item, measure, value, unit), without the header. Numbers are
 * rounded as the report page shows them (`roundAsShown`): figures in the question's unit to 4
 * significant digits, ratios, percentages, z and weights to 3, bias factors to 4; counts and
 * round numbers as they are; the outcome value exactly as recorded.
 */
export function reportRows(r: QuestionReport): Cell[][] {
  const rows: Cell[][] = [];
  const unit = r.question.unit;
  const add = (section: string, item: string, measure: string, value: string | number | boolean | null | undefined, u = "", digits = u ? 4 : 3) =>
    rows.push([section, item, measure, typeof value === "number" ? roundAsShown(value, digits) : (value ?? null), u]);
  const exact = (section: string, item: string, measure: string, value: number, u = "") => rows.push([section, item, measure, value, u]);
  add("report", r.panel.title, "panel status", r.panel.status);
  add("report", r.panel.title, "generated at", r.generatedAt);
  add("report", r.panel.title, "summary", r.summary);
  add("question", r.question.text, "unit", r.question.unit);
  add("question", r.question.text, "target period", r.question.targetPeriod);
  add("question", r.question.text, "aggregation", r.question.aggregation);
  add("question", r.question.text, "answer format", r.question.answerFormat);
  if (r.blend) {
    add("blend", "blended figure", "figure", r.blend.figure, unit);
    for (const iv of r.blend.intervals) {
      add("blend", "blended figure", `${iv.level}% lower`, iv.lower, unit);
      add("blend", "blended figure", `${iv.level}% upper`, iv.upper, unit);
    }
    add("blend", "weights", "panel weight", r.blend.panelWeight);
    add("blend", "weights", "baseline weight", r.blend.baselineWeight);
    add("blend", "weights", "rule", r.blend.ruleApplied);
    add("blend", "weights", "reason", r.blend.reason);
    add("blend", "blended figure", "how the range was made", r.blend.rangeHow);
  }
  if (r.legs.panel) {
    for (const [label, leg] of [["raw panel", r.legs.panel.raw], ["corrected panel", r.legs.panel.corrected]] as const) {
      add("panel", label, "figure", leg.figure, unit);
      for (const iv of leg.intervals) {
        add("panel", label, `${iv.level}% lower`, iv.lower, unit);
        add("panel", label, `${iv.level}% upper`, iv.upper, unit);
      }
    }
    add("panel", "corrected panel", "how the range was made", r.legs.panel.rangeHow);
    add("panel", "final round", "round", r.legs.panel.round);
    add("panel", "final round", "answers", r.legs.panel.n);
  }
  if (r.legs.baseline) {
    const b = r.legs.baseline;
    add("baseline", b.method, "forecast", b.target.mean, unit);
    add("baseline", b.method, "80% lower", b.target.lower80, unit);
    add("baseline", b.method, "80% upper", b.target.upper80, unit);
    add("baseline", b.method, "95% lower", b.target.lower95, unit);
    add("baseline", b.method, "95% upper", b.target.upper95, unit);
    add("baseline", b.method, "how the range was made", b.rangeHow);
    add("baseline", b.method, "holdout MASE", b.holdout.chosenMase);
    for (const [k, v] of Object.entries(b.parameters)) add("baseline", b.method, `parameter ${k}`, v);
    if (b.analogue) add("baseline", b.method, "analogue scale factor", b.analogue.scaleFactor);
  }
  add("track record", "panel", "panelists with a track record", r.legs.trackRecord.panelistsWithRecord);
  add("track record", "panel", "mean bias factor applied", r.legs.trackRecord.meanFactor);
  for (const p of r.legs.trackRecord.panelists) {
    const who = p.name ? `${p.pseudonym} (${p.name})` : p.pseudonym;
    add("track record", who, "questions with an outcome", p.count);
    add("track record", who, "mean log ratio", p.meanLogRatio);
    add("track record", who, "MAPE %", p.mape);
    add("track record", who, "bias factor", p.biasFactor, "", 4);
    add("track record", who, "interval hit rate", p.intervalHitRate);
  }
  for (const p of r.biasCorrection) {
    const who = p.name ? `${p.pseudonym} (${p.name})` : p.pseudonym;
    add("bias correction", who, "answer", p.value, unit);
    add("bias correction", who, "factor", p.factor, "", 4);
    add("bias correction", who, "corrected answer", p.correctedValue, unit);
  }
  // As the pages (lib/ui/convergence-view.tsx): the spread between panelists only where consensus applies.
  const spread = consensusApplies(r.question.aggregation);
  for (const c of r.convergence.rounds) {
    if (spread) {
      add("convergence", `round ${c.round}`, "median", c.median, unit);
      add("convergence", `round ${c.round}`, "IQR", c.iqr, unit);
      add("convergence", `round ${c.round}`, "relative IQR", c.relativeIqr);
      add("convergence", `round ${c.round}`, "CV", c.cv);
    } else {
      add("convergence", `round ${c.round}`, "spread (IQR, relative IQR, CV)", "not applicable: sum of parts");
    }
    if (c.total !== null) add("convergence", `round ${c.round}`, "total", c.total, unit);
  }
  if (r.departures) {
    for (const d of r.departures.panel.rounds) {
      add("departure", `panel round ${d.round}`, "difference", d.difference, unit);
      add("departure", `panel round ${d.round}`, "z", d.z);
      add("departure", `panel round ${d.round}`, "percentile", d.percentile);
    }
    for (const d of r.departures.answers) {
      const item = `${d.pseudonym} round ${d.round}`;
      add("departure", item, "difference", d.difference, unit);
      add("departure", item, "percent", d.percent);
      add("departure", item, "z", d.z);
      add("departure", item, "percentile", d.percentile);
      add("departure", item, "outside 80%", d.outside80);
      add("departure", item, "outside 95%", d.outside95);
    }
  }
  if (r.outcome) {
    exact("outcome", "outcome", "value", r.outcome.outcomeValue, unit);
    for (const s of [r.outcome.scores.rawPanel, r.outcome.scores.correctedPanel, r.outcome.scores.baseline, r.outcome.scores.blend, ...r.outcome.scores.panelists]) {
      if (!s) continue;
      add("outcome", s.label, "forecast", s.forecast, unit);
      add("outcome", s.label, "error", s.error, unit);
      add("outcome", s.label, "absolute percent error", s.absolutePercentError);
    }
  }
  const pw = r.performanceWeights;
  if (pw) {
    for (const p of pw.panelists) {
      add("performance weights", p.pseudonym, "calibration questions answered", p.answered);
      add("performance weights", p.pseudonym, "calibration score", p.calibration);
      add("performance weights", p.pseudonym, "information score", p.information);
      add("performance weights", p.pseudonym, "weight", p.weight);
    }
    for (const [label, pool] of [["equal-weight pool", pw.thisQuestion?.equal], ["performance-weighted pool", pw.thisQuestion?.performance]] as const) {
      if (!pool) continue;
      add("performance weights", label, "P5", pool.p5, unit);
      add("performance weights", label, "P50", pool.p50, unit);
      add("performance weights", label, "P95", pool.p95, unit);
    }
    add("performance weights", "out of sample", "verdict", pw.verdict);
  }
  r.methodNotes.forEach((n, i) => add("method notes", String(i + 1), "note", n));
  r.inputs.forEach((n, i) => add("inputs", String(i + 1), "input", n));
  r.cautions.forEach((n, i) => add("cautions", String(i + 1), "caution", n));
  return rows;
}

const csvLines = (rows: readonly (readonly Cell[])[]) => rows.map((row) => row.map(csvCell).join(",")).join("\r\n") + "\r\n";

/** The report as CSV: a header and one row per figure (section, item, measure, value, unit). */
export function reportCsv(r: QuestionReport): string {
  return csvLines([["section", "item", "measure", "value", "unit"], ...reportRows(r)]);
}

/** A panel's question reports as one CSV: the question's number in the panel first, then each report's rows. */
export function panelReportCsv(reports: readonly QuestionReport[]): string {
  return csvLines([["question", "section", "item", "measure", "value", "unit"], ...reports.flatMap((r, i) => reportRows(r).map((row) => [i + 1, ...row]))]);
}

/** The download name of a question's report, without extension: panel title, then question text. */
export const questionReportFileName = (r: Pick<QuestionReport, "panel" | "question">): string => `${fileSlug(r.panel.title, 40, "panel")}-${fileSlug(r.question.text, 40, "question")}`;

/** The report as CSV text with a file name (organisers and reviewers of the panel). */
export async function getQuestionReportCsv(actor: Actor, panelId: string, questionId: string): Promise<{ filename: string; csv: string }> {
  const report = await getQuestionReport(actor, panelId, questionId);
  return { filename: `${questionReportFileName(report)}.csv`, csv: reportCsv(report) };
}
