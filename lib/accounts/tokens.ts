/**
 * Secret tokens: personal API tokens of organisers and invitation tokens of panelists.
 *
 * A token is 32 random bytes (256 bits) from `randomBytes`, written in base64url. Only its
 * SHA-256 digest (hex) is stored. A presented token is hashed, the row is found through the
 * unique index on the digest, and the stored digest is then compared with `timingSafeEqual`.
 * (Looking up a digest of a 256-bit random value leaks nothing useful through timing: an
 * attacker cannot choose inputs whose digests share a prefix with a stored one.)
 *
 * API tokens carry the prefix `trg_pat_` so that they are recognisable (in logs, in secret
 * scanners) and are never mistaken for an invitation token.
 */
import { createHash, randomBytes, timingSafeEqual } from "node:crypto";

export const API_TOKEN_PREFIX = "trg_pat_";

/** SHA-256 of a token, hex-encoded. */
export function hashToken(token: string): string {
  return createHash("sha256").update(token, "utf8").digest("hex");
}

/** True when `storedHash` is the digest of `token` (constant-time comparison). */
export function tokenMatches(token: string, storedHash: string): boolean {
  const a = Buffer.from(hashToken(token), "hex");
  const b = Buffer.from(storedHash, "hex");
  return a.length === b.length && timingSafeEqual(a, b);
}

/** A new invitation token (256 bits, base64url, 43 characters) and its digest. */
export function newInvitationToken(): { token: string; tokenHash: string } {
  const token = randomBytes(32).toString("base64url");
  return { token, tokenHash: hashToken(token) };
}

/** A new personal API token (`trg_pat_` + 256 bits in base64url) and its digest. */
export function newApiToken(): { token: string; tokenHash: string } {
  const token = API_TOKEN_PREFIX + randomBytes(32).toString("base64url");
  return { token, tokenHash: hashToken(token) };
}

/**
 * Personal API tokens expire: after `API_TOKEN_DEFAULT_DAYS` unless the organiser asks for fewer
 * or more days, at most `API_TOKEN_MAX_DAYS` (a leaked token stops working on its own).
 */
export const API_TOKEN_DEFAULT_DAYS = 90;
export const API_TOKEN_MAX_DAYS = 365;
const DAY_MS = 86_400_000;

/** When a token made at `createdAt` for `days` days expires. */
export function apiTokenExpiresAt(createdAt: Date, days = API_TOKEN_DEFAULT_DAYS): Date {
  return new Date(createdAt.getTime() + days * DAY_MS);
}

/** A stored token's expiry (tokens from before expiry was stored: the default after creation). */
export function apiTokenExpiry(row: { createdAt: Date; expiresAt: Date | null }): Date {
  return row.expiresAt ?? apiTokenExpiresAt(row.createdAt);
}
