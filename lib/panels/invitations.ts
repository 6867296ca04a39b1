/**
 * Invitations: a panelist's private link to one panel. The token (256 random bits, base64url)
 * is returned once, when the invitation is created or re-issued; only its SHA-256 digest is
 * stored (lib/accounts/tokens.ts). The link is `/p/<token>`; on the API the token is a Bearer
 * token. Re-issuing replaces the digest, so the old link stops working at once.
 *
 * The list shows names and status but never pseudonyms: linking a pseudonym to a name is
 * what revealIdentities (audited) is for.
 */
import { randomInt } from "node:crypto";
import { db } from "@/lib/db";
import { ConflictError, NotFoundError } from "@/lib/errors";
import type { Actor } from "@/lib/accounts/actor";
import { newInvitationToken } from "@/lib/accounts/tokens";
import type { InvitationCreate, InvitationReissue } from "@/lib/validation/inputs";
import { MAX_PANELISTS_PER_PANEL, requireWithinLimit } from "@/lib/validation/limits";
import { authorisePanel } from "./access";
import { recordAudit } from "./audit";
import { mailInvitations, type Delivery } from "./messages";

export type InvitationStatus = "active" | "revoked" | "expired";

export interface InvitationView {
  readonly id: string;
  readonly rosterMemberId: string;
  readonly name: string;
  readonly email: string;
  readonly group: string;
  readonly status: InvitationStatus;
  readonly expiresAt: string;
  readonly createdAt: string;
}

/** An invitation with its secret, returned only by create and re-issue. */
export interface IssuedInvitation extends InvitationView {
  readonly token: string;
  /** Path of the panelist's link (prefix the site's address). */
  readonly link: string;
  /** How the link was e-mailed, when it was asked for (input `send`). */
  readonly delivery?: Delivery;
}

/** `issued` with each one's delivery, after e-mailing them when `send` (lib/panels/messages.ts). */
async function mailed<T extends IssuedInvitation>(panelId: string, title: string, send: boolean, site: string, issued: T[]): Promise<T[]> {
  if (!send || issued.length === 0) return issued;
  const deliveries = await mailInvitations(panelId, title, site, issued);
  return issued.map((i, k) => ({ ...i, delivery: deliveries[k] }));
}

const DAY_MS = 24 * 60 * 60 * 1000;

function status(i: { revokedAt: Date | null; expiresAt: Date }, now = Date.now()): InvitationStatus {
  if (i.revokedAt) return "revoked";
  return i.expiresAt.getTime() <= now ? "expired" : "active";
}

function view(i: {
  id: string;
  rosterMemberId: string;
  revokedAt: Date | null;
  expiresAt: Date;
  createdAt: Date;
  rosterMember: { name: string; email: string; group: string };
}): InvitationView {
  return {
    id: i.id,
    rosterMemberId: i.rosterMemberId,
    name: i.rosterMember.name,
    email: i.rosterMember.email,
    group: i.rosterMember.group,
    status: status(i),
    expiresAt: i.expiresAt.toISOString(),
    createdAt: i.createdAt.toISOString(),
  };
}

const PSEUDONYM_ALPHABET = "ABCDEFGHJKLMNPQRSTUVWXYZ23456789"; // no I, O, 0, 1

/**
 * A random pseudonym such as "Panelist K7Q", not among `taken`. Random rather than sequential,
 * so that the order in which people were invited does not give away who is who.
 */
export function randomPseudonym(taken: ReadonlySet<string>): string {
  for (;;) {
    let code = "";
    for (let i = 0; i < 3; i++) code += PSEUDONYM_ALPHABET[randomInt(PSEUDONYM_ALPHABET.length)];
    const p = `Panelist ${code}`;
    if (!taken.has(p)) return p;
  }
}

/** The panel's invitations (organisers of the panel). */
export async function listInvitations(actor: Actor, panelId: string): Promise<InvitationView[]> {
  await authorisePanel(actor, panelId, "manage");
  const rows = await db.invitation.findMany({ where: { panelId }, include: { rosterMember: true }, orderBy: { createdAt: "asc" } });
  return rows.map(view).sort((a, b) => a.name.localeCompare(b.name));
}

/**
 * Invites members of the organiser's roster. Returns each new invitation with its token and
 * link (shown once), e-mailed to each person when `input.send` (links on `site`). @throws NotFoundError for an id not on the organiser's roster,
 * ConflictError when someone is already invited or the panel is finished.
 */
