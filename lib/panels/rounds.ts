/**
 * Rounds: draft → open (optional deadline) → closed → next round … → panel finished; live
 * progress of the open round; round statistics; the convergence view with the stopping-rule
 * verdicts; revealing who is behind each pseudonym (an audited action).
 */
import { db } from "@/lib/db";
import { ConflictError, InvalidInputError, NotFoundError } from "@/lib/errors";
import type { Actor } from "@/lib/accounts/actor";
import type { Round } from "@/lib/generated/prisma/client";
import type { NextRoundInput, RoundOpen } from "@/lib/validation/inputs";
import {
  consensusApplies,
  type QuestionRoundFigures,
  type StoppingEvaluation,
} from "@/lib/stats/stopping-rules";
import { authorisePanel } from "./access";
import { runJob } from "@/lib/work/pool";
import { recordAudit } from "./audit";
import { closeRoundInTx, finalAnswers } from "./round-closing";
import { closedRound, type ClosedRound } from "./closed-rounds";
import { panelRules, roundView, type PanelRules, type RoundView } from "./panels";
import type { QuestionStatistics } from "./round-statistics";

async function findRound(panelId: string, roundNumber: number): Promise<Round> {
  const round = await db.round.findUnique({ where: { panelId_number: { panelId, number: roundNumber } } });
  if (!round) throw new NotFoundError(`Round ${roundNumber}`);
  return round;
}

function parseDeadline(deadline: string | undefined, now: Date): Date | null {
  if (deadline === undefined) return null;
  const d = new Date(deadline);
  if (!(d.getTime() > now.getTime())) throw new InvalidInputError([{ field: "deadline", message: "the deadline must be in the future" }]);
  return d;
}

/** The panel's rounds in order (organisers and reviewers). */
export async function listRounds(actor: Actor, panelId: string): Promise<RoundView[]> {
  await authorisePanel(actor, panelId, "read");
  const rounds = await db.round.findMany({ where: { panelId }, orderBy: { number: "asc" } });
  return rounds.map(roundView);
}

/**
 * Opens a draft round (with an optional deadline in the future). Round 1 also moves the panel
 * from draft to running. @throws ConflictError when the round is not a draft, the panel is
 * finished or has no questions, or another round is open.
 */
export async function openRound(actor: Actor, panelId: string, roundNumber: number, input: RoundOpen): Promise<RoundView> {
  const access = await authorisePanel(actor, panelId, "manage");
  const now = new Date();
  const deadline = parseDeadline(input.deadline, now);
  const round = await findRound(panelId, roundNumber);
  if (access.panel.status === "finished") throw new ConflictError("panel-finished", "The panel is finished.");
  if (round.status !== "draft") throw new ConflictError("round-not-draft", `Round ${roundNumber} is already ${round.status}; only a draft round can be opened.`);
  const updated = await db.$transaction(async (tx) => {
    if ((await tx.question.count({ where: { panelId } })) === 0) throw new ConflictError("panel-has-no-questions", "Add at least one question before opening a round.");
    const earlierOpen = await tx.round.count({ where: { panelId, number: { lt: roundNumber }, status: { not: "closed" } } });
    if (earlierOpen > 0) throw new ConflictError("round-still-open", "Close the earlier rounds first.");
    const { count } = await tx.round.updateMany({ where: { id: round.id, status: "draft" }, data: { status: "open", openedAt: now, deadline } });
    if (count !== 1) throw new ConflictError("round-not-draft", `Round ${roundNumber} is no longer a draft.`);
    if (access.panel.status === "draft") await tx.panel.update({ where: { id: panelId }, data: { status: "running" } });
    await recordAudit(tx, {
      actorId: access.actor.userId,
      panelId,
      action: "round.opened",
      detail: { round: roundNumber, deadline: deadline?.toISOString() ?? null },
    });
    return tx.round.findUniqueOrThrow({ where: { id: round.id } });
  });
  return roundView(updated);
}

/**
 * Closes the open round now and computes its statistics.
 * @throws ConflictError when the round is not open (already closed, by hand or by its deadline).
 */
