/**
 * The panelist's side: their panel, questions and answers, and submitting an answer.
 *
 * Answers are accepted only while a round is open (its deadline is checked first, lazily).
 * Every change is a new version row (nothing is overwritten), written in one transaction
 * before the answer is acknowledged. An idempotency key (the `Idempotency-Key` header) makes a
 * retried request return the version it stored the first time.
 *
 * From round 2 on, a panelist whose final answer to a shared-quantity question in the previous
 * round lay outside that round's interquartile range (below Q1 or above Q3, type 7) must give a
 * rationale: Delphi feedback asks those outside the IQR to explain (docs/methods.md §14.4).
 * Sum-of-parts answers estimate different parts, so the rule does not apply to them.
 */
import { formatDateTime } from "@/lib/ui/format";
import { db, statements } from "@/lib/db";
import { randomBytes } from "node:crypto";
import { ConflictError, DomainError, InvalidInputError, type FieldError } from "@/lib/errors";
import type { Actor, PanelistActor } from "@/lib/accounts/actor";
import type { Answer, Prisma, Question } from "@/lib/generated/prisma/client";
import type { AnswerInput } from "@/lib/validation/inputs";
import { authorisePanelist, requirePanelist } from "./access";
import { currentRound, questionView, roundView, type QuestionView, type RoundView } from "./panels";
import { closedRoundQuartiles } from "./round-quartiles";

type Tx = Prisma.TransactionClient;

export interface AnswerView {
  readonly questionId: string;
  readonly roundNumber: number;
  readonly version: number;
  readonly value: number;
  readonly low: number | null;
  readonly high: number | null;
  readonly rationale: string;
  readonly answeredAt: string;
}

export interface PanelistQuestionView extends QuestionView {
  /** True when this round's answer must come with a rationale (see the module comment). */
  readonly rationaleRequired: boolean;
  /** Why, in words for the panelist (null when not required). */
  readonly rationaleReason: string | null;
  /** The latest version of the panelist's answer in the current round. */
  readonly answer: AnswerView | null;
  /** All versions in the current round, oldest first. */
  readonly versions: readonly AnswerView[];
  /** The panelist's final answer in the round before the current one (null in round 1 or without one). */
  readonly previousAnswer: AnswerView | null;
}

export interface PanelistPanelView {
  readonly panel: { readonly title: string; readonly description: string; readonly status: "draft" | "running" | "finished" };
  /** The panelist's own pseudonym. */
  readonly pseudonym: string;
  readonly round: RoundView | null;
  readonly acceptingAnswers: boolean;
  readonly questions: readonly PanelistQuestionView[];
}

function answerView(a: Answer, roundNumber: number): AnswerView {
  return {
    questionId: a.questionId,
    roundNumber,
    version: a.version,
    value: a.value,
    low: a.low,
    high: a.high,
    rationale: a.rationale,
    answeredAt: a.createdAt.toISOString(),
  };
}

/**
 * For round `roundNumber` (≥ 2): the questions on which the panelist's final answer in the
 * previous round lay outside that round's IQR, with the reason to show. With `questionId`, only
 * that question is checked (the answer path asks about the one question it stores).
 */
export async function explanationsRequired(
  tx: Tx,
  panelist: PanelistActor,
  roundNumber: number,
  questionId?: string,
): Promise<Map<string, string>> {
  const required = new Map<string, string>();
  if (roundNumber < 2) return required;
  const prev = await tx.round.findUnique({ where: { panelId_number: { panelId: panelist.panelId, number: roundNumber - 1 } } });
  if (!prev || prev.status !== "closed") return required;
  // The panelist's final (highest-version) answer per question, as finalAnswers() defines it,
  // read for this panelist only: the check runs on every answer, so it must not load the round.
  const own = await tx.answer.findMany({
    where: { roundId: prev.id, invitationId: panelist.invitationId, ...(questionId === undefined ? {} : { questionId }) },
    orderBy: { version: "desc" },
  });
  const finals = new Map<string, Answer>();
  for (const a of own) if (!finals.has(a.questionId)) finals.set(a.questionId, a);
  for (const [questionId, { q1, q3 }] of await closedRoundQuartiles(tx, prev)) {
    const mine = finals.get(questionId);
    if (!mine) continue;
    if (mine.value < q1) {
      required.set(questionId, `Your round ${prev.number} answer (${mine.value}) was below the group's lower quartile (${q1}); please explain your reasoning.`);
    } else if (mine.value > q3) {
      required.set(questionId, `Your round ${prev.number} answer (${mine.value}) was above the group's upper quartile (${q3}); please explain your reasoning.`);
    }
  }
  return required;
}

