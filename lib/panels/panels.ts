/**
 * Panels and their questions, stopping rules and sharing.
 *
 * A new panel starts as `draft` with round 1 in draft; it becomes `running` when round 1
 * opens and `finished` when the organiser finishes it (lib/panels/rounds.ts). Questions can
 * be added, changed and removed only while the panel is a draft: once answers exist, a
 * changed question would no longer match them.
 */
import { db } from "@/lib/db";
import { ConflictError, ForbiddenError, InvalidInputError, NotFoundError } from "@/lib/errors";
import type { Actor } from "@/lib/accounts/actor";
import { normaliseEmail, requireOrganiser } from "@/lib/accounts/users";
import type { Panel, Question, Round } from "@/lib/generated/prisma/client";
import { calibrationProblems, type PanelCreate, type PanelUpdate, type QuestionInput, type QuestionUpdate, type ShareInput, type TrueValueInput } from "@/lib/validation/inputs";
import {
  STOPPING_RULE_DEFAULTS,
  defaultConsensusThreshold,
  type ConsensusMeasure,
} from "@/lib/stats/stopping-rules";
import { MAX_QUESTIONS_PER_PANEL, requireWithinLimit } from "@/lib/validation/limits";
import { authorisePanel, authoriseUser, type PanelRole } from "./access";
import { recordAudit } from "./audit";

export interface QuestionView {
  readonly id: string;
  readonly position: number;
  readonly text: string;
  readonly unit: string;
  readonly targetPeriod: string;
  readonly lowerBound: number;
  readonly upperBound: number;
  readonly answerFormat: "single" | "three-point";
  readonly aggregation: "shared" | "sum-of-parts";
  /** A calibration question: three-point read as the 5th, 50th and 95th percentiles (docs/methods.md §21). */
  readonly calibration: boolean;
}

/** A question as its organisers and reviewers see it: with a calibration question's true value (never shown to panelists). */
export interface OrganiserQuestionView extends QuestionView {
  readonly trueValue: number | null;
}

export interface RoundView {
  readonly number: number;
  readonly status: "draft" | "open" | "closed";
  readonly deadline: string | null;
  readonly openedAt: string | null;
  readonly closedAt: string | null;
}

export interface PanelRules {
  readonly consensusMeasure: ConsensusMeasure;
  readonly consensusThreshold: number;
  readonly stabilityThreshold: number;
  readonly roundLimit: number;
}

export interface PanelSummary {
  readonly id: string;
  readonly title: string;
  readonly status: "draft" | "running" | "finished";
  readonly role: PanelRole;
  readonly questionCount: number;
  readonly currentRound: RoundView | null;
  readonly createdAt: string;
}

export interface PanelView extends PanelRules {
  readonly id: string;
  readonly title: string;
  readonly description: string;
  readonly status: "draft" | "running" | "finished";
  readonly role: PanelRole;
  readonly questions: readonly OrganiserQuestionView[];
  readonly rounds: readonly RoundView[];
  readonly createdAt: string;
  readonly updatedAt: string;
}

export function questionView(q: Question): QuestionView {
  return {
    id: q.id,
    position: q.position,
    text: q.text,
    unit: q.unit,
    targetPeriod: q.targetPeriod,
    lowerBound: q.lowerBound,
    upperBound: q.upperBound,
    answerFormat: q.answerFormat === "three-point" ? "three-point" : "single",
    aggregation: q.aggregation === "sum-of-parts" ? "sum-of-parts" : "shared",
    calibration: q.calibration,
  };
}

export function organiserQuestionView(q: Question): OrganiserQuestionView {
  return { ...questionView(q), trueValue: q.calibration ? q.trueValue : null };
}

export function roundView(r: Round): RoundView {
  return {
    number: r.number,
    status: r.status as RoundView["status"],
    deadline: r.deadline?.toISOString() ?? null,
    openedAt: r.openedAt?.toISOString() ?? null,
    closedAt: r.closedAt?.toISOString() ?? null,
  };
}

export function panelRules(p: Panel): PanelRules {
  return {
    consensusMeasure: p.consensusMeasure === "relative-iqr" ? "relative-iqr" : "cv",
    consensusThreshold: p.consensusThreshold,
    stabilityThreshold: p.stabilityThreshold,
    roundLimit: p.roundLimit,
  };
}