export async function closeRound(actor: Actor, panelId: string, roundNumber: number): Promise<RoundView> {
  const access = await authorisePanel(actor, panelId, "manage");
  const round = await findRound(panelId, roundNumber);
  if (round.status !== "open") throw new ConflictError("round-not-open", `Round ${roundNumber} is ${round.status}, not open.`);
  const closed = await db.$transaction((tx) =>
    closeRoundInTx(tx, round, { actorId: access.actor.userId, reason: "organiser", closedAt: new Date() }),
  );
  if (!closed) throw new ConflictError("round-not-open", `Round ${roundNumber} was closed meanwhile.`);
  return roundView(await db.round.findUniqueOrThrow({ where: { id: round.id } }));
}

/**
 * Creates the next round after the last one closed, as a draft, or opened at once with
 * `open: true`. @throws ConflictError when the last round is not closed, the round limit is
 * reached (raise it on the panel to go on) or the panel is finished.
 */
export async function startNextRound(actor: Actor, panelId: string, input: NextRoundInput): Promise<RoundView> {
  const access = await authorisePanel(actor, panelId, "manage");
  if (access.panel.status === "finished") throw new ConflictError("panel-finished", "The panel is finished.");
  const last = await db.round.findFirst({ where: { panelId }, orderBy: { number: "desc" } });
  if (last && last.status !== "closed") throw new ConflictError("round-still-open", `Round ${last.number} is ${last.status}; close it before starting the next round.`);
  const number = (last?.number ?? 0) + 1;
  if (number > access.panel.roundLimit) {
    throw new ConflictError("round-limit-reached", `The round limit of ${access.panel.roundLimit} is reached; finish the panel or raise the limit.`);
  }
  const now = new Date();
  const deadline = parseDeadline(input.deadline, now);
  const round = await db.$transaction(async (tx) => {
    const created = await tx.round.create({
      data: input.open ? { panelId, number, status: "open", openedAt: now, deadline } : { panelId, number, status: "draft", deadline },
    });
    await recordAudit(tx, { actorId: access.actor.userId, panelId, action: input.open ? "round.opened" : "round.created", detail: { round: number } });
    return created;
  });
  return roundView(round);
}

/** Finishes the panel (no round may be open; an unopened draft round is dropped). */
export async function finishPanel(actor: Actor, panelId: string): Promise<{ id: string; status: "finished" }> {
  const access = await authorisePanel(actor, panelId, "manage");
  if (access.panel.status === "finished") throw new ConflictError("panel-finished", "The panel is already finished.");
  const open = await db.round.findFirst({ where: { panelId, status: "open" } });
  if (open) throw new ConflictError("round-still-open", `Round ${open.number} is open; close it first.`);
  await db.$transaction(async (tx) => {
    await tx.round.deleteMany({ where: { panelId, status: "draft", answers: { none: {} } } });
    await tx.panel.update({ where: { id: panelId }, data: { status: "finished" } });
    await recordAudit(tx, { actorId: access.actor.userId, panelId, action: "panel.finished" });
  });
  return { id: panelId, status: "finished" };
}

export interface ProgressView {
  readonly round: RoundView | null;
  readonly questionCount: number;
  readonly invited: number;
  readonly answeredAll: number;
  readonly answeredSome: number;
  /**
   * One row per invitation, revoked ones included and not marked, by pseudonym (names only
   * through revealIdentities): a row that vanished or was marked on revocation would name it.
   */
  readonly panelists: readonly { readonly pseudonym: string; readonly questionsAnswered: number; readonly lastAnswerAt: string | null }[];
}

/**
 * Who has answered the open round (or the latest round when none is open), under pseudonyms,
 * and the counts. Pages poll this. Organisers of the panel only.
 */
