/**
 * Fixed-window rate limits (a counter per key per window; the window starts at the key's first
 * hit). Exceeding a limit gives 429 problem+json with `Retry-After` (seconds to the window's end).
 *
 * The counters live in this process's memory: one server instance (the SQLite deployment) sees
 * all traffic, but a restart forgets them and two instances would not agree. Issue 6 (several
 * instances on PostgreSQL) moves them to a database table.
 *
 * Client address: the last entry of `X-Forwarded-For` (Next.js fills the header with the socket
 * address when the request has none). A client can send its own header, so per-address limits
 * only hold behind a proxy that overwrites it; the per-account limits below do not depend on it.
 */
import { problemResponse } from "./problem";

export class FixedWindowLimiter {
  private readonly windows = new Map<string, { start: number; count: number }>();

  constructor(
    readonly limit: number,
    readonly windowMs: number,
  ) {}

  private current(key: string, now: number): { start: number; count: number } | undefined {
    const w = this.windows.get(key);
    return w && now - w.start < this.windowMs ? w : undefined;
  }

  /** Seconds until `key` may try again, or null when it is under the limit (counts nothing). */
  blocked(key: string, now = Date.now()): number | null {
    const w = this.current(key, now);
    return w && w.count >= this.limit ? Math.max(1, Math.ceil((w.start + this.windowMs - now) / 1000)) : null;
  }

  /** Counts one hit; returns the seconds to wait when this hit is over the limit, else null. */
  hit(key: string, now = Date.now()): number | null {
    let w = this.current(key, now);
    if (!w) {
      if (this.windows.size >= 50_000) this.sweep(now);
      w = { start: now, count: 0 };
      this.windows.set(key, w);
    }
    w.count++;
    return w.count > this.limit ? Math.max(1, Math.ceil((w.start + this.windowMs - now) / 1000)) : null;
  }

  private sweep(now: number): void {
    for (const [k, w] of this.windows) if (now - w.start >= this.windowMs) this.windows.delete(k);
  }
}

const MINUTE = 60_000;

/**
 * The limits. Sign-in: 10 attempts per address and account, and 30 per account from anywhere,
 * per 15 minutes (scrypt already costs tens of milliseconds per guess). Invitations: an organiser
 * may create or re-issue invitations 60 times a minute (each call up to 200 people). Panelist
 * requests: 120 a minute per invitation. Bearer tokens that do not resolve (unknown, revoked,
 * expired): 300 a minute per address, then every request from it is refused until the window ends.
 */
export const limits = {
  signInAddress: new FixedWindowLimiter(10, 15 * MINUTE),
  signInAccount: new FixedWindowLimiter(30, 15 * MINUTE),
  invitations: new FixedWindowLimiter(60, MINUTE),
  panelist: new FixedWindowLimiter(120, MINUTE),
  badTokens: new FixedWindowLimiter(300, MINUTE),
};

/** Operations counted against `limits.invitations` (by organiser). */
export const INVITATION_OPERATIONS: ReadonlySet<string> = new Set(["createInvitations", "reissueInvitation"]);

/** The client's address as far as the request tells (see the module comment). */
export function clientAddress(req: Request): string {
  const xff = req.headers.get("x-forwarded-for");
  const last = xff?.split(",").at(-1)?.trim();
  return last || req.headers.get("x-real-ip") || "unknown";
}

/** 429 problem+json with Retry-After. */
export function tooManyRequests(retryAfterSeconds: number, instance?: string, detail = "Too many requests; try again later."): Response {
  return problemResponse(
    { type: "about:blank", title: "Too Many Requests", status: 429, detail: `${detail} Retry after ${retryAfterSeconds} s.`, instance },
    { "retry-after": String(retryAfterSeconds) },
  );
}
