/**
 * The fixed-window limiter of lib/http/rate-limit.ts, driven with explicit clock values (no
 * timers) against a fresh SQLite database: the limit per window, the Retry-After seconds, keys
 * and limiters apart, a new window after the old one ends, hits from two clients of the same
 * database counted together; and the 429 problem+json response.
 * (The expected values follow from the definition of a fixed window; there is no outside table.)
 */
import { beforeAll, describe, expect, it } from "vitest";
import { migratedSqliteDatabase } from "../helpers/migrated-sqlite";

type RateLimit = typeof import("../../lib/http/rate-limit");
let rl: RateLimit;

beforeAll(async () => {
  migratedSqliteDatabase();
  rl = await import("../../lib/http/rate-limit");
});

describe("retryAfter", () => {
  it("is null within the limit, else the seconds to the window's end rounded up, never 0", () => {
    expect(rl.retryAfter(3, 60_000, 0, 3, 10)).toBeNull();
    expect(rl.retryAfter(3, 60_000, 0, 4, 30_000)).toBe(30);
    expect(rl.retryAfter(1, 1_000, 0, 2, 999)).toBe(1);
    expect(rl.retryAfter(1, 1_000, 0, 2, 1)).toBe(1);
  });
});

describe("FixedWindowLimiter (database counters)", () => {
  it("allows `limit` hits per window, then says how long to wait", async () => {
    const l = new rl.FixedWindowLimiter("test-a", 3, 60_000);
    const t0 = 1_000_000;
    expect([await l.hit("a", t0), await l.hit("a", t0 + 1), await l.hit("a", t0 + 2)]).toEqual([null, null, null]);
    expect(await l.blocked("a", t0 + 3)).toBe(60);
    expect(await l.hit("a", t0 + 30_000)).toBe(30);
    expect(await l.hit("b", t0 + 30_000)).toBeNull();
    // The window started at t0 ends at t0 + 60 s: a fresh window then.
    expect(await l.blocked("a", t0 + 60_000)).toBeNull();
    expect(await l.hit("a", t0 + 60_000)).toBeNull();
  });

  it("keeps the keys of different limiters apart", async () => {
    const one = new rl.FixedWindowLimiter("test-one", 1, 60_000);
    const two = new rl.FixedWindowLimiter("test-two", 1, 60_000);
    expect(await one.hit("k", 5_000)).toBeNull();
    expect(await two.hit("k", 5_000)).toBeNull();
    expect(await one.hit("k", 5_001)).toBe(60);
  });

  it("counts concurrent hits and hits from two limiter objects on one table together", async () => {
    // Two app instances are two processes with their own limiter objects and one database.
    const a = new rl.FixedWindowLimiter("test-shared", 10, 60_000);
    const b = new rl.FixedWindowLimiter("test-shared", 10, 60_000);
    const verdicts = await Promise.all(Array.from({ length: 12 }, (_, i) => (i % 2 ? a : b).hit("k", 9_000 + i)));
    expect(verdicts.filter((v) => v === null)).toHaveLength(10);
    expect(await a.blocked("k", 9_100)).toBe(60);
  });
});

describe("429 response", () => {
  it("is problem+json with Retry-After", async () => {
    const res = rl.tooManyRequests(42, "/api/v1/x");
    expect(res.status).toBe(429);
    expect(res.headers.get("content-type")).toBe("application/problem+json");
    expect(res.headers.get("retry-after")).toBe("42");
    expect(await res.json()).toMatchObject({ status: 429, title: "Too Many Requests", instance: "/api/v1/x" });
  });

  it("takes the client address from the last X-Forwarded-For entry", () => {
    expect(rl.clientAddress(new Request("http://h/", { headers: { "x-forwarded-for": "203.0.113.9, 127.0.0.1" } }))).toBe("127.0.0.1");
    expect(rl.clientAddress(new Request("http://h/"))).toBe("unknown");
  });
});
