/**
 * Outcome (docs/methods.md §14.9): the organiser records a question's outcome value,
 * once. The figures as they stand at that moment (raw panel, corrected panel, baseline, blend
 * and each panelist's final answer, with the bias factor applied to it) are stored with it and
 * scored by lib/blend `scoreOutcome` / `scoreFigure` (errors outcome − figure, percent
 * errors, and the scaled error against the baseline history's naive MAE, Hyndman & Koehler
 * 2006). Track records and the accuracy history are derived from these rows on read
 * (lib/triangulation/track-records.ts).
 *
 * Correcting a recorded outcome is a separate, audited action with a reason; it rescores the
 * stored figures (which do not change: they are what was reported).
 *
 * The rows live in the database table `Resolution` (its name from an earlier version; the
 * columns `actual` and `resolvedAt` are mapped here to `outcomeValue` and `recordedAt`).
 *
 * An outcome can be recorded once its panel has a closed round with answers to it and no
 * round is open (an open round would change the panel figure after it was scored).
 */
import { db, isUniqueViolation } from "@/lib/db";
import { ConflictError, InvalidInputError, NotFoundError, type FieldError } from "@/lib/errors";
import type { Actor } from "@/lib/accounts/actor";
import { scoreFigure, scoreOutcome, type FigureScore, type OutcomeScores } from "@/lib/blend";
import type { OutcomeCorrection, OutcomeInput } from "@/lib/validation/triangulation-inputs";
import { authorisePanel } from "../panels/access";
import { recordAudit } from "../panels/audit";
import { loadTriangulation } from "./triangulation";
import { runJob } from "@/lib/work/pool";
import type { OutcomeFigures } from "./track-records";
import { jsonSafe, type JsonSafe } from "../panels/json";
import type { BaselinePreview } from "./baselines";

/** The scores of an outcome as stored (lib/blend's field names); baseline and blend are null without a baseline. */
export interface StoredScores {
  readonly actual: number;
  readonly rawPanel: FigureScore;
  readonly correctedPanel: FigureScore;
  readonly baseline: FigureScore | null;
  readonly blend: FigureScore | null;
  /** One per panelist's final answer, labelled by pseudonym. */
  readonly panelists: readonly FigureScore[];
}

/** One figure's scores as shown: lib/blend's `FigureScore` with its `actual` named `outcomeValue`. */
export type ShownScore = Omit<JsonSafe<FigureScore>, "actual"> & { readonly outcomeValue: number | null };

/** The stored scores as shown (API, pages, CSV). */
export interface ShownScores {
  readonly outcomeValue: number | null;
  readonly rawPanel: ShownScore;
  readonly correctedPanel: ShownScore;
  readonly baseline: ShownScore | null;
  readonly blend: ShownScore | null;
  readonly panelists: readonly ShownScore[];
}

export interface OutcomeView {
  readonly questionId: string;
  readonly outcomeValue: number;
  readonly note: string;
  readonly parts: readonly { readonly pseudonym: string; readonly outcomeValue: number }[];
  readonly recordedAt: string;
  readonly correctedAt: string | null;
  readonly figures: Omit<OutcomeFigures, "panelists" | "baselineTraining"> & {
    /** Answers only: the bias factor each one got comes from its panelist's history across panels and would name them (lib/triangulation/report-views.ts). */
    readonly panelists: readonly { readonly pseudonym: string; readonly value: number; readonly low: number | null; readonly high: number | null }[];
  };
  readonly scores: ShownScores;
}

/**
 * Scores the stored figures against `actual` (pure). The panelists' answers are scored with
 * their pseudonyms as labels; the MASE scale is the baseline history's (none without one).
 * On a sum-of-parts question an answer is a part, so it is scored only against its own part's
 * actual (`parts`, by invitation id), never against the total, and without the total's MASE scale.
 */
