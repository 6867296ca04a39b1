/**
 * Password hashing (scrypt) and token digests. Expected values come from published test
 * vectors: RFC 7914 §12 (scrypt) and FIPS 180-2 / RFC 6234 (SHA-256 of "abc").
 */
import { describe, expect, it } from "vitest";
import { hashPassword, verifyPassword } from "../../lib/accounts/passwords";
import { API_TOKEN_PREFIX, hashToken, newApiToken, newInvitationToken, tokenMatches } from "../../lib/accounts/tokens";

/** RFC 7914 §12: scrypt(P="password", S="NaCl", N=1024, r=8, p=16, dkLen=64). */
const RFC7914_KEY =
  "fdbabe1c9d3472007856e7190d01e9fe7c6ad7cbc8237830e77376634b3731622eaf30d92e22a3886ff109279d9830dac727afb94a83ee6d8360cbdfa2cc0640";

describe("verifyPassword", () => {
  it("accepts the RFC 7914 test vector written in our encoded form, and rejects a wrong password", async () => {
    const encoded = ["scrypt", 10, 8, 16, Buffer.from("NaCl").toString("base64url"), Buffer.from(RFC7914_KEY, "hex").toString("base64url")].join("$");
    expect(await verifyPassword("password", encoded)).toBe(true);
    expect(await verifyPassword("Password", encoded)).toBe(false);
  });

  it("rejects malformed encodings instead of throwing", async () => {
    for (const bad of ["", "bcrypt$x", "scrypt$15$8$1$salt", "scrypt$0$8$1$c2FsdA$a2V5", "scrypt$40$8$1$c2FsdA$a2V5"]) {
      expect(await verifyPassword("pw", bad)).toBe(false);
    }
  });
});

describe("hashPassword", () => {
  it("uses N = 2^15, r = 8, p = 1, a 16-byte salt and a 32-byte key, salted per call", async () => {
    const a = await hashPassword("wren-2 soil sensor");
    const b = await hashPassword("wren-2 soil sensor");
    expect(a).toMatch(/^scrypt\$15\$8\$1\$[A-Za-z0-9_-]{22}\$[A-Za-z0-9_-]{43}$/);
    expect(a).not.toBe(b);
    expect(await verifyPassword("wren-2 soil sensor", a)).toBe(true);
    expect(await verifyPassword("wren-2 soil sensor ", a)).toBe(false);
  });
});

describe("tokens", () => {
  it("hashToken is SHA-256 in hex (FIPS 180-2 vector for 'abc')", () => {
    expect(hashToken("abc")).toBe("ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad");
  });

  it("invitation tokens are 256 random bits in base64url; API tokens carry the prefix", () => {
    const inv = newInvitationToken();
    expect(inv.token).toMatch(/^[A-Za-z0-9_-]{43}$/);
    expect(Buffer.from(inv.token, "base64url")).toHaveLength(32);
    expect(inv.tokenHash).toBe(hashToken(inv.token));
    const api = newApiToken();
    expect(api.token.startsWith(API_TOKEN_PREFIX)).toBe(true);
    expect(newInvitationToken().token).not.toBe(inv.token);
  });

  it("tokenMatches compares digests", () => {
    const { token, tokenHash } = newInvitationToken();
    expect(tokenMatches(token, tokenHash)).toBe(true);
    expect(tokenMatches(token + "x", tokenHash)).toBe(false);
    expect(tokenMatches(token, "abcd")).toBe(false);
  });
});

describe("API token expiry", () => {
  it("is 90 days after creation by default (90 × 86,400,000 ms = 7,776,000,000 ms, hand computation); old rows without one get the default", async () => {
    const { apiTokenExpiresAt, apiTokenExpiry } = await import("../../lib/accounts/tokens");
    const created = new Date("2026-01-01T00:00:00.000Z");
    expect(apiTokenExpiresAt(created).toISOString()).toBe("2026-04-01T00:00:00.000Z"); // Jan 31 + Feb 28 + Mar 31 = 90 days
    expect(apiTokenExpiresAt(created, 7).toISOString()).toBe("2026-01-08T00:00:00.000Z");
    expect(apiTokenExpiry({ createdAt: created, expiresAt: null }).getTime() - created.getTime()).toBe(7_776_000_000);
    const set = new Date("2026-02-01T00:00:00.000Z");
    expect(apiTokenExpiry({ createdAt: created, expiresAt: set })).toBe(set);
  });
});
