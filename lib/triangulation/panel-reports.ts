/**
 * The reports of several questions of one panel (the reviewer's report page), computed one
 * after another with shared reads (lib/panels/panel-reads.ts), giving the event loop a turn
 * before each (lib/work/turn.ts): the SQLite driver answers synchronously, so a panel's reports
 * computed at once held every panelist's answer back until the last was done (issue 13: 15 s at
 * 300 panelists × 30 questions); now an answer waits for one question's report at most.
 * The figures are those of getQuestionReport, question by question, in the order asked.
 */
import type { Actor } from "@/lib/accounts/actor";
import { nextTurn } from "@/lib/work/turn";
import { panelReads } from "../panels/panel-reads";
import { db } from "@/lib/db";
import { fileSlug } from "@/lib/csv/file-name";
import { authorisePanel } from "../panels/access";
import { getQuestionReport, panelReportCsv, type QuestionReport } from "./report";
import { loadTriangulation } from "./triangulation";
import { runJob } from "@/lib/work/pool";
import { jsonSafe, type JsonSafe } from "../panels/json";
import type { BlendInterval } from "@/lib/blend";

export async function getPanelReports(actor: Actor, panelId: string, questionIds: readonly string[]): Promise<QuestionReport[]> {
  const reads = panelReads({ wholeRounds: true });
  const reports: QuestionReport[] = [];
  for (const questionId of questionIds) {
    await nextTurn();
    reports.push(await getQuestionReport(actor, panelId, questionId, reads));
  }
  return reports;
}

/** A line of the panel's report table: what the report page shows of each question's report. */
export interface PanelReportRow {
  readonly questionId: string;
  /** The blend figure and its intervals, as the question's report has them (`QuestionReport.blend`); null without a blend. */
  readonly blend: { readonly figure: JsonSafe<number>; readonly intervals: readonly JsonSafe<BlendInterval>[] } | null;
  /** The recorded outcome, or null. */
  readonly outcome: number | null;
  readonly hasBaseline: boolean;
}

/**
 * The report page's table (organisers and reviewers of the panel): each question's blend figure
 * and intervals (the same computation as its report, lib/triangulation/report.ts), its outcome and
 * whether a baseline is attached, without building every question's whole report. The inputs are
 * read here with shared reads, a turn for other requests before each question; the figures are
 * computed on the worker pool, so a panelist's answer waits for neither (issue 13).
 */
export async function getPanelReportRows(actor: Actor, panelId: string, questionIds: readonly string[]): Promise<PanelReportRow[]> {
  await authorisePanel(actor, panelId, "read");
  const reads = panelReads({ wholeRounds: true });
  // One question at a time, so that only one question's inputs (every answer of every closed round) are held at once.
  const blends: Awaited<ReturnType<typeof runJob<"blends">>> = [];
  for (const questionId of questionIds) {
    await nextTurn();
    const { input } = await loadTriangulation(panelId, questionId, reads);
    blends.push((await runJob("blends", [input]))[0]);
  }
  const outcomes = new Map((await db.resolution.findMany({ where: { questionId: { in: [...questionIds] } }, select: { questionId: true, actual: true } })).map((r) => [r.questionId, r.actual]));
  const baselines = new Set((await db.baseline.findMany({ where: { questionId: { in: [...questionIds] } }, select: { questionId: true } })).map((b) => b.questionId));
  return questionIds.map((questionId, i) => {
    const b = blends[i];
    return {
      questionId,
      blend: b ? { figure: jsonSafe(b.figure), intervals: jsonSafe(b.intervals) as JsonSafe<BlendInterval>[] } : null,
      outcome: outcomes.get(questionId) ?? null,
      hasBaseline: baselines.has(questionId),
    };
  });
}

/** Every question's report of a panel as one CSV, named after the panel's title (organisers and reviewers of the panel). */
export async function getPanelReportCsv(actor: Actor, panelId: string): Promise<{ filename: string; csv: string }> {
  const access = await authorisePanel(actor, panelId, "read");
  const questions = await db.question.findMany({ where: { panelId }, orderBy: { position: "asc" }, select: { id: true } });
  const reports = await getPanelReports(
    actor,
    panelId,
    questions.map((q) => q.id),
  );
  return { filename: `${fileSlug(access.panel.title, 60, "panel")}-report.csv`, csv: panelReportCsv(reports) };
}
