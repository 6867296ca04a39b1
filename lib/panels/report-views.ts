/**
 * Small read models for the triangulation pages that the services do not expose on their own.
 * - The panel's blend weight rule (the default of every question that has none of its own),
 *   for the form on the organiser's panel page.
 */
import { db } from "@/lib/db";
import type { Actor } from "@/lib/accounts/actor";
import { NotFoundError } from "@/lib/errors";
import { WEIGHT_RULES, type PanelWeightRule } from "@/lib/validation/triangulation-inputs";
import { authorisePanel } from "./access";

export interface PanelBlendRuleView {
  readonly rule: PanelWeightRule;
  /** The panel's weight under the organiser rule; null otherwise. */
  readonly panelWeight: number | null;
  /** Questions with a rule of their own (they do not follow the panel's). */
  readonly questionsWithOwnRule: number;
}

const isRule = (r: string): r is PanelWeightRule => (WEIGHT_RULES as readonly string[]).includes(r);

/** The panel's blend weight rule (organisers and reviewers of the panel). */
export async function getPanelBlendRule(actor: Actor, panelId: string): Promise<PanelBlendRuleView> {
  await authorisePanel(actor, panelId, "read");
  const panel = await db.panel.findUnique({ where: { id: panelId }, select: { blendRule: true, blendPanelWeight: true } });
  if (!panel) throw new NotFoundError("The panel");
  const own = await db.question.count({ where: { panelId, blendRule: { not: null } } });
  return { rule: isRule(panel.blendRule) ? panel.blendRule : "equal", panelWeight: panel.blendPanelWeight, questionsWithOwnRule: own };
}
