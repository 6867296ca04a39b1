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

export async function getPanelReports(actor: Actor, panelId: string, questionIds: readonly string[]): Promise<QuestionReport[]> {
  const reads = panelReads({ wholeRounds: true });
  const reports: QuestionReport[] = [];
  for (const questionId of questionIds) {
    await nextTurn();
    reports.push(await getQuestionReport(actor, panelId, questionId, reads));
  }
  return reports;
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
