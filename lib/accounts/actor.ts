/**
 * Who is asking. Every domain service takes an `Actor` as its first argument and decides
 * from it what may be done (lib/panels/access.ts). Route handlers obtain the actor from the
 * request (lib/http/context.ts); pages from the session (lib/session.ts) or from the
 * invitation token in the link `/p/<token>` ({@link actorFromInvitationToken}).
 */
import { db, statements } from "@/lib/db";
import { NotAuthenticatedError } from "@/lib/errors";
import { API_TOKEN_PREFIX, apiTokenExpiry, hashToken, tokenMatches } from "./tokens";

export type UserRole = "organiser" | "reviewer";

/** A signed-in organiser or reviewer (session cookie or personal API token). */
export interface UserActor {
  readonly kind: "user";
  readonly userId: string;
  readonly role: UserRole;
  readonly name: string;
  readonly email: string;
  /** How the request was authenticated: only a session may manage tokens and the password. */
  readonly via: "session" | "token";
}

/** A panelist, known only through their invitation (one panel). */
export interface PanelistActor {
  readonly kind: "panelist";
  readonly invitationId: string;
  readonly panelId: string;
  readonly pseudonym: string;
}

export type Actor = UserActor | PanelistActor;

function toUserActor(u: { id: string; role: string; name: string; email: string }, via: UserActor["via"]): UserActor {
  return { kind: "user", userId: u.id, role: u.role === "reviewer" ? "reviewer" : "organiser", name: u.name, email: u.email, via };
}

/**
 * "Last used" / "last seen" times are kept to the minute: refreshing them on every request would
 * add a database write to every answer (a burst of panelists answering would pay it each time).
 */
const LAST_SEEN_RESOLUTION_MS = 60_000;
function isStale(at: Date | null): boolean {
  return at === null || Date.now() - at.getTime() >= LAST_SEEN_RESOLUTION_MS;
}

/** The actor for a user id (admin CLI, demo loader); null when the user no longer exists. */
export async function actorFromUserId(userId: string): Promise<UserActor | null> {
  const user = await db.user.findUnique({ where: { id: userId } });
  return user ? toUserActor(user, "session") : null;
}

/**
 * The actor of a session (the JWT's subject and session generation, lib/auth.ts); null when the
 * user no longer exists or the session has been ended since (sign-out or a password change
 * raised `User.sessionGeneration`). Checked on every request, in the database, so it holds on
 * every instance.
 */
export async function actorFromSession(userId: unknown, generation: unknown): Promise<UserActor | null> {
  if (typeof userId !== "string" || typeof generation !== "number") return null;
  const user = await db.user.findUnique({ where: { id: userId } });
  return user && user.sessionGeneration === generation ? toUserActor(user, "session") : null;
}

/**
 * The actor for a personal API token (`trg_pat_…`).
 * @throws NotAuthenticatedError when the token is unknown, revoked or expired.
 */
export async function actorFromApiToken(token: string): Promise<UserActor> {
  const row = await db.apiToken.findUnique({ where: { tokenHash: hashToken(token) }, include: { user: true } });
  if (!row || !tokenMatches(token, row.tokenHash) || row.revokedAt) {
    throw new NotAuthenticatedError("The API token is unknown or has been revoked.");
  }
  if (apiTokenExpiry(row).getTime() <= Date.now()) throw new NotAuthenticatedError("The API token has expired; create a new one.");
  if (isStale(row.lastUsedAt)) await db.apiToken.update({ where: { id: row.id }, data: { lastUsedAt: new Date() } });
  return toUserActor(row.user, "token");
}

/**
 * The actor for an invitation token (the secret in `/p/<token>`, or a Bearer token on the API).
 * @throws NotAuthenticatedError when the token is unknown, revoked (also: replaced by a
 *   re-issued one) or expired; the message says which and what to do.
 */
export async function actorFromInvitationToken(token: string): Promise<PanelistActor> {
  // A hand-written statement (lib/db-statements.ts): this lookup runs on every panelist request
  // (a burst of answers), where Prisma's per-call query compilation was the largest cost (bench/load.ts).
  const row = await statements.invitationByTokenHash(hashToken(token));
  if (!row || !tokenMatches(token, row.tokenHash)) {
    throw new NotAuthenticatedError("This invitation link is not valid (it may have been replaced by a newer one).");
  }
  if (row.revokedAt) throw new NotAuthenticatedError("This invitation has been withdrawn by the organiser.");
  if (row.expiresAt.getTime() <= Date.now()) {
    throw new NotAuthenticatedError("This invitation has expired; ask the organiser for a new link.");
  }
  if (isStale(row.lastSeenAt)) await statements.touchInvitation(row.id, new Date());
  return { kind: "panelist", invitationId: row.id, panelId: row.panelId, pseudonym: row.pseudonym };
}

/** The actor for a Bearer token of either kind (API tokens carry the `trg_pat_` prefix). */
export function actorFromBearerToken(token: string): Promise<Actor> {
  return token.startsWith(API_TOKEN_PREFIX) ? actorFromApiToken(token) : actorFromInvitationToken(token);
}