export function scoreFigures(actual: number, f: OutcomeFigures, parts: readonly { invitationId: string; actual: number }[] = []): StoredScores {
  const options = f.baselineTraining.length >= 2 ? { training: f.baselineTraining, season: f.baselineSeason } : {};
  const sum = f.aggregation === "sum-of-parts";
  const panelistScores = () =>
    sum
      ? f.panelists.flatMap((p) => {
          const part = parts.find((x) => x.invitationId === p.invitationId);
          return part ? [scoreFigure(p.pseudonym, part.actual, p.value)] : [];
        })
      : f.panelists.map((p) => scoreFigure(p.pseudonym, actual, p.value, options));
  if (f.baseline !== null && f.blend !== null) {
    const panelists = sum ? {} : Object.fromEntries(f.panelists.map((p) => [p.pseudonym, p.value]));
    const s: OutcomeScores = scoreOutcome(actual, { rawPanel: f.rawPanel, correctedPanel: f.correctedPanel, baseline: f.baseline, blend: f.blend, panelists }, options);
    return sum ? { ...s, panelists: panelistScores() } : s;
  }
  return {
    actual,
    rawPanel: scoreFigure("raw panel", actual, f.rawPanel, options),
    correctedPanel: scoreFigure("corrected panel", actual, f.correctedPanel, options),
    baseline: null,
    blend: null,
    panelists: panelistScores(),
  };
}

/**
 * Holds an outcome value, and each part's, to the question's plausible bounds, naming the number
 * and the bounds in the message (an outcome of −100 for a 0–100,000 question is refused, 422).
 * On a sum-of-parts question the bounds are one part's (each panelist answers for their own part),
 * so the total is held to the lower bound only: it may exceed a part's upper bound.
 * @throws InvalidInputError for a value outside [lowerBound, upperBound].
 */
export function checkWithinBounds(
  question: { lowerBound: number; upperBound: number; aggregation?: string },
  outcomeValue: number,
  parts: readonly { pseudonym: string; outcomeValue: number }[] = [],
): void {
  const errors: FieldError[] = [];
  const check = (field: string, v: number) => {
    if (v < question.lowerBound || v > question.upperBound) {
      errors.push({ field, message: `${v} is outside the question's bounds ${question.lowerBound} to ${question.upperBound}` });
    }
  };
  if (question.aggregation === "sum-of-parts") {
    if (outcomeValue < question.lowerBound) errors.push({ field: "outcomeValue", message: `${outcomeValue} is below the question's lower bound ${question.lowerBound}` });
  } else check("outcomeValue", outcomeValue);
  parts.forEach((p, i) => check(`parts.${i}.outcomeValue`, p.outcomeValue));
  if (errors.length > 0) throw new InvalidInputError(errors);
}

function partsFor(
  parts: readonly { pseudonym: string; outcomeValue: number }[],
  figures: OutcomeFigures,
): { invitationId: string; actual: number }[] {
  if (parts.length > 0 && figures.aggregation !== "sum-of-parts") {
    throw new InvalidInputError([{ field: "parts", message: "part outcomes apply only to sum-of-parts questions" }]);
  }
  const errors: FieldError[] = [];
  const out: { invitationId: string; actual: number }[] = [];
  parts.forEach((p, i) => {
    const who = figures.panelists.find((x) => x.pseudonym === p.pseudonym);
    if (!who) errors.push({ field: `parts.${i}.pseudonym`, message: `no panelist ${p.pseudonym} answered this question in round ${figures.round}` });
    else out.push({ invitationId: who.invitationId, actual: p.outcomeValue });
  });
  if (errors.length > 0) throw new InvalidInputError(errors);
  return out;
}

/** A stored score with `actual` (the stored name) shown as `outcomeValue`. */
function shownScore(s: JsonSafe<FigureScore>): ShownScore {
  const { actual, ...rest } = s;
  return { ...rest, outcomeValue: actual };
}

/** A row of the `Resolution` table (the table's historical name) as the outcome view. */
function view(r: { questionId: string; actual: number; note: string; partActuals: string; figures: string; scores: string; resolvedAt: Date; correctedAt: Date | null }): OutcomeView {
  const f = JSON.parse(r.figures) as OutcomeFigures;
  const parts = JSON.parse(r.partActuals) as { invitationId: string; actual: number }[];
  const { baselineTraining: _t, panelists, ...rest } = f;
  const s = JSON.parse(r.scores) as JsonSafe<StoredScores>;
  return {
    questionId: r.questionId,
    outcomeValue: r.actual,
    note: r.note,
    parts: parts.map((p) => ({ pseudonym: f.panelists.find((x) => x.invitationId === p.invitationId)?.pseudonym ?? "?", outcomeValue: p.actual })),
    recordedAt: r.resolvedAt.toISOString(),
    correctedAt: r.correctedAt?.toISOString() ?? null,
    figures: { ...rest, panelists: panelists.map((p) => ({ pseudonym: p.pseudonym, value: p.value, low: p.low, high: p.high })) },
    scores: {
      outcomeValue: s.actual,
      rawPanel: shownScore(s.rawPanel),
      correctedPanel: shownScore(s.correctedPanel),
      baseline: s.baseline && shownScore(s.baseline),
      blend: s.blend && shownScore(s.blend),
      panelists: s.panelists.map(shownScore),
    },
  };
}