/** The round panelists are working on or last saw: the open one, else the highest number. */
export function currentRound<R extends { number: number; status: string }>(rounds: readonly R[]): R | null {
  return rounds.find((r) => r.status === "open") ?? [...rounds].sort((a, b) => b.number - a.number)[0] ?? null;
}

async function loadPanelView(panelId: string, role: PanelRole): Promise<PanelView> {
  const p = await db.panel.findUniqueOrThrow({
    where: { id: panelId },
    include: { questions: { orderBy: { position: "asc" } }, rounds: { orderBy: { number: "asc" } } },
  });
  return {
    id: p.id,
    title: p.title,
    description: p.description,
    status: p.status as PanelView["status"],
    role,
    ...panelRules(p),
    questions: p.questions.map(organiserQuestionView),
    rounds: p.rounds.map(roundView),
    createdAt: p.createdAt.toISOString(),
    updatedAt: p.updatedAt.toISOString(),
  };
}

/** Panels the user can reach (owned, or shared with them), newest first. */
export async function listPanels(actor: Actor): Promise<PanelSummary[]> {
  const { actor: user, reachable } = await authoriseUser(actor);
  const panels = await db.panel.findMany({
    where: reachable,
    orderBy: { createdAt: "desc" },
    include: { rounds: true, shares: { where: { email: user.email } }, _count: { select: { questions: true } } },
  });
  return panels.map((p) => {
    const share = p.shares[0];
    const role: PanelRole =
      user.role === "organiser" && p.ownerId === user.userId
        ? "owner"
        : user.role === "organiser" && share?.role === "organiser"
          ? "organiser"
          : "reviewer";
    const round = currentRound(p.rounds);
    return {
      id: p.id,
      title: p.title,
      status: p.status as PanelSummary["status"],
      role,
      questionCount: p._count.questions,
      currentRound: round ? roundView(round) : null,
      createdAt: p.createdAt.toISOString(),
    };
  });
}

/** One panel with its questions, rules and rounds (organisers and reviewers of the panel). */
export async function getPanel(actor: Actor, panelId: string): Promise<PanelView> {
  const access = await authorisePanel(actor, panelId, "read");
  return loadPanelView(panelId, access.role);
}

/**
 * How far the panel's questions are past the rounds: the first question without a baseline and
 * the first without an outcome (null when none is missing), and how many have each (calibration
 * questions aside).
 */
export async function getPanelMilestones(
  actor: Actor,
  panelId: string,
): Promise<{ baselines: number; outcomes: number; firstWithoutBaseline: string | null; firstWithoutOutcome: string | null }> {
  await authorisePanel(actor, panelId, "read");
  // Calibration questions have a true value instead of a baseline and an outcome.
  const questions = await db.question.findMany({
    where: { panelId, calibration: false },
    orderBy: { position: "asc" },
    select: { id: true, baseline: { select: { id: true } }, resolution: { select: { id: true } } },
  });
  return {
    baselines: questions.filter((q) => q.baseline).length,
    outcomes: questions.filter((q) => q.resolution).length,
    firstWithoutBaseline: questions.find((q) => !q.baseline)?.id ?? null,
    firstWithoutOutcome: questions.find((q) => !q.resolution)?.id ?? null,
  };
}

/**
 * Creates a panel owned by the organiser, with its questions (in the given order) and round 1
 * as a draft. Omitted rules take STOPPING_RULE_DEFAULTS.
 */
export async function createPanel(actor: Actor, input: PanelCreate): Promise<PanelView> {
  const user = requireOrganiser(actor);
  const measure = input.consensusMeasure ?? STOPPING_RULE_DEFAULTS.consensusMeasure.value;
  const panel = await db.$transaction(async (tx) => {
    const p = await tx.panel.create({
      data: {
        ownerId: user.userId,
        title: input.title,
        description: input.description,
        consensusMeasure: measure,
        consensusThreshold: input.consensusThreshold ?? defaultConsensusThreshold(measure),
        stabilityThreshold: input.stabilityThreshold ?? STOPPING_RULE_DEFAULTS.stabilityThreshold.value,
        roundLimit: input.roundLimit ?? STOPPING_RULE_DEFAULTS.roundLimit.value,
        questions: { create: input.questions.map((q, i) => ({ ...q, position: i + 1 })) },
        rounds: { create: { number: 1, status: "draft" } },
      },
    });
    await recordAudit(tx, { actorId: user.userId, panelId: p.id, action: "panel.created", detail: { title: p.title } });
    return p;
  });
  return loadPanelView(panel.id, "owner");
}

