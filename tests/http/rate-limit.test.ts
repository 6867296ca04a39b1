/**
 * The fixed-window limiter of lib/http/rate-limit.ts, driven with explicit clock values (no
 * timers): the limit per window, the Retry-After seconds, keys apart, a new window after the
 * old one ends; and the 429 problem+json response.
 */
import { describe, expect, it } from "vitest";
import { FixedWindowLimiter, clientAddress, tooManyRequests } from "../../lib/http/rate-limit";

describe("FixedWindowLimiter", () => {
  it("allows `limit` hits per window, then says how long to wait", () => {
    const l = new FixedWindowLimiter(3, 60_000);
    const t0 = 1_000_000;
    expect([l.hit("a", t0), l.hit("a", t0 + 1), l.hit("a", t0 + 2)]).toEqual([null, null, null]);
    expect(l.blocked("a", t0 + 3)).toBe(60);
    expect(l.hit("a", t0 + 30_000)).toBe(30);
    expect(l.hit("b", t0 + 30_000)).toBeNull();
    // The window started at t0 ends at t0 + 60 s: a fresh window then.
    expect(l.blocked("a", t0 + 60_000)).toBeNull();
    expect(l.hit("a", t0 + 60_000)).toBeNull();
  });

  it("rounds the wait up to whole seconds and never says 0", () => {
    const l = new FixedWindowLimiter(1, 1_000);
    l.hit("k", 0);
    expect(l.hit("k", 999)).toBe(1);
    expect(l.hit("k", 1)).toBe(1);
  });
});

describe("429 response", () => {
  it("is problem+json with Retry-After", async () => {
    const res = tooManyRequests(42, "/api/v1/x");
    expect(res.status).toBe(429);
    expect(res.headers.get("content-type")).toBe("application/problem+json");
    expect(res.headers.get("retry-after")).toBe("42");
    expect(await res.json()).toMatchObject({ status: 429, title: "Too Many Requests", instance: "/api/v1/x" });
  });

  it("takes the client address from the last X-Forwarded-For entry", () => {
    expect(clientAddress(new Request("http://h/", { headers: { "x-forwarded-for": "203.0.113.9, 127.0.0.1" } }))).toBe("127.0.0.1");
    expect(clientAddress(new Request("http://h/"))).toBe("unknown");
  });
});
