/**
 * Settings from the environment (lib/env.ts): what is accepted, and that a wrong setting gives a
 * message naming the variable and what to set.
 */
import { describe, expect, it } from "vitest";
import { parseEnv } from "../lib/env";

const SECRET = "k".repeat(32);

describe("parseEnv", () => {
  it("accepts a production setup and applies the defaults", () => {
    const e = parseEnv({ NODE_ENV: "production", NEXTAUTH_SECRET: SECRET, DATABASE_URL: "file:/var/lib/triangulate.db", NEXTAUTH_URL: "https://triangulate.example.com", PORT: "3000" });
    expect(e.PORT).toBe(3000);
    expect(e.TRIANGULATE_SQLITE_SYNCHRONOUS).toBe("NORMAL");
    expect(e.TRIANGULATE_PG_POOL).toBe(10);
  });

  it("accepts a PostgreSQL URL and a pool size", () => {
    const e = parseEnv({ NODE_ENV: "development", DATABASE_URL: "postgresql://app:pw@db.internal:5432/triangulate", TRIANGULATE_PG_POOL: "20" });
    expect(e.TRIANGULATE_PG_POOL).toBe(20);
    expect(parseEnv({ NODE_ENV: "development", DATABASE_URL: "postgres://db/t" }).DATABASE_URL).toBe("postgres://db/t");
    expect(() => parseEnv({ NODE_ENV: "development", TRIANGULATE_PG_POOL: "0" })).toThrow(/TRIANGULATE_PG_POOL: must be 1–100/);
  });

  it("needs a secret of at least 32 characters in production, and says so", () => {
    expect(() => parseEnv({ NODE_ENV: "production" })).toThrow(/NEXTAUTH_SECRET: must be set to at least 32/);
    expect(() => parseEnv({ NODE_ENV: "production", NEXTAUTH_SECRET: "short" })).toThrow(/it has 5/);
    expect(parseEnv({ NODE_ENV: "production", AUTH_SECRET: SECRET }).AUTH_SECRET).toBe(SECRET);
    // `next build` has no run-time secret; development needs none.
    expect(parseEnv({ NODE_ENV: "production", NEXT_PHASE: "phase-production-build" }).NEXTAUTH_SECRET).toBeUndefined();
    expect(parseEnv({ NODE_ENV: "development" }).NODE_ENV).toBe("development");
  });

  it("names every wrong variable at once", () => {
    let message = "";
    try {
      parseEnv({ NODE_ENV: "development", DATABASE_URL: "mysql://x", NEXTAUTH_URL: "ftp://x", PORT: "70000", TRIANGULATE_SQLITE_SYNCHRONOUS: "OFF" });
    } catch (err) {
      message = (err as Error).message;
    }
    expect(message).toMatch(/DATABASE_URL: must be a file: URL/);
    expect(message).toMatch(/NEXTAUTH_URL: must be an http\(s\) URL/);
    expect(message).toMatch(/PORT: must be 1–65535/);
    expect(message).toMatch(/TRIANGULATE_SQLITE_SYNCHRONOUS: must be NORMAL or FULL/);
  });
});

describe("SMTP settings", () => {
  it("accepts an smtp:// or smtps:// URL with a sender, and neither (the outbox)", () => {
    const e = parseEnv({ NODE_ENV: "development", SMTP_URL: "smtp://mailer:pw@mail.quillmoor.example:587", MAIL_FROM: "Quillmoor panels <panels@quillmoor.example>" });
    expect(e.SMTP_URL).toBe("smtp://mailer:pw@mail.quillmoor.example:587");
    expect(parseEnv({ NODE_ENV: "development", SMTP_URL: "smtps://mail.quillmoor.example", MAIL_FROM: "panels@quillmoor.example" }).MAIL_FROM).toBe("panels@quillmoor.example");
    expect(parseEnv({ NODE_ENV: "development" }).SMTP_URL).toBeUndefined();
  });

  it("refuses another scheme, a URL without a sender, and a sender that is not an address", () => {
    expect(() => parseEnv({ NODE_ENV: "development", SMTP_URL: "http://mail.quillmoor.example", MAIL_FROM: "p@quillmoor.example" })).toThrow(/SMTP_URL: must be an smtp:\/\/ or smtps:\/\/ URL/);
    expect(() => parseEnv({ NODE_ENV: "development", SMTP_URL: "smtp://mail.quillmoor.example" })).toThrow(/MAIL_FROM: must be set with SMTP_URL/);
    expect(() => parseEnv({ NODE_ENV: "development", SMTP_URL: "smtp://mail.quillmoor.example", MAIL_FROM: "panels" })).toThrow(/MAIL_FROM: must be an e-mail address/);
  });
});
