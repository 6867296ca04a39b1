/**
 * Accounts of organisers and reviewers, and the personal API tokens of organisers.
 */
import { db, isSerializationFailure } from "@/lib/db";
import { ConflictError, ForbiddenError, InvalidInputError, NotFoundError } from "@/lib/errors";
import type { Actor, UserActor, UserRole } from "./actor";
import { dummyPasswordHash, hashPassword, verifyPassword } from "./passwords";
import { apiTokenExpiresAt, apiTokenExpiry, newApiToken } from "./tokens";

/** A user as shown to others (never the password hash). */
export interface UserView {
  readonly id: string;
  readonly email: string;
  readonly name: string;
  readonly role: UserRole;
  readonly createdAt: string;
}

export interface NewUser {
  readonly email: string;
  readonly name: string;
  readonly password: string;
  readonly role?: UserRole;
}

function view(u: { id: string; email: string; name: string; role: string; createdAt: Date }): UserView {
  return { id: u.id, email: u.email, name: u.name, role: u.role === "reviewer" ? "reviewer" : "organiser", createdAt: u.createdAt.toISOString() };
}

/** E-mail addresses are compared case-insensitively: they are stored lower-cased. */
export function normaliseEmail(email: string): string {
  return email.trim().toLowerCase();
}

/**
 * Creates an organiser or reviewer account (admin CLI; no actor: whoever runs the CLI owns
 * the database). @throws ConflictError when the e-mail is taken.
 */
export async function createUser(input: NewUser): Promise<UserView> {
  const email = normaliseEmail(input.email);
  if (await db.user.findUnique({ where: { email } })) throw new ConflictError("account-exists", `A user with e-mail ${email} already exists.`);
  const passwordHash = await hashPassword(input.password);
  const user = await db.user.create({ data: { email, name: input.name.trim(), role: input.role ?? "organiser", passwordHash } });
  return view(user);
}

/** True when at least one organiser account exists (the first-run page hides itself then). */
export async function hasOrganiser(): Promise<boolean> {
  return (await db.user.count({ where: { role: "organiser" } })) > 0;
}

const ORGANISER_EXISTS = "An organiser already exists; sign in, or ask an organiser for an account.";

/**
 * Creates the first organiser: works only while no organiser exists (the /setup page and
 * `POST /api/v1/setup`). The check and the insert run in one serializable transaction, so that
 * sign-ups racing on an empty database make one organiser: SQLite runs write transactions one at
 * a time; PostgreSQL aborts all but one of the overlapping ones (serialization failure, Prisma
 * P2034), and those are told that an organiser exists.
 * @throws ConflictError when an organiser already exists.
 */
export async function createFirstOrganiser(input: Omit<NewUser, "role">): Promise<UserView> {
  const passwordHash = await hashPassword(input.password);
  const email = normaliseEmail(input.email);
  const user = await db
    .$transaction(
      async (tx) => {
        if ((await tx.user.count({ where: { role: "organiser" } })) > 0) throw new ConflictError("account-exists", ORGANISER_EXISTS);
        if (await tx.user.findUnique({ where: { email } })) throw new ConflictError("account-exists", `A user with e-mail ${email} already exists.`);
        return tx.user.create({ data: { email, name: input.name.trim(), role: "organiser", passwordHash } });
      },
      { isolationLevel: "Serializable" },
    )
    .catch((err: unknown) => {
      if (isSerializationFailure(err)) throw new ConflictError("account-exists", ORGANISER_EXISTS);
      throw err;
    });
  return view(user);
}

/**
 * Checks an e-mail and password (next-auth's credentials provider). Returns the user and the
 * session generation a new session belongs to (lib/accounts/actor.ts, actorFromSession), or null
 * when either is wrong; an unknown e-mail costs the same scrypt work as a wrong password.
 */
export async function authenticate(email: string, password: string): Promise<(UserView & { sessionGeneration: number }) | null> {
  const user = await db.user.findUnique({ where: { email: normaliseEmail(email) } });
  if (!user) {
    await verifyPassword(password, await dummyPasswordHash());
    return null;
  }
  return (await verifyPassword(password, user.passwordHash)) ? { ...view(user), sessionGeneration: user.sessionGeneration } : null;
}

/** The signed-in user's own account. @throws ForbiddenError for a panelist. */
export async function getAccount(actor: Actor): Promise<UserView> {
  const user = requireUser(actor);
  const row = await db.user.findUnique({ where: { id: user.userId } });
  if (!row) throw new NotFoundError("The account");
  return view(row);
}

/** The actor as an organiser. @throws ForbiddenError for a reviewer or a panelist. */
export function requireOrganiser(actor: Actor): UserActor {
  if (actor.kind !== "user" || actor.role !== "organiser") throw new ForbiddenError("Only organisers may do this.");
  return actor;
}

/**
 * The actor as an organiser signed in with a session (not an API token): managing tokens and the
 * password needs the person, so that a leaked token cannot make itself a successor or lock its
 * owner out. @throws ForbiddenError otherwise.
 */
function requireSessionOrganiser(actor: Actor): UserActor {
  const user = requireOrganiser(actor);
  if (user.via !== "session") throw new ForbiddenError("API tokens are created and revoked by a signed-in organiser, not with an API token.");
  return user;
}