/** The figures of a question as they stand now, for storing with its outcome. */
export async function currentFigures(panelId: string, questionId: string): Promise<OutcomeFigures> {
  const loaded = await loadTriangulation(panelId, questionId);
  const t = await runJob("triangulation", loaded.input);
  if (!t.panel) throw new ConflictError("no-panel-figure", "No closed round has answers to this question, so there is no panel figure to score yet.");
  const b = await db.baseline.findUnique({ where: { questionId } });
  const preview = b ? (JSON.parse(b.preview) as BaselinePreview) : null;
  return {
    round: t.panel.round,
    aggregation: loaded.question.aggregation,
    answerFormat: loaded.question.answerFormat,
    rawPanel: t.panel.raw.figure,
    correctedPanel: t.panel.corrected.figure,
    baseline: t.baseline?.mean ?? null,
    blend: t.blend?.figure ?? null,
    blendSd: t.blend?.combinedSd ?? null,
    panelWeight: t.weights?.panel ?? null,
    weightRule: t.weights?.applied ?? null,
    panelists: t.panel.answers.map((a) => ({
      invitationId: a.invitationId,
      rosterMemberId: loaded.members.get(a.invitationId) ?? "",
      pseudonym: a.pseudonym,
      value: a.value,
      low: a.low,
      high: a.high,
      factor: a.factor,
    })),
    baselineTraining: preview ? preview.rows.flatMap((r) => (r.scaled === null ? [] : [r.scaled])) : [],
    baselineSeason: b?.season ?? 1,
  };
}

/** What is about to be recorded, for the confirmation the organiser sees before saving. */
export interface OutcomePreview {
  readonly questionId: string;
  readonly text: string;
  readonly unit: string;
  /** The outcome value as it will be stored. */
  readonly outcomeValue: number;
  /** The value recorded now (a correction); null before the outcome is recorded. */
  readonly recorded: number | null;
  readonly parts: readonly { readonly pseudonym: string; readonly outcomeValue: number }[];
}

/** The checks before an outcome is first recorded; the question row on success. */
async function readyToRecord(actor: Actor, panelId: string, questionId: string, input: OutcomeInput) {
  const access = await authorisePanel(actor, panelId, "manage");
  const question = await db.question.findFirst({ where: { id: questionId, panelId } });
  if (!question) throw new NotFoundError("The question");
  if (question.calibration) throw new ConflictError("calibration-question", "A calibration question has a true value instead of an outcome: enter it on the panel page (or PUT …/true-value).");
  if (await db.resolution.findUnique({ where: { questionId } })) {
    throw new ConflictError("outcome-recorded", "The question's outcome is already recorded; correct the recorded value instead (PATCH, with a reason).");
  }
  if (await db.round.findFirst({ where: { panelId, status: "open" } })) {
    throw new ConflictError("round-still-open", "A round is open: close it before recording the outcome, so the panel figure that is scored is final.");
  }
  checkWithinBounds(question, input.outcomeValue, input.parts);
  return { access, question };
}

/** The checks before a correction; the question and its stored outcome on success. */
async function readyToCorrect(actor: Actor, panelId: string, questionId: string, input: OutcomeCorrection) {
  const access = await authorisePanel(actor, panelId, "manage");
  const question = await db.question.findFirst({ where: { id: questionId, panelId } });
  if (!question) throw new NotFoundError("The question");
  const existing = await db.resolution.findUnique({ where: { questionId } });
  if (!existing) throw new NotFoundError("The question's outcome");
  checkWithinBounds(question, input.outcomeValue, input.parts ?? []);
  return { access, question, existing };
}

/**
 * Everything {@link recordOutcome} (or, for a recorded outcome, {@link correctOutcome})
 * checks, without writing: the value that would be recorded with the question's unit, so the
 * organiser confirms the number itself before it is saved (the form's two steps).
 * @throws as recordOutcome / correctOutcome do.
 */