export async function getProgress(actor: Actor, panelId: string): Promise<ProgressView> {
  await authorisePanel(actor, panelId, "manage");
  const [rounds, questionCount, invitations] = await Promise.all([
    db.round.findMany({ where: { panelId }, orderBy: { number: "desc" } }),
    db.question.count({ where: { panelId } }),
    db.invitation.findMany({ where: { panelId }, orderBy: { pseudonym: "asc" } }),
  ]);
  const round = rounds.find((r) => r.status === "open") ?? rounds.find((r) => r.status === "closed") ?? rounds[0] ?? null;
  const answers = round
    ? await db.answer.groupBy({ by: ["invitationId", "questionId"], where: { roundId: round.id }, _max: { createdAt: true } })
    : [];
  // Grouped once by invitation (filtering all answers per panelist grew with panelists × answers).
  const byInvitation = new Map<string, typeof answers>();
  for (const a of answers) {
    const list = byInvitation.get(a.invitationId);
    if (list) list.push(a);
    else byInvitation.set(a.invitationId, [a]);
  }
  const panelists = invitations.map((inv) => {
    const mine = byInvitation.get(inv.id) ?? [];
    const last = mine.reduce<Date | null>((m, a) => (a._max.createdAt && (!m || a._max.createdAt > m) ? a._max.createdAt : m), null);
    return { pseudonym: inv.pseudonym, questionsAnswered: mine.length, lastAnswerAt: last?.toISOString() ?? null };
  });
  return {
    round: round ? roundView(round) : null,
    questionCount,
    invited: invitations.length,
    answeredAll: panelists.filter((p) => questionCount > 0 && p.questionsAnswered === questionCount).length,
    answeredSome: panelists.filter((p) => p.questionsAnswered > 0).length,
    panelists,
  };
}

export interface IdentityView {
  readonly pseudonym: string;
  readonly name: string;
  readonly email: string;
  readonly group: string;
}

/**
 * Reveals who is behind each pseudonym of the panel. Organisers of the panel only; every call
 * is written to the audit log with its reason.
 */
export async function revealIdentities(actor: Actor, panelId: string, input: { reason: string }): Promise<IdentityView[]> {
  const access = await authorisePanel(actor, panelId, "manage");
  const invitations = await db.invitation.findMany({ where: { panelId }, include: { rosterMember: true }, orderBy: { pseudonym: "asc" } });
  await db.$transaction((tx) =>
    recordAudit(tx, { actorId: access.actor.userId, panelId, action: "identities.revealed", detail: { reason: input.reason, count: invitations.length } }),
  );
  return invitations.map((i) => ({ pseudonym: i.pseudonym, name: i.rosterMember.name, email: i.rosterMember.email, group: i.rosterMember.group }));
}

export interface QuestionStatisticsView extends QuestionStatistics {
  readonly text: string;
  readonly unit: string;
}

/**
 * The stored statistics of a closed round, per question (organisers and reviewers).
 * @throws ConflictError when the round is not closed yet.
 */
export async function getRoundStatistics(
  actor: Actor,
  panelId: string,
  roundNumber: number,
): Promise<{ round: RoundView; questions: QuestionStatisticsView[] }> {
  await authorisePanel(actor, panelId, "read");
  const round = await findRound(panelId, roundNumber);
  if (round.status !== "closed") throw new ConflictError("round-not-closed", `Round ${roundNumber} is ${round.status}; statistics are computed when it closes.`);
  const { statistics } = await closedRound(round);
  const questions = await db.question.findMany({ where: { panelId }, orderBy: { position: "asc" }, select: { id: true, text: true, unit: true } });
  return {
    round: roundView(round),
    questions: questions.flatMap((q) => {
      const s = statistics.get(q.id);
      return s ? [{ ...s, text: q.text, unit: q.unit }] : [];
    }),
  };
}

export interface RoundAnswerView {
  readonly pseudonym: string;
  readonly value: number;
  readonly low: number | null;
  readonly high: number | null;
  readonly rationale: string;
  readonly version: number;
  readonly answeredAt: string;
}

/** The final answers of a round per question, under pseudonyms (organisers of the panel). */
export async function getRoundAnswers(
  actor: Actor,
  panelId: string,
  roundNumber: number,
): Promise<{ round: RoundView; questions: { questionId: string; answers: RoundAnswerView[] }[] }> {
  await authorisePanel(actor, panelId, "manage");
  const round = await findRound(panelId, roundNumber);
  const questions = await db.question.findMany({ where: { panelId }, orderBy: { position: "asc" } });
  const answers = await finalAnswers(db, round.id);
  return {
    round: roundView(round),
    questions: questions.map((q) => ({
      questionId: q.id,
      answers: (answers.get(q.id) ?? []).map((a) => ({
        pseudonym: a.pseudonym,
        value: a.value,
        low: a.low,
        high: a.high,
        rationale: a.rationale,
        version: a.version,
        answeredAt: a.createdAt.toISOString(),
      })),
    })),
  };
}