/** The panelist's panel: questions, the current round and their own answers in it. */
export async function getPanelistPanel(actor: Actor): Promise<PanelistPanelView> {
  const me = await authorisePanelist(actor);
  const panel = await db.panel.findUniqueOrThrow({
    where: { id: me.panelId },
    include: { questions: { orderBy: { position: "asc" } }, rounds: true },
  });
  const round = currentRound(panel.rounds.filter((r) => r.status !== "draft"));
  const versions = round
    ? await db.answer.findMany({ where: { roundId: round.id, invitationId: me.invitationId }, orderBy: { version: "asc" } })
    : [];
  const previous = round ? panel.rounds.find((r) => r.number === round.number - 1) : undefined;
  // Oldest first, so the last one per question is the final (highest-version) answer.
  const earlier = previous ? await db.answer.findMany({ where: { roundId: previous.id, invitationId: me.invitationId }, orderBy: { version: "asc" } }) : [];
  const accepting = round?.status === "open" && panel.status !== "finished";
  const required = accepting && round ? await explanationsRequired(db, me, round.number) : new Map<string, string>();
  return {
    panel: { title: panel.title, description: panel.description, status: panel.status as PanelistPanelView["panel"]["status"] },
    pseudonym: me.pseudonym,
    round: round ? roundView(round) : null,
    acceptingAnswers: accepting,
    questions: panel.questions.map((q) => {
      const mine = versions.filter((v) => v.questionId === q.id).map((v) => answerView(v, round!.number));
      return {
        ...questionView(q),
        rationaleRequired: required.has(q.id),
        rationaleReason: required.get(q.id) ?? null,
        answer: mine.at(-1) ?? null,
        versions: mine,
        previousAnswer: ((a) => (a ? answerView(a, previous!.number) : null))(earlier.filter((v) => v.questionId === q.id).at(-1)),
      };
    }),
  };
}

/** Field errors of an answer against its question (format, order, plausible bounds). */
export function answerFieldErrors(q: Pick<Question, "answerFormat" | "lowerBound" | "upperBound" | "unit"> & { readonly calibration?: boolean }, input: AnswerInput): FieldError[] {
  const errors: FieldError[] = [];
  const bounds = `between ${q.lowerBound} and ${q.upperBound} ${q.unit} (the question's plausible bounds)`;
  const inBounds = (field: string, v: number | undefined) => {
    if (v !== undefined && (v < q.lowerBound || v > q.upperBound)) errors.push({ field, message: `must be ${bounds}` });
  };
  if (q.answerFormat === "three-point") {
    // A calibration question asks for the 5th and 95th percentiles (docs/methods.md §14.1).
    const [lowP, highP] = q.calibration ? ["5th", "95th"] : ["10th", "90th"];
    if (input.low === undefined) errors.push({ field: "low", message: `a three-point answer needs a low value (${lowP} percentile)` });
    if (input.high === undefined) errors.push({ field: "high", message: `a three-point answer needs a high value (${highP} percentile)` });
    if (input.low !== undefined && input.low > input.value) errors.push({ field: "low", message: "low must not be above the median estimate (P50)" });
    if (input.high !== undefined && input.high < input.value) errors.push({ field: "high", message: "high must not be below the median estimate (P50)" });
    inBounds("low", input.low);
    inBounds("high", input.high);
  } else {
    if (input.low !== undefined) errors.push({ field: "low", message: "this question takes a single value, not a low value" });
    if (input.high !== undefined) errors.push({ field: "high", message: "this question takes a single value, not a high value" });
  }
  inBounds("value", input.value);
  return errors;
}

function sameAnswer(a: Answer, input: AnswerInput): boolean {
  return (
    a.questionId === input.questionId &&
    a.value === input.value &&
    a.low === (input.low ?? null) &&
    a.high === (input.high ?? null) &&
    a.rationale === input.rationale
  );
}

async function replay(invitationId: string, key: string, input: AnswerInput): Promise<{ answer: AnswerView; replayed: true } | null> {
  const prior = await db.answer.findUnique({
    where: { invitationId_idempotencyKey: { invitationId, idempotencyKey: key } },
    include: { round: true },
  });
  if (!prior) return null;
  if (!sameAnswer(prior, input)) {
    throw new ConflictError("idempotency-key-reused", "This Idempotency-Key was already used for a different answer; use a new key for a new answer.");
  }
  return { answer: answerView(prior, prior.round.number), replayed: true };
}

/**
 * Stores a new version of the panelist's answer to one question in the open round.
 * Returns the stored version; `replayed` is true when the idempotency key had already stored it.
 * @throws ConflictError (409) when no round is open (late answers, or round 1 not opened yet),
 *   the panel is finished, or the key was used for a different answer.
 * @throws InvalidInputError (422) naming the field: unknown question, wrong format, low/high out
 *   of order, outside the plausible bounds, or a missing rationale where one is required.
 */