/** The actor as a signed-in user. @throws ForbiddenError for a panelist. */
export function requireUser(actor: Actor): UserActor {
  if (actor.kind !== "user") throw new ForbiddenError("Panelists have no account; this needs an organiser or reviewer.");
  return actor;
}

export interface ApiTokenView {
  readonly id: string;
  readonly name: string;
  readonly createdAt: string;
  readonly lastUsedAt: string | null;
  readonly revokedAt: string | null;
  readonly expiresAt: string;
}

function tokenView(t: { id: string; name: string; createdAt: Date; lastUsedAt: Date | null; revokedAt: Date | null; expiresAt: Date | null }): ApiTokenView {
  return {
    id: t.id,
    name: t.name,
    createdAt: t.createdAt.toISOString(),
    lastUsedAt: t.lastUsedAt?.toISOString() ?? null,
    revokedAt: t.revokedAt?.toISOString() ?? null,
    expiresAt: apiTokenExpiry(t).toISOString(),
  };
}

/**
 * Creates a personal API token for the organiser signed in with a session, valid for
 * `expiresInDays` (lib/accounts/tokens.ts: default and maximum). The returned `token` is shown
 * once: only its SHA-256 digest is stored.
 */
export async function createApiToken(actor: Actor, input: { name: string; expiresInDays?: number }): Promise<ApiTokenView & { token: string }> {
  const user = requireSessionOrganiser(actor);
  return storeApiToken(user.userId, input);
}

async function storeApiToken(userId: string, input: { name: string; expiresInDays?: number }): Promise<ApiTokenView & { token: string }> {
  const { token, tokenHash } = newApiToken();
  const createdAt = new Date();
  const expiresAt = apiTokenExpiresAt(createdAt, input.expiresInDays);
  const row = await db.apiToken.create({ data: { userId, name: input.name.trim(), tokenHash, createdAt, expiresAt } });
  return { ...tokenView(row), token };
}

/**
 * Creates a personal API token for the organiser with this e-mail, for `triangulate create-token`
 * on the server: whoever can run the CLI there can already change the database, so no password
 * is asked. Over the API only a session may create tokens (createApiToken).
 * @throws NotFoundError when no organiser has this e-mail (reviewers have no API tokens).
 */
export async function createApiTokenFor(email: string, input: { name: string; expiresInDays?: number }): Promise<ApiTokenView & { token: string }> {
  const user = await db.user.findUnique({ where: { email: normaliseEmail(email) } });
  if (!user || user.role !== "organiser") throw new NotFoundError(`An organiser with e-mail ${normaliseEmail(email)}`);
  return storeApiToken(user.id, input);
}

/** The organiser's API tokens (never the tokens themselves), newest first. */
export async function listApiTokens(actor: Actor): Promise<ApiTokenView[]> {
  const user = requireOrganiser(actor);
  const rows = await db.apiToken.findMany({ where: { userId: user.userId }, orderBy: { createdAt: "desc" } });
  return rows.map(tokenView);
}

/**
 * Revokes one of the organiser's API tokens (signed in with a session) (idempotent: revoking twice keeps the first time).
 * @throws NotFoundError when the token is not the organiser's.
 */
export async function revokeApiToken(actor: Actor, tokenId: string): Promise<ApiTokenView> {
  const user = requireSessionOrganiser(actor);
  const row = await db.apiToken.findFirst({ where: { id: tokenId, userId: user.userId } });
  if (!row) throw new NotFoundError("The API token");
  const updated = row.revokedAt ? row : await db.apiToken.update({ where: { id: row.id }, data: { revokedAt: new Date() } });
  return tokenView(updated);
}

/**
 * Ends every session of the user (sign-out, lib/auth.ts): raises `User.sessionGeneration`, so
 * that every session cookie issued before, copies included, is refused from now on
 * (lib/accounts/actor.ts, actorFromSession).
 */
export async function endSessions(userId: string, generation: number): Promise<void> {
  // Only from a current session: a copy of an already ended one cannot end the newer ones.
  await db.user.updateMany({ where: { id: userId, sessionGeneration: generation }, data: { sessionGeneration: { increment: 1 } } });
}

/**
 * Changes the password of the user signed in with a session (not an API token), after checking
 * the current one, and ends every session of the user (sign in again with the new password).
 * The caller counts the attempt against the sign-in limits first (lib/http/rate-limit.ts).
 * @throws InvalidInputError when the current password is wrong.
 */
export async function changePassword(actor: Actor, input: { currentPassword: string; newPassword: string }): Promise<{ changed: true }> {
  const user = requireUser(actor);
  if (user.via !== "session") throw new ForbiddenError("The password is changed by the signed-in user, not with an API token.");
  const row = await db.user.findUnique({ where: { id: user.userId } });
  if (!row) throw new NotFoundError("The account");
  if (!(await verifyPassword(input.currentPassword, row.passwordHash))) {
    throw new InvalidInputError([{ field: "currentPassword", message: "is not your current password" }]);
  }
  const passwordHash = await hashPassword(input.newPassword);
  await db.user.update({ where: { id: row.id }, data: { passwordHash, sessionGeneration: { increment: 1 } } });
  return { changed: true };
}
