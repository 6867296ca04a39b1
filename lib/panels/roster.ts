/**
 * The expert roster: people an organiser invites again and again (name, e-mail, group). Each
 * organiser has their own roster; track records attach to roster members later.
 */
import { db } from "@/lib/db";
import { ConflictError, NotFoundError } from "@/lib/errors";
import type { Actor } from "@/lib/accounts/actor";
import { requireOrganiser } from "@/lib/accounts/users";
import type { RosterMember } from "@/lib/generated/prisma/client";
import type { RosterMemberInput, RosterMemberUpdate } from "@/lib/validation/inputs";
import { MAX_ROSTER_MEMBERS, requireWithinLimit } from "@/lib/validation/limits";

export interface RosterMemberView {
  readonly id: string;
  readonly name: string;
  readonly email: string;
  readonly group: string;
  readonly createdAt: string;
}

function view(m: RosterMember): RosterMemberView {
  return { id: m.id, name: m.name, email: m.email, group: m.group, createdAt: m.createdAt.toISOString() };
}

async function ownMember(ownerId: string, memberId: string): Promise<RosterMember> {
  const m = await db.rosterMember.findFirst({ where: { id: memberId, ownerId } });
  if (!m) throw new NotFoundError("The roster member");
  return m;
}

async function assertEmailFree(ownerId: string, email: string, exceptId?: string): Promise<void> {
  const clash = await db.rosterMember.findUnique({ where: { ownerId_email: { ownerId, email } } });
  if (clash && clash.id !== exceptId) throw new ConflictError("duplicate-roster-member", `${email} is already on your roster (${clash.name}).`);
}

/** The organiser's roster, by group then name. */
export async function listRoster(actor: Actor): Promise<RosterMemberView[]> {
  const user = requireOrganiser(actor);
  const rows = await db.rosterMember.findMany({ where: { ownerId: user.userId }, orderBy: [{ group: "asc" }, { name: "asc" }] });
  return rows.map(view);
}

/** Adds a person. @throws ConflictError when the e-mail is already on the roster. */
export async function addRosterMember(actor: Actor, input: RosterMemberInput): Promise<RosterMemberView> {
  const user = requireOrganiser(actor);
  const email = input.email.trim().toLowerCase();
  await assertEmailFree(user.userId, email);
  const current = await db.rosterMember.count({ where: { ownerId: user.userId } });
  requireWithinLimit({ current, adding: 1, max: MAX_ROSTER_MEMBERS }, "email", "people", "A roster");
  return view(await db.rosterMember.create({ data: { ownerId: user.userId, name: input.name, email, group: input.group } }));
}

/** Changes a person's name, e-mail or group. */
export async function updateRosterMember(actor: Actor, memberId: string, input: RosterMemberUpdate): Promise<RosterMemberView> {
  const user = requireOrganiser(actor);
  await ownMember(user.userId, memberId);
  const email = input.email?.trim().toLowerCase();
  if (email) await assertEmailFree(user.userId, email, memberId);
  return view(await db.rosterMember.update({ where: { id: memberId }, data: { ...input, email } }));
}

/**
 * Removes a person from the roster. @throws ConflictError when they have been invited to a
 * panel (their answers and track record refer to them).
 */
export async function deleteRosterMember(actor: Actor, memberId: string): Promise<{ id: string; deleted: true }> {
  const user = requireOrganiser(actor);
  await ownMember(user.userId, memberId);
  if ((await db.invitation.count({ where: { rosterMemberId: memberId } })) > 0) {
    throw new ConflictError("roster-member-invited", "This person has been invited to a panel; their answers refer to them, so they stay on the roster.");
  }
  await db.rosterMember.delete({ where: { id: memberId } });
  return { id: memberId, deleted: true };
}
