/**
 * Triangulation of one question (docs/methods.md §14.7): loads a question's stored inputs and
 * computes its triangulation with lib/triangulation/triangulation-figures.ts (the rules are
 * stated there), on the worker pool for the pages that show many questions.
 */
import { db } from "@/lib/db";
import { InvalidInputError, NotFoundError } from "@/lib/errors";
import type { Actor } from "@/lib/accounts/actor";
import type { BaselineForecast, BiasFactor, OutcomePair, WeightSpec } from "@/lib/blend";
import type { PanelLegChoice, PanelWeightRule, PanelBlendRuleInput, QuestionBlendRuleInput } from "@/lib/validation/triangulation-inputs";
import { authorisePanel } from "../panels/access";
import { recordAudit } from "../panels/audit";
import { storedTarget, type BaselineTarget } from "./baselines";
import { legWarnings } from "./warnings";
import { loadCalibration } from "./calibration";
import { runJob } from "@/lib/work/pool";
import { type CorrectedAnswer, type PanelLeg, type Triangulation, type TriangulationInput, type TriangulationRound } from "./triangulation-figures";
import { historyOf, type HistoryFilter } from "./track-records";
import { panelReads, type PanelReads } from "../panels/panel-reads";
import { jsonSafe, type JsonSafe } from "../panels/json";
import { correctionSummary, namesRevealed, withoutHistory, type AnswerWithoutHistory, type CorrectionSummary } from "./report-views";

export * from "./triangulation-figures";

/** The weight rule that applies to a question, with the organiser's weight for that rule. */
export function effectiveRule(
  panel: { blendRule: string; blendPanelWeight: number | null },
  question: { blendRule: string | null; blendPanelWeight: number | null },
): { rule: PanelWeightRule; panelWeight: number | null; from: "question" | "panel" } {
  if (question.blendRule) return { rule: question.blendRule as PanelWeightRule, panelWeight: question.blendPanelWeight, from: "question" };
  return { rule: panel.blendRule as PanelWeightRule, panelWeight: panel.blendPanelWeight, from: "panel" };
}

function weightSpec(rule: PanelWeightRule, panelWeight: number | null, history: readonly OutcomePair[]): WeightSpec {
  if (rule === "organiser" && panelWeight !== null) return { rule: "organiser", panelWeight };
  if (rule === "inverse-mse") return { rule: "inverse-mse", history };
  return { rule: "equal" };
}

/** A question's stored inputs, loaded for {@link computeTriangulation}, with what else the report shows. */
export interface LoadedTriangulation {
  readonly input: TriangulationInput;
  readonly question: {
    id: string;
    text: string;
    unit: string;
    targetPeriod: string;
    lowerBound: number;
    upperBound: number;
    aggregation: "shared" | "sum-of-parts";
    answerFormat: "single" | "three-point";
    calibration: boolean;
  };
  /** The panel's choice of panel leg (equal, or the performance-weighted pool). */
  readonly panelLeg: "equal" | "performance";
  readonly ownerId: string;
  readonly rule: ReturnType<typeof effectiveRule>;
  readonly baselineTarget: BaselineTarget | null;
  /** invitation id → roster member id. */
  readonly members: ReadonlyMap<string, string>;
  /** Roster members with a track-record note: answers skipped. */
  readonly recordedAt: Date | null;
}

/**
 * Loads a question's inputs (no access check: callers authorise, which also closes overdue
 * rounds, lib/panels/access.ts). `reads` shares the reads of one request across its questions
 * (lib/panels/panel-reads.ts).
 */
