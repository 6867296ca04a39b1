/**
 * Pieces of the production server (lib/http/server.ts) that must reproduce what Next.js does for
 * a route it serves, checked against Next.js's documentation and source.
 */
import { describe, expect, it } from "vitest";
import { forwardedHeaders, headersForPath, type HeaderRule } from "@/lib/http/server";

// The two rules of this project's next.config.mjs as the build records them in
// routes-manifest.json (regexes copied from `next build` output of this project).
const ALL: HeaderRule = {
  source: "/:path*",
  regex: "^(?:/((?:[^/]+?)(?:/(?:[^/]+?))*))?(?:/)?$",
  headers: [
    { key: "X-Content-Type-Options", value: "nosniff" },
    { key: "x-hello", value: "there" },
  ],
};
const API: HeaderRule = {
  source: "/api/:path*",
  regex: "^/api(?:/((?:[^/]+?)(?:/(?:[^/]+?))*))?(?:/)?$",
  headers: [{ key: "X-Hello", value: "world" }],
};

describe("headersForPath", () => {
  it("applies every matching rule, the later one overriding the earlier for the same header", () => {
    // Next.js docs, next.config.js `headers`, "Header Overriding Behavior": "If two headers match
    // the same path and set the same header key, the last header key will override the first."
    expect(headersForPath([ALL, API], "/api/v1/panelist/answers")).toEqual({ "x-content-type-options": "nosniff", "x-hello": "world" });
    expect(headersForPath([API, ALL], "/api/v1/panelist/answers")).toEqual({ "x-content-type-options": "nosniff", "x-hello": "there" });
  });

  it("ignores rules whose path does not match", () => {
    expect(headersForPath([ALL, API], "/sign-in")).toEqual({ "x-content-type-options": "nosniff", "x-hello": "there" });
    expect(headersForPath([API], "/apix/answers")).toEqual({});
  });

  it("refuses a matching rule with has/missing conditions, which a fixed header set cannot follow", () => {
    const conditional = { ...API, missing: [{ type: "header", key: "x-skip" }] };
    expect(() => headersForPath([ALL, conditional], "/api/v1/panelist/answers")).toThrow(/conditions/);
    // A conditional rule for other paths does not matter.
    expect(headersForPath([ALL, conditional], "/sign-in")).toEqual({ "x-content-type-options": "nosniff", "x-hello": "there" });
  });
});

describe("forwardedHeaders", () => {
  // Next.js 16 source, server/base-server.js (handleRequestImpl): x-forwarded-host ??= host,
  // x-forwarded-port ??= the server's port, x-forwarded-proto ??= https when the socket is TLS,
  // x-forwarded-for ??= the socket's remote address. Present headers are left as they are.
  it("fills the absent ones from the connection", () => {
    const h = new Headers({ host: "127.0.0.1:4100" });
    forwardedHeaders(h, { remoteAddress: "127.0.0.1" }, 4100);
    expect(Object.fromEntries(h)).toEqual({
      host: "127.0.0.1:4100",
      "x-forwarded-host": "127.0.0.1:4100",
      "x-forwarded-port": "4100",
      "x-forwarded-proto": "http",
      "x-forwarded-for": "127.0.0.1",
    });
    const tls = new Headers({ host: "triangulate.example" });
    forwardedHeaders(tls, { remoteAddress: "::1", encrypted: true }, 443);
    expect(tls.get("x-forwarded-proto")).toBe("https");
  });

  it("keeps what a proxy in front already set", () => {
    const h = new Headers({ host: "app:3000", "x-forwarded-for": "203.0.113.7, 10.0.0.2", "x-forwarded-proto": "https", "x-forwarded-host": "triangulate.example" });
    forwardedHeaders(h, { remoteAddress: "10.0.0.2" }, 3000);
    expect(h.get("x-forwarded-for")).toBe("203.0.113.7, 10.0.0.2");
    expect(h.get("x-forwarded-proto")).toBe("https");
    expect(h.get("x-forwarded-host")).toBe("triangulate.example");
    expect(h.get("x-forwarded-port")).toBe("3000");
  });
});