export async function previewOutcome(
  actor: Actor,
  panelId: string,
  questionId: string,
  input: OutcomeInput | OutcomeCorrection,
  kind: "record" | "correct",
): Promise<OutcomePreview> {
  const ready =
    kind === "record"
      ? { ...(await readyToRecord(actor, panelId, questionId, input as OutcomeInput)), existing: null }
      : await readyToCorrect(actor, panelId, questionId, input as OutcomeCorrection);
  const q = ready.question;
  return { questionId, text: q.text, unit: q.unit, outcomeValue: input.outcomeValue, recorded: ready.existing?.actual ?? null, parts: input.parts ?? [] };
}

/**
 * Records a question's outcome value and scores every figure (organisers of the panel; audited).
 * @throws ConflictError (409) when the outcome is already recorded, a round is open, or there is no panel figure.
 * @throws InvalidInputError (422) for part outcomes on a shared question, an unknown pseudonym, or a
 *   value outside the question's bounds.
 */
export async function recordOutcome(actor: Actor, panelId: string, questionId: string, input: OutcomeInput): Promise<OutcomeView> {
  const { access } = await readyToRecord(actor, panelId, questionId, input);
  const figures = await currentFigures(panelId, questionId);
  const parts = partsFor(input.parts, figures);
  const scores = jsonSafe(scoreFigures(input.outcomeValue, figures, parts));
  const stored = await db.$transaction(async (tx) => {
    if (await tx.resolution.findUnique({ where: { questionId } })) {
      throw new ConflictError("outcome-recorded", "The outcome was recorded a moment ago by someone else; correct the recorded value instead.");
    }
    const r = await tx.resolution.create({
      data: {
        questionId,
        ownerId: access.panel.ownerId,
        actual: input.outcomeValue,
        note: input.note,
        partActuals: JSON.stringify(parts),
        figures: JSON.stringify(figures),
        scores: JSON.stringify(scores),
        resolvedById: access.actor.userId,
      },
    });
    await recordAudit(tx, { actorId: access.actor.userId, panelId, action: "outcome.recorded", detail: { questionId, outcomeValue: input.outcomeValue, parts: parts.length } });
    return r;
  }).catch((err: unknown) => {
    // Two outcomes recorded at once: the unique questionId lets one win; the other is told so.
    if (isUniqueViolation(err)) {
      throw new ConflictError("outcome-recorded", "The outcome was recorded a moment ago by someone else; correct the recorded value instead.");
    }
    throw err;
  });
  return view(stored);
}

/**
 * Corrects a recorded outcome value (organisers; audited with the old value, the new one and
 * the reason). The stored figures stay as they were reported; their scores are recomputed.
 * @throws NotFoundError when no outcome is recorded.
 */
export async function correctOutcome(actor: Actor, panelId: string, questionId: string, input: OutcomeCorrection): Promise<OutcomeView> {
  const { access, existing } = await readyToCorrect(actor, panelId, questionId, input);
  const figures = JSON.parse(existing.figures) as OutcomeFigures;
  const parts = input.parts !== undefined ? partsFor(input.parts, figures) : (JSON.parse(existing.partActuals) as { invitationId: string; actual: number }[]);
  const scores = jsonSafe(scoreFigures(input.outcomeValue, figures, parts));
  const updated = await db.$transaction(async (tx) => {
    const r = await tx.resolution.update({
      where: { questionId },
      data: { actual: input.outcomeValue, partActuals: JSON.stringify(parts), scores: JSON.stringify(scores), correctedAt: new Date() },
    });
    await recordAudit(tx, {
      actorId: access.actor.userId,
      panelId,
      action: "outcome.corrected",
      detail: { questionId, from: existing.actual, to: input.outcomeValue, reason: input.reason },
    });
    return r;
  });
  return view(updated);
}

/** A question's outcome (organisers and reviewers). @throws NotFoundError when none is recorded. */
export async function getOutcome(actor: Actor, panelId: string, questionId: string): Promise<OutcomeView> {
  await authorisePanel(actor, panelId, "read");
  const q = await db.question.findFirst({ where: { id: questionId, panelId }, include: { resolution: true } });
  if (!q) throw new NotFoundError("The question");
  if (!q.resolution) throw new NotFoundError("The question's outcome");
  return view(q.resolution);
}

/** The outcome view of a stored row (for the report). */
export const outcomeView = view;