export async function createInvitations(actor: Actor, panelId: string, input: InvitationCreate, site = ""): Promise<IssuedInvitation[]> {
  const access = await authorisePanel(actor, panelId, "manage");
  if (access.panel.status === "finished") throw new ConflictError("panel-finished", "The panel is finished.");
  const ids = [...new Set(input.rosterMemberIds)];
  const members = await db.rosterMember.findMany({ where: { id: { in: ids }, ownerId: access.actor.userId } });
  if (members.length !== ids.length) throw new NotFoundError("A roster member");
  const expiresAt = new Date(Date.now() + input.expiresInDays * DAY_MS);
  const issued = await db.$transaction(async (tx) => {
    const already = await tx.invitation.findMany({ where: { panelId, rosterMemberId: { in: ids } }, include: { rosterMember: true } });
    if (already.length > 0) {
      throw new ConflictError("already-invited", `Already invited: ${already.map((a) => a.rosterMember.name).join(", ")}. Re-issue their link instead.`);
    }
    const taken = new Set((await tx.invitation.findMany({ where: { panelId }, select: { pseudonym: true } })).map((i) => i.pseudonym));
    requireWithinLimit({ current: taken.size, adding: ids.length, max: MAX_PANELISTS_PER_PANEL }, "rosterMemberIds", "panelists (invitations, revoked ones included)", "A panel");
    const issued: IssuedInvitation[] = [];
    for (const id of ids) {
      const { token, tokenHash } = newInvitationToken();
      const pseudonym = randomPseudonym(taken);
      taken.add(pseudonym);
      const row = await tx.invitation.create({
        data: { panelId, rosterMemberId: id, pseudonym, tokenHash, expiresAt },
        include: { rosterMember: true },
      });
      issued.push({ ...view(row), token, link: `/p/${token}` });
    }
    await recordAudit(tx, { actorId: access.actor.userId, panelId, action: "invitation.created", detail: { count: issued.length } });
    return issued;
  });
  return mailed(panelId, access.panel.title, input.send, site, issued);
}

async function ownInvitation(panelId: string, invitationId: string) {
  const row = await db.invitation.findFirst({ where: { id: invitationId, panelId }, include: { rosterMember: true } });
  if (!row) throw new NotFoundError("The invitation");
  return row;
}

/** Withdraws an invitation: its link stops working; answers already given stay. */
export async function revokeInvitation(actor: Actor, panelId: string, invitationId: string): Promise<InvitationView> {
  const access = await authorisePanel(actor, panelId, "manage");
  const row = await ownInvitation(panelId, invitationId);
  if (row.revokedAt) return view(row);
  const updated = await db.$transaction(async (tx) => {
    const u = await tx.invitation.update({ where: { id: row.id }, data: { revokedAt: new Date() }, include: { rosterMember: true } });
    await recordAudit(tx, { actorId: access.actor.userId, panelId, action: "invitation.revoked", detail: { invitationId } });
    return u;
  });
  return view(updated);
}

/**
 * Gives the invitation a new token (and a new expiry), which also lifts a revocation; the old
 * link stops working at once. Returns the new token once, e-mailed when `input.send` (link on `site`).
 */
export async function reissueInvitation(
  actor: Actor,
  panelId: string,
  invitationId: string,
  input: InvitationReissue,
  site = "",
): Promise<IssuedInvitation> {
  const access = await authorisePanel(actor, panelId, "manage");
  if (access.panel.status === "finished") throw new ConflictError("panel-finished", "The panel is finished.");
  const row = await ownInvitation(panelId, invitationId);
  const { token, tokenHash } = newInvitationToken();
  const updated = await db.$transaction(async (tx) => {
    const u = await tx.invitation.update({
      where: { id: row.id },
      data: { tokenHash, revokedAt: null, expiresAt: new Date(Date.now() + input.expiresInDays * DAY_MS) },
      include: { rosterMember: true },
    });
    await recordAudit(tx, { actorId: access.actor.userId, panelId, action: "invitation.reissued", detail: { invitationId } });
    return u;
  });
  const [issued] = await mailed(panelId, access.panel.title, input.send, site, [{ ...view(updated), token, link: `/p/${token}` }]);
  return issued;
}
