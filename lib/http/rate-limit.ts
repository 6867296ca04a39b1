/**
 * Fixed-window rate limits (a counter per key per window; the window starts at the key's first
 * hit). Exceeding a limit gives 429 problem+json with `Retry-After` (seconds to the window's end).
 *
 * The counters live in the database (table "RateLimitWindow"), so every app instance sharing it
 * counts the same hits, and a restart forgets nothing. A hit is one atomic upsert, so concurrent
 * hits on any instances are all counted.
 *
 * Client address: the last entry of `X-Forwarded-For` (Next.js fills the header with the socket
 * address when the request has none). A client can send its own header, so per-address limits
 * only hold behind a proxy that overwrites it; the per-account limits below do not depend on it.
 */
import { db, statements } from "@/lib/db";
import { TooManyRequestsError } from "@/lib/errors";
import { problemResponse } from "./problem";

/**
 * Seconds until a window that started at `start` (ms) and counted `count` hits lets `key` try
 * again at `now`, or null when `count` is within `limit`. Rounded up, never 0.
 */
export function retryAfter(limit: number, windowMs: number, start: number, count: number, now: number): number | null {
  return count > limit ? Math.max(1, Math.ceil((start + windowMs - now) / 1000)) : null;
}

/** Windows older than this are deleted now and then (longer than any limit's window). */
const KEEP_MS = 60 * 60_000;
/** Hits counted since the last sweep: on globalThis, one count for the process (the answer handler's modules load twice, lib/http/answer-route.ts). */
const sweep: { hits: number } = ((globalThis as { __triangulateRateLimitSweep?: { hits: number } }).__triangulateRateLimitSweep ??= { hits: 0 });

export class FixedWindowLimiter {
  constructor(
    /** Distinguishes this limiter's keys from the others' in the shared table. */
    readonly name: string,
    readonly limit: number,
    readonly windowMs: number,
  ) {}

  /** Seconds until `key` may try again, or null when it is under the limit (counts nothing). */
  async blocked(key: string, now = Date.now()): Promise<number | null> {
    // A hand-written statement (lib/db-statements.ts): this check runs on every API request.
    const w = await statements.rateLimitWindow(`${this.name}:${key}`);
    const start = w ? w.windowStart.getTime() : 0;
    if (!w || now - start >= this.windowMs) return null;
    return retryAfter(this.limit, this.windowMs, start, w.count + 1, now);
  }

  /** Counts one hit; returns the seconds to wait when this hit is over the limit, else null. */
  async hit(key: string, now = Date.now()): Promise<number | null> {
    // One statement: a new key or an expired window starts a window with count 1; otherwise the
    // count goes up by one.
    const w = await statements.countRateLimitHit(`${this.name}:${key}`, new Date(now), new Date(now - this.windowMs));
    if (++sweep.hits >= 1000) {
      sweep.hits = 0;
      await db.rateLimitWindow.deleteMany({ where: { windowStart: { lt: new Date(now - KEEP_MS) } } });
    }
    return retryAfter(this.limit, this.windowMs, w.windowStart.getTime(), w.count, now);
  }
}

const MINUTE = 60_000;

/**
 * The limits. Sign-in: 10 attempts per address and account, and 30 per account from anywhere,
 * per 15 minutes (scrypt already costs tens of milliseconds per guess). Invitations: an organiser
 * may create or re-issue invitations or send notices 60 times a minute (each call up to 200 people). Panelist
 * requests: 120 a minute per invitation. Bearer tokens that do not resolve (unknown, revoked,
 * expired): 300 a minute per address, then every request from it is refused until the window ends.
 */
export const limits = {
  signInAddress: new FixedWindowLimiter("sign-in-address", 10, 15 * MINUTE),
  signInAccount: new FixedWindowLimiter("sign-in-account", 30, 15 * MINUTE),
  invitations: new FixedWindowLimiter("invitations", 60, MINUTE),
  panelist: new FixedWindowLimiter("panelist", 120, MINUTE),
  badTokens: new FixedWindowLimiter("bad-tokens", 300, MINUTE),
};

/** Operations counted against `limits.invitations` (by organiser). */
export const INVITATION_OPERATIONS: ReadonlySet<string> = new Set(["createInvitations", "reissueInvitation", "sendNotices"]);

/**
 * Counts one password check against the sign-in limits: per address and account, and per account
 * from anywhere (sign-in, lib/auth.ts; password change). Called before the password is checked.
 * @param email the account's e-mail as the service looks it up (normaliseEmail)
 * @throws TooManyRequestsError over either limit
 */
export async function countPasswordAttempt(address: string, email: string): Promise<void> {
  const wait = (await limits.signInAddress.hit(`${address} ${email}`)) ?? (await limits.signInAccount.hit(email));
  if (wait !== null) throw new TooManyRequestsError(wait, "Too many sign-in attempts.");
}

/** The client's address as far as the request (or a server action's headers) tells (see the module comment). */
export function clientAddress(req: { readonly headers: Headers }): string {
  const xff = req.headers.get("x-forwarded-for");
  const last = xff?.split(",").at(-1)?.trim();
  return last || req.headers.get("x-real-ip") || "unknown";
}

/** 429 problem+json with Retry-After. */
export function tooManyRequests(retryAfterSeconds: number, instance?: string, detail = "Too many requests; try again later."): Response {
  return problemResponse("rate-limited", `${detail} Retry after ${retryAfterSeconds} s.`, { instance, headers: { "retry-after": String(retryAfterSeconds) } });
}