export async function loadTriangulation(panelId: string, questionId: string, reads: PanelReads = panelReads()): Promise<LoadedTriangulation> {
  const q = await db.question.findFirst({
    where: { id: questionId, panelId },
    include: { panel: true, baseline: true, resolution: { select: { resolvedAt: true } } },
  });
  if (!q) throw new NotFoundError("The question");
  const rounds = await db.round.findMany({ where: { panelId, status: "closed" }, orderBy: { number: "asc" } });
  const invitations = await reads.invitations(panelId);
  const members = new Map(invitations.map((i) => [i.id, i.rosterMemberId]));
  const roundInputs: TriangulationRound[] = [];
  for (const r of rounds) {
    const answers = await reads.finalAnswers(r.id, questionId);
    roundInputs.push({ round: r.number, answers: answers.map((a) => ({ invitationId: a.invitationId, pseudonym: a.pseudonym, value: a.value, low: a.low, high: a.high })) });
  }
  while (roundInputs.length > 0 && roundInputs.at(-1)!.answers.length === 0) roundInputs.pop();
  const recordedAt = q.resolution?.resolvedAt ?? null;
  const filter: HistoryFilter = { excludeQuestionId: questionId, ...(recordedAt ? { before: recordedAt } : {}) };
  const records = await reads.trackRecords(q.panel.ownerId, filter);
  const factors: Record<string, BiasFactor> = {};
  const intervalHits: Record<string, { hits: number; count: number }> = {};
  for (const [invitationId, memberId] of members) {
    const r = records.get(memberId);
    if (r) {
      factors[invitationId] = r.record.bias;
      intervalHits[invitationId] = { hits: r.record.intervalHitRate.hits, count: r.record.intervalHitRate.count };
    }
  }
  const rule = effectiveRule(q.panel, q);
  const outcomes = await reads.outcomes(q.panel.ownerId, filter);
  const pairs = historyOf(outcomes).pairs;
  const history = rule.rule === "inverse-mse" ? pairs : [];
  const blendStandardisedErrors = outcomes
    .filter((r) => r.figures.blend !== null && (r.figures.blendSd ?? 0) > 0)
    .map((r) => (r.outcomeValue - r.figures.blend!) / r.figures.blendSd!);
  const panelLogErrors = outcomes.filter((r) => r.outcomeValue > 0 && r.figures.correctedPanel > 0).map((r) => Math.log(r.outcomeValue / r.figures.correctedPanel));
  const target = q.baseline ? storedTarget(q.baseline) : null;
  let baseline: BaselineForecast | null = null;
  if (target && target.mean !== null) {
    const b: { mean: number; lower80?: number; upper80?: number; lower95?: number; upper95?: number } = { mean: target.mean };
    if (target.lower80 !== null && target.upper80 !== null && target.lower80 < target.upper80) {
      b.lower80 = target.lower80;
      b.upper80 = target.upper80;
    }
    if (target.lower95 !== null && target.upper95 !== null && target.lower95 < target.upper95) {
      b.lower95 = target.lower95;
      b.upper95 = target.upper95;
    }
    if (b.lower80 !== undefined || b.lower95 !== undefined) baseline = b;
  }
  const baselineUnusable =
    target && !baseline
      ? target.mean === null
        ? "its forecast for the target period is undefined."
        : "its prediction interval has no width (e.g. a constant history), so it gives no range to blend or to measure departures against."
      : undefined;
  const aggregation = q.aggregation === "sum-of-parts" ? "sum-of-parts" : "shared";
  const answerFormat = q.answerFormat === "three-point" ? "three-point" : "single";
  let performance: TriangulationInput["performance"];
  if (q.panel.panelLeg === "performance" && !q.calibration) {
    const c = await loadCalibration(panelId, reads);
    if (c.report.calibrationQuestions === 0) performance = undefined;
    else if (c.weights.size === 0) performance = { unavailable: c.report.waiting ?? "no panelist has been scored on the calibration questions yet." };
    else performance = { weights: Object.fromEntries(c.weights), calibrationQuestions: c.report.counted };
  }
  return {
    input: {
      aggregation,
      answerFormat,
      rounds: roundInputs,
      factors,
      intervalHits,
      panelLogErrors,
      blendHistory: pairs,
      blendStandardisedErrors,
      baseline,
      weight: weightSpec(rule.rule, rule.panelWeight, history),
      ...(baselineUnusable ? { baselineUnusable } : {}),
      ...(performance ? { performance } : {}),
      ...(q.calibration ? { calibration: true } : {}),
    },
    question: { id: q.id, text: q.text, unit: q.unit, targetPeriod: q.targetPeriod, lowerBound: q.lowerBound, upperBound: q.upperBound, aggregation, answerFormat, calibration: q.calibration },
    panelLeg: q.panel.panelLeg === "performance" ? "performance" : "equal",
    ownerId: q.panel.ownerId,
    rule,
    baselineTarget: target,
    members,
    recordedAt,
  };
}

/**
 * {@link Triangulation} as JSON (non-finite numbers as null), with the rule that chose the
 * weight. Answers carry pseudonyms only: invitation ids would let an organiser match pseudonyms
 * to the invitation list (names) without the audited reveal. While names are hidden, answers
 * also carry nothing from the panelist's history (see lib/triangulation/report-views.ts).
 */
