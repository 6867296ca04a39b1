/**
 * Small read models for the triangulation pages that the services do not expose on their own.
 * - The panel's blend weight rule (the default of every question that has none of its own),
 *   for the form on the organiser's panel page.
 * - What a viewer may see of the bias correction (THREATS.md, "Pseudonyms matched to named
 *   track records"). A bias factor, its unshrunk value, its credibility, the number of recorded
 *   outcomes behind it and the corrected answer all come from one person's history across
 *   panels, and the same history gives the named track records (`/api/v1/track-records`); shown
 *   next to a pseudonym they name it. So while a panel's names are hidden, answers are shown
 *   without them, and the correction only as the panel's aggregate: how many panelists had a
 *   usable track record and the mean factor applied. Per-person figures appear only for an
 *   organiser of the panel who has revealed its identities (an audited action).
 */
import { db } from "@/lib/db";
import type { Actor } from "@/lib/accounts/actor";
import { NotFoundError } from "@/lib/errors";
import { WEIGHT_RULES, type PanelLegChoice, type PanelWeightRule } from "@/lib/validation/triangulation-inputs";
import { authorisePanel } from "../panels/access";
import type { JsonSafe } from "../panels/json";
import type { CorrectedAnswer } from "./triangulation";

export interface PanelBlendRuleView {
  readonly rule: PanelWeightRule;
  /** The panel's weight under the organiser rule; null otherwise. */
  readonly panelWeight: number | null;
  /** Questions with a rule of their own (they do not follow the panel's). */
  readonly questionsWithOwnRule: number;
  /** The panel leg of three-point shared questions: equal, or Cooke's performance-weighted pool. */
  readonly panelLeg: PanelLegChoice;
  /** Calibration questions on the panel (0: the panel-leg choice is not offered). */
  readonly calibrationQuestions: number;
}

const isRule = (r: string): r is PanelWeightRule => (WEIGHT_RULES as readonly string[]).includes(r);

/** The panel's blend weight rule (organisers and reviewers of the panel). */
export async function getPanelBlendRule(actor: Actor, panelId: string): Promise<PanelBlendRuleView> {
  await authorisePanel(actor, panelId, "read");
  const panel = await db.panel.findUnique({ where: { id: panelId }, select: { blendRule: true, blendPanelWeight: true, panelLeg: true } });
  if (!panel) throw new NotFoundError("The panel");
  const own = await db.question.count({ where: { panelId, blendRule: { not: null } } });
  const calibrationQuestions = await db.question.count({ where: { panelId, calibration: true } });
  return {
    rule: isRule(panel.blendRule) ? panel.blendRule : "equal",
    panelWeight: panel.blendPanelWeight,
    questionsWithOwnRule: own,
    panelLeg: panel.panelLeg === "performance" ? "performance" : "equal",
    calibrationQuestions,
  };
}

/**
 * Whether the actor sees names and per-person figures on this panel: an organiser of the panel
 * (`canManage`) who has revealed its identities (audit action `identities.revealed`).
 */
export async function namesRevealed(actor: Actor, panelId: string, canManage: boolean): Promise<boolean> {
  if (!canManage || actor.kind !== "user") return false;
  return (await db.auditEvent.count({ where: { panelId, actorId: actor.userId, action: "identities.revealed" } })) > 0;
}

/** The bias correction of a panel as one aggregate (shown whether or not names are). */
export interface CorrectionSummary {
  /** Panelists whose factor rests on at least one recorded outcome. */
  readonly panelistsWithRecord: number;
  /** Mean of the factors applied to the final answers (1 for a panelist without a record); null without answers. */
  readonly meanFactor: number | null;
}

export function correctionSummary(answers: readonly Pick<CorrectedAnswer, "factor" | "nOutcomes">[]): CorrectionSummary {
  return {
    panelistsWithRecord: answers.filter((a) => a.nOutcomes > 0).length,
    meanFactor: answers.length === 0 ? null : answers.reduce((s, a) => s + a.factor, 0) / answers.length,
  };
}

type OwnFigures = "pseudonym" | "value" | "low" | "high" | "fromRound";

/** An answer as shown while names are hidden: the panelist's own figures, nothing from their history. */
export type AnswerWithoutHistory = Pick<JsonSafe<CorrectedAnswer>, OwnFigures>;

export function withoutHistory<T extends Pick<JsonSafe<CorrectedAnswer>, OwnFigures>>(a: T): Pick<T, OwnFigures> {
  return { pseudonym: a.pseudonym, value: a.value, low: a.low, high: a.high, fromRound: a.fromRound };
}
