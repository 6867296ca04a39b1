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
import { panelReads } from "./panel-reads";
import { getQuestionReport, type QuestionReport } from "./report";

export async function getPanelReports(actor: Actor, panelId: string, questionIds: readonly string[]): Promise<QuestionReport[]> {
  const reads = panelReads({ wholeRounds: true });
  const reports: QuestionReport[] = [];
  for (const questionId of questionIds) {
    await nextTurn();
    reports.push(await getQuestionReport(actor, panelId, questionId, reads));
  }
  return reports;
}