export type TriangulationView = Omit<JsonSafe<Triangulation>, "panel"> & {
  readonly panel:
    | (Omit<JsonSafe<PanelLeg>, "answers"> & {
        /** Per-person correction figures only when names are shown (lib/triangulation/report-views.ts). */
        readonly answers: (Omit<JsonSafe<CorrectedAnswer>, "invitationId"> | AnswerWithoutHistory)[];
        readonly correction: JsonSafe<CorrectionSummary>;
      })
    | null;
  readonly questionId: string;
  readonly weightRule: { readonly rule: PanelWeightRule; readonly panelWeight: number | null; readonly from: "question" | "panel" };
  readonly namesShown: boolean;
  /** Plain messages: a leg outside the question's plausible range, legs an order of magnitude apart (lib/triangulation/warnings.ts). */
  readonly warnings: readonly string[];
};

/** The triangulation of a question (organisers and reviewers of the panel). */
export async function getTriangulation(actor: Actor, panelId: string, questionId: string, reads?: PanelReads): Promise<TriangulationView> {
  const access = await authorisePanel(actor, panelId, "read");
  const loaded = await loadTriangulation(panelId, questionId, reads);
  const computed = await runJob("triangulation", loaded.input);
  const t = jsonSafe(computed);
  const namesShown = await namesRevealed(actor, panelId, access.canManage);
  const panel = t.panel
    ? {
        ...t.panel,
        answers: t.panel.answers.map(({ invitationId: _hidden, ...a }) => (namesShown ? a : withoutHistory(a))),
        correction: jsonSafe(correctionSummary(computed.panel!.answers)),
      }
    : null;
  const warnings = legWarnings(loaded.question, loaded.baselineTarget, computed.panel?.corrected.figure ?? null);
  return { ...t, panel, questionId, weightRule: loaded.rule, namesShown, warnings };
}

/** Sets the panel's blend weight rule (organisers; audited). */
export async function setPanelBlendRule(
  actor: Actor,
  panelId: string,
  input: PanelBlendRuleInput,
): Promise<{ rule: PanelWeightRule; panelWeight: number | null; panelLeg: PanelLegChoice }> {
  const access = await authorisePanel(actor, panelId, "manage");
  const panelWeight = input.rule === "organiser" ? input.panelWeight! : null;
  const panelLeg: PanelLegChoice = input.panelLeg ?? (access.panel.panelLeg === "performance" ? "performance" : "equal");
  await db.$transaction(async (tx) => {
    await tx.panel.update({ where: { id: panelId }, data: { blendRule: input.rule, blendPanelWeight: panelWeight, panelLeg } });
    await recordAudit(tx, { actorId: access.actor.userId, panelId, action: "panel.blend-rule", detail: { fromRule: access.panel.blendRule, fromPanelWeight: access.panel.blendPanelWeight, rule: input.rule, panelWeight, panelLeg } });
  });
  return { rule: input.rule, panelWeight, panelLeg };
}

/** Sets one question's blend weight rule, or hands it back to the panel's (organisers; audited). */
export async function setQuestionBlendRule(
  actor: Actor,
  panelId: string,
  questionId: string,
  input: QuestionBlendRuleInput,
): Promise<{ rule: PanelWeightRule; panelWeight: number | null; from: "question" | "panel" }> {
  const access = await authorisePanel(actor, panelId, "manage");
  const q = await db.question.findFirst({ where: { id: questionId, panelId } });
  if (!q) throw new NotFoundError("The question");
  if (input.rule === "organiser" && input.panelWeight === undefined) throw new InvalidInputError([{ field: "panelWeight", message: "the organiser rule needs a panel weight" }]);
  const rule = input.rule === "panel" ? null : input.rule;
  const panelWeight = input.rule === "organiser" ? input.panelWeight! : null;
  await db.$transaction(async (tx) => {
    await tx.question.update({ where: { id: questionId }, data: { blendRule: rule, blendPanelWeight: panelWeight } });
    await recordAudit(tx, { actorId: access.actor.userId, panelId, action: "question.blend-rule", detail: { questionId, fromRule: q.blendRule ?? "panel", fromPanelWeight: q.blendPanelWeight, rule: input.rule, panelWeight } });
  });
  return effectiveRule(access.panel, { blendRule: rule, blendPanelWeight: panelWeight });
}