export async function submitAnswer(
  actor: Actor,
  input: AnswerInput,
  options: { idempotencyKey?: string } = {},
): Promise<{ answer: AnswerView; replayed: boolean }> {
  const me = requirePanelist(actor);
  const key = options.idempotencyKey;
  try {
    return { answer: await storeAnswer(me, input, key), replayed: false };
  } catch (err) {
    // A retried request whose first attempt was stored gets that version back, whatever has
    // happened since (the round closed, the key met a concurrent twin, …).
    if (key && err instanceof DomainError) {
      const prior = await replay(me.invitationId, key, input);
      if (prior) return prior;
    }
    throw err;
  }
}

/** A new row id (Prisma's cuid() is generated client-side, so the raw insert makes its own). */
function newAnswerId(): string {
  return `c${Date.now().toString(36)}${randomBytes(8).toString("hex")}`;
}

/**
 * The checks, then one atomic INSERT … SELECT: the row is written only if the round is still
 * open and before its deadline, with version = 1 + the highest stored version, and not at all
 * if the idempotency key was used already (ON CONFLICT DO NOTHING). One statement is atomic.
 * SQLite has one writer, so two concurrent answers cannot take the same version, and an answer
 * cannot slip in after the round closed. On PostgreSQL the statement locks the round row
 * (FOR SHARE): a close (an UPDATE of that row, lib/panels/round-closing.ts) waits for the insert
 * to commit and then counts the answer, or the insert waits for the close and then finds the
 * round closed; two concurrent versions of one answer meet the unique (round, question,
 * invitation, version) and the loser tries again. (The statement replaces an interactive
 * transaction of four queries: the answer path is the hottest write of the app; bench/load.ts.)
 */
async function storeAnswer(me: PanelistActor, input: AnswerInput, key: string | undefined): Promise<AnswerView> {
  // One hand-written statement (lib/db-statements.ts: the hottest path skips Prisma's per-call
  // query compilation) for the panel's status, the question and the open round.
  const found = await statements.answerTarget(me.panelId, input.questionId);
  if (!found) throw new ConflictError("panel-deleted", "The panel no longer exists.");
  if (found.panelStatus === "finished") throw new ConflictError("panel-finished", "The panel is finished; answers are no longer accepted.");
  const question = found.question;
  if (!question) throw new InvalidInputError([{ field: "questionId", message: "no such question in your panel" }]);
  let round = found.round;
  if (round?.deadline && round.deadline.getTime() <= Date.now()) {
    // The deadline has passed: entering the panel closes the round, so the message below names it.
    await authorisePanelist(me);
    round = null;
  }
  if (!round) {
    const last = await db.round.findFirst({ where: { panelId: me.panelId, status: "closed" }, orderBy: { number: "desc" } });
    throw new ConflictError(last ? "round-closed" : "round-not-open",
      last
        ? `Round ${last.number} closed${last.closedAt ? ` on ${formatDateTime(last.closedAt)}` : ""}; answers are no longer accepted. Wait for the next round to open.`
        : "Round 1 has not opened yet; answers are accepted once the organiser opens it.",
    );
  }
  const errors = answerFieldErrors(question, input);
  if (errors.length > 0) throw new InvalidInputError(errors, "The answer was not stored: correct the fields named below.");
  // Depends only on the previous round, which is closed and no longer changes; an answer with a
  // rationale meets the rule whatever it says, so only an empty one is checked.
  if (input.rationale.length === 0) {
    const required = await explanationsRequired(db, me, round.number, question.id);
    if (required.has(question.id)) {
      throw new InvalidInputError([{ field: "rationale", message: required.get(question.id)! }], "A rationale is required for this answer.");
    }
  }
  const low = input.low ?? null;
  const high = input.high ?? null;
  for (let tries = 0; tries < 3; tries++) {
    const now = new Date();
    const version = await statements.insertAnswerVersion({
      id: newAnswerId(),
      roundId: round.id,
      questionId: question.id,
      invitationId: me.invitationId,
      value: input.value,
      low,
      high,
      rationale: input.rationale,
      idempotencyKey: key ?? null,
      at: now,
    });
    if (version !== null) {
      return {
        questionId: question.id,
        roundNumber: round.number,
        version,
        value: input.value,
        low,
        high,
        rationale: input.rationale,
        answeredAt: now.toISOString(),
      };
    }
    // Nothing written: the key was used already (submitAnswer replays it), the round closed, or
    // (PostgreSQL) a concurrent version of the same answer took this version number.
    if (key && (await db.answer.count({ where: { invitationId: me.invitationId, idempotencyKey: key } })) > 0) {
      throw new ConflictError("idempotency-key-reused", "This Idempotency-Key was already used; use a new key for a new answer.");
    }
    const fresh = await db.round.findUnique({ where: { id: round.id } });
    if (!fresh || fresh.status !== "open" || (fresh.deadline && fresh.deadline.getTime() <= Date.now())) {
      throw new ConflictError("round-closed", `Round ${round.number} has closed; answers are no longer accepted.`);
    }
  }
  throw new ConflictError("answer-not-stored", "The answer could not be stored; please send it again.");
}