/** Changes the title, description or stopping rules (not once the panel is finished). */
export async function updatePanel(actor: Actor, panelId: string, input: PanelUpdate): Promise<PanelView> {
  const access = await authorisePanel(actor, panelId, "manage");
  if (access.panel.status === "finished") throw new ConflictError("panel-finished", "The panel is finished; it can no longer be changed.");
  await db.$transaction(async (tx) => {
    await tx.panel.update({ where: { id: panelId }, data: input });
    await recordAudit(tx, { actorId: access.actor.userId, panelId, action: "panel.updated", detail: { ...input, from: oldValues(access.panel, input) } });
  });
  return loadPanelView(panelId, access.role);
}

/** Deletes a panel with everything in it (its owner only). */
export async function deletePanel(actor: Actor, panelId: string): Promise<{ id: string; deleted: true }> {
  const access = await authorisePanel(actor, panelId, "manage");
  if (access.role !== "owner") throw new ForbiddenError("Only the panel's owner can delete it.");
  await db.$transaction(async (tx) => {
    await tx.panel.delete({ where: { id: panelId } });
    await recordAudit(tx, { actorId: access.actor.userId, panelId, action: "panel.deleted", detail: { title: access.panel.title } });
  });
  return { id: panelId, deleted: true };
}

/** The stored values of the fields an update changes, for the audit log's "from … to …". */
function oldValues(stored: object, update: object): Record<string, unknown> {
  const row = stored as Record<string, unknown>;
  return Object.fromEntries(Object.keys(update).map((k) => [k, row[k] ?? null]));
}

function requireDraft(panel: Panel): void {
  if (panel.status !== "draft") {
    throw new ConflictError("questions-fixed", "Questions are fixed once round 1 has opened; create a new panel to ask something else.");
  }
}

/** Adds a question at the end (draft panels only; at most MAX_QUESTIONS_PER_PANEL). */
export async function addQuestion(actor: Actor, panelId: string, input: QuestionInput): Promise<OrganiserQuestionView> {
  const access = await authorisePanel(actor, panelId, "manage");
  requireDraft(access.panel);
  const q = await db.$transaction(async (tx) => {
    const last = await tx.question.aggregate({ where: { panelId }, _max: { position: true }, _count: true });
    requireWithinLimit({ current: last._count, adding: 1, max: MAX_QUESTIONS_PER_PANEL }, "questions", "questions", "A panel");
    const created = await tx.question.create({ data: { ...input, panelId, position: (last._max.position ?? 0) + 1 } });
    await recordAudit(tx, { actorId: access.actor.userId, panelId, action: "question.created", detail: { questionId: created.id, ...input } });
    return created;
  });
  return organiserQuestionView(q);
}

/** Changes a question (draft panels only); the merged bounds must stay in order. */
export async function updateQuestion(actor: Actor, panelId: string, questionId: string, input: QuestionUpdate): Promise<OrganiserQuestionView> {
  const access = await authorisePanel(actor, panelId, "manage");
  const existing = await db.question.findFirst({ where: { id: questionId, panelId } });
  if (!existing) throw new NotFoundError("The question");
  requireDraft(access.panel);
  const lower = input.lowerBound ?? existing.lowerBound;
  const upper = input.upperBound ?? existing.upperBound;
  if (!(lower < upper)) throw new InvalidInputError([{ field: "lowerBound", message: "lower bound must be below the upper bound" }]);
  const merged = { ...existing, ...input };
  const problems = calibrationProblems({ ...merged, trueValue: input.trueValue ?? (merged.calibration ? existing.trueValue : null) });
  if (problems.length > 0) throw new InvalidInputError(problems);
  // A question that stops being a calibration question loses its true value.
  if (input.calibration === false) input = { ...input, trueValue: null };
  const q = await db.$transaction(async (tx) => {
    const updated = await tx.question.update({ where: { id: questionId }, data: input });
    await recordAudit(tx, { actorId: access.actor.userId, panelId, action: "question.updated", detail: { questionId, ...input, from: oldValues(existing, input) } });
    return updated;
  });
  return organiserQuestionView(q);
}