export interface ConvergencePoint {
  readonly round: number;
  readonly n: number;
  readonly median: number | null;
  readonly q1: number | null;
  readonly q3: number | null;
  readonly iqr: number | null;
  readonly relativeIqr: number | null;
  readonly cv: number | null;
  readonly total: number | null;
}

export interface ConvergenceView {
  readonly rules: PanelRules;
  readonly questions: readonly {
    readonly questionId: string;
    readonly text: string;
    readonly unit: string;
    readonly aggregation: "shared" | "sum-of-parts";
    readonly rounds: readonly ConvergencePoint[];
  }[];
  /** Stopping-rule verdicts after the latest closed round (null before round 1 closes). */
  readonly evaluation: StoppingEvaluation | null;
}

/** A round's figures for the stopping rules; CV and relative IQR only where consensus applies. */
function figuresOf(s: QuestionStatistics, answers?: ReadonlyMap<string, readonly { value: number }[]>): QuestionRoundFigures {
  const consensus = consensusApplies(s.aggregation);
  return {
    questionId: s.questionId,
    aggregation: s.aggregation,
    n: s.n,
    median: s.values?.median ?? null,
    iqr: s.values?.iqr ?? null,
    relativeIqr: consensus ? (s.values?.relativeIqr ?? null) : null,
    cv: consensus ? (s.values?.cv ?? null) : null,
    total: s.sumOfParts?.total ?? null,
    values: answers ? (answers.get(s.questionId) ?? []).map((a) => a.value) : null,
  };
}

/**
 * Median, quartiles, relative IQR and CV (and the total, for sum-of-parts questions) of every
 * closed round, and the stopping-rule verdicts after the latest one (organisers and reviewers).
 */
export async function getConvergence(actor: Actor, panelId: string): Promise<ConvergenceView> {
  const access = await authorisePanel(actor, panelId, "read");
  const panel = await db.panel.findUniqueOrThrow({ where: { id: panelId } });
  const questions = await db.question.findMany({ where: { panelId }, orderBy: { position: "asc" } });
  const rounds = await db.round.findMany({ where: { panelId, status: "closed" }, orderBy: { number: "asc" } });
  // Each closed round's statistics and final answers are read and parsed once and kept (issue 13).
  const closed = new Map<string, ClosedRound>();
  for (const r of rounds) closed.set(r.id, await closedRound(r));
  const byQuestion = new Map(rounds.map((r) => [r.id, closed.get(r.id)!.statistics]));
  const statsOf = (r: (typeof rounds)[number]) => [...closed.get(r.id)!.statistics.values()];
  const rules = panelRules(panel);
  const last = rounds.at(-1);
  const previous = rounds.at(-2);
  // The stability rule compares the distributions of the answers, so it needs the answers themselves.
  const lastAnswers = last ? closed.get(last.id)!.answers : null;
  const previousAnswers = previous ? closed.get(previous.id)!.answers : null;
  // On the worker pool: the stability rule sorts every question's answers of two rounds (issue 13).
  const evaluation = last
    ? await runJob("stoppingRules", {
        roundNumber: last.number,
        current: statsOf(last).map((x) => figuresOf(x, lastAnswers!)),
        previous: previous ? statsOf(previous).map((x) => figuresOf(x, previousAnswers!)) : null,
        config: rules,
      })
    : null;
  void access;
  return {
    rules,
    questions: questions.map((q) => ({
      questionId: q.id,
      text: q.text,
      unit: q.unit,
      aggregation: q.aggregation === "sum-of-parts" ? "sum-of-parts" : "shared",
      rounds: rounds.flatMap((r) => {
        const s = byQuestion.get(r.id)!.get(q.id);
        if (!s) return [];
        const f = figuresOf(s);
        return [{ round: r.number, n: s.n, median: f.median, q1: s.values?.q1 ?? null, q3: s.values?.q3 ?? null, iqr: f.iqr, relativeIqr: f.relativeIqr, cv: f.cv, total: f.total }];
      }),
    })),
    evaluation,
  };
}
