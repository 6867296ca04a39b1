/**
 * Closing a round: the conditional status change open → closed, the round statistics of every
 * question, and the audit event, all in one transaction. Used by the organiser's "close" and
 * by {@link settleDeadlines}, which lib/panels/access.ts calls on every way into a panel, so that a
 * round whose deadline has passed is closed lazily and exactly once (the conditional update
 * `status = 'open'` lets only one caller win).
 */
import { db } from "@/lib/db";
import type { Prisma } from "@/lib/generated/prisma/client";
import { computeQuestionStatistics, type FinalAnswer, type QuestionStatistics } from "./round-statistics";
import { recordAudit } from "./audit";

type Tx = Prisma.TransactionClient;

/**
 * The final answer of each panelist to each question in a round: their highest version.
 * Answers of revoked invitations still count (revoking ends access, it does not unsay answers).
 * With `questionId`, only that question's answers are read (the map has at most that key).
 */
export async function finalAnswers(
  tx: Tx,
  roundId: string,
  questionId?: string,
): Promise<Map<string, (FinalAnswer & { invitationId: string; rationale: string; version: number; createdAt: Date })[]>> {
  const rows = await tx.answer.findMany({
    where: questionId === undefined ? { roundId } : { roundId, questionId },
    orderBy: [{ version: "desc" }],
    include: { invitation: { select: { pseudonym: true } } },
  });
  const seen = new Set<string>();
  const byQuestion = new Map<string, (FinalAnswer & { invitationId: string; rationale: string; version: number; createdAt: Date })[]>();
  for (const a of rows) {
    const key = `${a.questionId}\u0000${a.invitationId}`;
    if (seen.has(key)) continue;
    seen.add(key);
    const list = byQuestion.get(a.questionId) ?? [];
    list.push({
      invitationId: a.invitationId,
      pseudonym: a.invitation.pseudonym,
      value: a.value,
      low: a.low,
      high: a.high,
      rationale: a.rationale,
      version: a.version,
      createdAt: a.createdAt,
    });
    byQuestion.set(a.questionId, list);
  }
  for (const list of byQuestion.values()) list.sort((a, b) => a.pseudonym.localeCompare(b.pseudonym));
  return byQuestion;
}

/**
 * Closes an open round inside `tx` and stores its statistics. Returns false (and changes
 * nothing) when the round was no longer open — someone else closed it first.
 */
export async function closeRoundInTx(
  tx: Tx,
  round: { id: string; panelId: string; number: number },
  closedBy: { actorId: string | null; reason: "organiser" | "deadline"; closedAt: Date },
): Promise<boolean> {
  const { count } = await tx.round.updateMany({
    where: { id: round.id, status: "open" },
    data: { status: "closed", closedAt: closedBy.closedAt },
  });
  if (count !== 1) return false;
  const questions = await tx.question.findMany({ where: { panelId: round.panelId }, orderBy: { position: "asc" } });
  const answers = await finalAnswers(tx, round.id);
  for (const q of questions) {
    const stats: QuestionStatistics = computeQuestionStatistics(q, round.number, answers.get(q.id) ?? []);
    await tx.roundStatistic.upsert({
      where: { roundId_questionId: { roundId: round.id, questionId: q.id } },
      create: { roundId: round.id, questionId: q.id, data: JSON.stringify(stats) },
      update: { data: JSON.stringify(stats), computedAt: new Date() },
    });
  }
  await recordAudit(tx, {
    actorId: closedBy.actorId,
    panelId: round.panelId,
    action: "round.closed",
    detail: { round: round.number, by: closedBy.reason },
  });
  return true;
}

/**
 * Closes every open round whose deadline has passed (closedAt = the deadline) of one panel (its
 * id) or of the panels `panels` matches. Cheap when there is nothing to do (one indexed query). Called only by
 * lib/panels/access.ts, the way into every panel's state.
 */
export async function settleDeadlines(panels: string | Prisma.PanelWhereInput, now: Date = new Date()): Promise<void> {
  const which = typeof panels === "string" ? { panelId: panels } : { panel: panels };
  const due = await db.round.findMany({ where: { ...which, status: "open", deadline: { lte: now } } });
  for (const round of due) {
    await db.$transaction((tx) => closeRoundInTx(tx, round, { actorId: null, reason: "deadline", closedAt: round.deadline ?? now }));
  }
}