/**
 * Sets (or with null clears) a calibration question's true value, at any stage of the panel —
 * before, during or after the rounds (organisers; audited). Panelists never see it.
 */
export async function setTrueValue(actor: Actor, panelId: string, questionId: string, input: TrueValueInput): Promise<{ questionId: string; trueValue: number | null }> {
  const access = await authorisePanel(actor, panelId, "manage");
  const existing = await db.question.findFirst({ where: { id: questionId, panelId } });
  if (!existing) throw new NotFoundError("The question");
  if (!existing.calibration) throw new InvalidInputError([{ field: "trueValue", message: "only a calibration question has a true value" }]);
  await db.$transaction(async (tx) => {
    await tx.question.update({ where: { id: questionId }, data: { trueValue: input.trueValue } });
    await recordAudit(tx, { actorId: access.actor.userId, panelId, action: "question.true-value", detail: { questionId, from: existing.trueValue, trueValue: input.trueValue } });
  });
  return { questionId, trueValue: input.trueValue };
}

/** Removes a question (draft panels only). */
export async function deleteQuestion(actor: Actor, panelId: string, questionId: string): Promise<{ id: string; deleted: true }> {
  const access = await authorisePanel(actor, panelId, "manage");
  const existing = await db.question.findFirst({ where: { id: questionId, panelId } });
  if (!existing) throw new NotFoundError("The question");
  requireDraft(access.panel);
  await db.$transaction(async (tx) => {
    await tx.question.delete({ where: { id: questionId } });
    await recordAudit(tx, { actorId: access.actor.userId, panelId, action: "question.deleted", detail: { questionId, text: existing.text } });
  });
  return { id: questionId, deleted: true };
}

/**
 * A share, as the owner typed it. Shares are kept against the e-mail whether or not an account
 * has it, and sharing answers the same either way (same status, same body, the same work), so
 * it does not tell the owner which e-mails have accounts (THREATS.md). The account with that
 * e-mail gets the access whenever it exists (lib/panels/access.ts); a reviewer account reads
 * only, whatever `role` says.
 */
export interface ShareView {
  readonly email: string;
  readonly role: "organiser" | "reviewer";
}

/** Who else can reach the panel, by e-mail (organisers of the panel). */
export async function listShares(actor: Actor, panelId: string): Promise<ShareView[]> {
  await authorisePanel(actor, panelId, "manage");
  const rows = await db.panelShare.findMany({ where: { panelId }, orderBy: { email: "asc" } });
  return rows.map((s) => ({ email: s.email, role: s.role === "organiser" ? "organiser" : "reviewer" }));
}

/**
 * Shares the panel with an e-mail as co-organiser or reviewer (owner only); sharing again
 * changes the role. Looks up no account.
 * @throws ConflictError when the e-mail is the owner's own.
 */
export async function sharePanel(actor: Actor, panelId: string, input: ShareInput): Promise<ShareView> {
  const access = await authorisePanel(actor, panelId, "manage");
  if (access.role !== "owner") throw new ForbiddenError("Only the panel's owner can share it.");
  const email = normaliseEmail(input.email);
  if (email === access.actor.email) throw new ConflictError("already-has-access", "The owner already has full access.");
  const { role } = input;
  await db.$transaction(async (tx) => {
    await tx.panelShare.upsert({ where: { panelId_email: { panelId, email } }, create: { panelId, email, role }, update: { role } });
    await recordAudit(tx, { actorId: access.actor.userId, panelId, action: "panel.shared", detail: { email, role } });
  });
  return { email, role };
}

/** Withdraws the share with an e-mail (owner only). */
export async function unsharePanel(actor: Actor, panelId: string, rawEmail: string): Promise<{ email: string; deleted: true }> {
  const access = await authorisePanel(actor, panelId, "manage");
  if (access.role !== "owner") throw new ForbiddenError("Only the panel's owner can change who it is shared with.");
  const email = normaliseEmail(rawEmail);
  const share = await db.panelShare.findUnique({ where: { panelId_email: { panelId, email } } });
  if (!share) throw new NotFoundError("The share");
  await db.$transaction(async (tx) => {
    await tx.panelShare.delete({ where: { panelId_email: { panelId, email } } });
    await recordAudit(tx, { actorId: access.actor.userId, panelId, action: "panel.unshared", detail: { email } });
  });
  return { email, deleted: true };
}
