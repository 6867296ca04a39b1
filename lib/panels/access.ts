/**
 * The one place that resolves "who is asking and what may they do with this panel".
 *
 * - An organiser reaches the panels they own, and panels shared with them as organiser
 *   (co-organiser: full control); a panel shared with an organiser as reviewer is read-only.
 * - A reviewer reaches only panels shared with them, read-only.
 * - A share names an e-mail (lib/panels/panels.ts): it applies to the account with that e-mail,
 *   matched here on every request, so a share made before the account existed works once it does.
 * - A panelist reaches only their own invitation's panel, and only through the panelist
 *   services (lib/panels/answers.ts, lib/panels/feedback.ts): the organiser-side services
 *   refuse panelists with 403 whatever the panel.
 * A panel the user cannot reach is reported as not found (404), so its existence is not
 * revealed; a panel the user can read but not change gives 403 on changes.
 *
 * Every way into a panel's state passes here, so this is also where rounds whose deadline has
 * passed are closed ({@link settleDeadlines}), before the caller reads anything: once access
 * is granted for {@link authorisePanel} and {@link authorisePanelist}, for every reachable panel
 * in {@link authoriseUser}.
 */
import { db } from "@/lib/db";
import { ForbiddenError, NotFoundError } from "@/lib/errors";
import type { Actor, PanelistActor, UserActor } from "@/lib/accounts/actor";
import type { Panel, Prisma } from "@/lib/generated/prisma/client";
import { settleDeadlines } from "./round-closing";

/** What the actor is to the panel. */
export type PanelRole = "owner" | "organiser" | "reviewer";

export interface PanelAccess {
  readonly actor: UserActor;
  readonly panel: Panel;
  readonly role: PanelRole;
  /** owner or co-organiser */
  readonly canManage: boolean;
}

/** What the caller needs: "read" (reports, statistics) or "manage" (everything else). */
export type PanelNeed = "read" | "manage";

/**
 * Resolves the actor's access to a panel and checks it covers `need`.
 * @throws ForbiddenError for a panelist (any panel), or for a read-only user asking to manage.
 * @throws NotFoundError when the panel does not exist or the user cannot reach it.
 */
export async function authorisePanel(actor: Actor, panelId: string, need: PanelNeed): Promise<PanelAccess> {
  if (actor.kind !== "user") throw new ForbiddenError("Panelists can only use the panelist pages and /api/v1/panelist.");
  const panel = await db.panel.findUnique({ where: { id: panelId }, include: { shares: { where: { email: actor.email } } } });
  if (!panel) throw new NotFoundError("The panel");
  const share = panel.shares[0];
  let role: PanelRole | null = null;
  if (actor.role === "organiser" && panel.ownerId === actor.userId) role = "owner";
  else if (share) role = actor.role === "organiser" && share.role === "organiser" ? "organiser" : "reviewer";
  if (!role) throw new NotFoundError("The panel");
  const canManage = role === "owner" || role === "organiser";
  if (need === "manage" && !canManage) throw new ForbiddenError("You have read-only access to this panel.");
  await settleDeadlines(panelId);
  const { shares: _shares, ...plain } = panel;
  return { actor, panel: plain, role, canManage };
}

/**
 * The actor as a user, with the panels they can reach (owned, or shared with them) as a filter,
 * for lists of panels; the overdue rounds of all of them are closed first.
 * @throws ForbiddenError for a panelist.
 */
export async function authoriseUser(actor: Actor): Promise<{ actor: UserActor; reachable: Prisma.PanelWhereInput }> {
  if (actor.kind !== "user") throw new ForbiddenError("Panelists can only use the panelist pages and /api/v1/panelist.");
  const reachable: Prisma.PanelWhereInput =
    actor.role === "organiser"
      ? { OR: [{ ownerId: actor.userId }, { shares: { some: { email: actor.email } } }] }
      : { shares: { some: { email: actor.email } } };
  await settleDeadlines(reachable);
  return { actor, reachable };
}

/**
 * The actor as a panelist, with the overdue rounds of their panel closed.
 * @throws ForbiddenError for a user (organisers do not answer).
 */
export async function authorisePanelist(actor: Actor): Promise<PanelistActor> {
  const me = requirePanelist(actor);
  await settleDeadlines(me.panelId);
  return me;
}

/**
 * The actor as a panelist, without closing overdue rounds: only for the answer path, whose one
 * statement reads the open round's deadline and calls {@link authorisePanelist} when it has
 * passed. Everything else uses authorisePanelist.
 * @throws ForbiddenError for a user (organisers do not answer).
 */
export function requirePanelist(actor: Actor): PanelistActor {
  if (actor.kind !== "panelist") {
    throw new ForbiddenError("Only panelists (with an invitation token) can use this; organisers and reviewers do not answer.");
  }
  return actor;
}
