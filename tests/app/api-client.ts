/**
 * Helpers for the API tests (tests/app/api-*.test.ts): HTTP calls against the server that
 * tests/app/server-setup.ts started, account creation through the admin CLI on the same
 * database, sign-in through next-auth's credentials endpoint, and clearing the database after
 * a file so that other app tests (the browser test's first-run page) find it empty.
 */
import { execFileSync } from "node:child_process";
import { randomBytes } from "node:crypto";
import path from "node:path";
import { expect, inject } from "vitest";
import { signInAttempt as attemptSignIn } from "../../bench/harness";
import { clearAllTables, dialectOf, openSql, type SqlConnection } from "../../bench/sql";

export const baseURL = inject("baseURL");
export const databaseUrl = inject("databaseUrl");
/** The database the suite runs on (the "app" project: SQLite; "app-postgres": PostgreSQL). */
export const dialect = dialectOf(databaseUrl);
const root = path.resolve(__dirname, "..", "..");

export interface ApiResult<T = any> {
  readonly status: number;
  readonly contentType: string;
  readonly body: T;
  readonly text: string;
}

export interface Credentials {
  /** Bearer token (API token or invitation token). */
  readonly token?: string;
  /** Session cookie header. */
  readonly cookie?: string;
}

/** One request; the body (if any) is sent as JSON, or verbatim when a string. */
export async function api<T = any>(
  method: string,
  urlPath: string,
  options: Credentials & { body?: unknown; headers?: Record<string, string> } = {},
): Promise<ApiResult<T>> {
  const headers: Record<string, string> = { ...options.headers };
  if (options.token) headers.authorization = `Bearer ${options.token}`;
  if (options.cookie) {
    headers.cookie = options.cookie;
    // What a browser sends with a same-site request (lib/http/handler.ts refuses cookie changes without it).
    headers.origin ??= baseURL;
  }
  let body: string | undefined;
  if (options.body !== undefined) {
    headers["content-type"] = "application/json";
    body = typeof options.body === "string" ? options.body : JSON.stringify(options.body);
  }
  const res = await fetch(`${baseURL}${urlPath}`, { method, headers, body, redirect: "manual" });
  const text = await res.text();
  let parsed: unknown = undefined;
  try {
    parsed = text ? JSON.parse(text) : undefined;
  } catch {
    parsed = undefined;
  }
  return { status: res.status, contentType: res.headers.get("content-type") ?? "", body: parsed as T, text };
}

/** Runs `node bin/triangulate.mjs …` on the test database; returns stdout. */
export function cli(args: string[]): string {
  return execFileSync(process.execPath, [path.join(root, "bin", "triangulate.mjs"), ...args], {
    cwd: root,
    env: { ...process.env, DATABASE_URL: databaseUrl },
    encoding: "utf8",
  });
}

export interface TestUser {
  readonly email: string;
  readonly name: string;
  readonly password: string;
}

/** Creates an account through the admin CLI (unique e-mail under example.com). */
export function createAccount(name: string, role: "organiser" | "reviewer" = "organiser"): TestUser {
  const user = {
    email: `${name.toLowerCase().replace(/[^a-z]+/g, ".")}.${randomBytes(4).toString("hex")}@example.com`,
    name,
    password: `pw-${randomBytes(9).toString("base64url")}`,
  };
  const out = cli(["create-organiser", "--email", user.email, "--name", user.name, "--password", user.password, "--role", role]);
  expect(out).toContain(`created ${role} ${user.email}`);
  return user;
}

/** One sign-in attempt (bench/harness.ts), on the suite's server unless `base` names another. */
export function signInAttempt(email: string, password: string, base = baseURL): Promise<Response> {
  return attemptSignIn(base, email, password);
}

/** Signs in through next-auth's credentials callback; returns the session cookie header. */
export async function signIn(user: TestUser): Promise<string> {
  const res = await signInAttempt(user.email, user.password);
  const session = res.headers.getSetCookie().find((c) => c.startsWith("next-auth.session-token="));
  if (!session) throw new Error(`sign-in of ${user.email} gave no session cookie (status ${res.status})`);
  return session.split(";")[0];
}

/** Signs in and creates a personal API token through the API; returns the token. */
export async function apiTokenFor(user: TestUser): Promise<string> {
  const cookie = await signIn(user);
  const res = await api("POST", "/api/v1/tokens", { cookie, body: { name: "test script" } });
  expect(res.status).toBe(201);
  expect(res.body.token).toMatch(/^trg_pat_[A-Za-z0-9_-]{43}$/);
  return res.body.token as string;
}

/** Opens the test database directly (bench/sql.ts: `?` placeholders, double-quoted names). */
export function openDb(): Promise<SqlConnection> {
  return openSql(databaseUrl);
}

/** Runs one statement on the test database (for checks and for moving a deadline into the past). */
export async function sql<T = Record<string, unknown>>(text: string, params: readonly unknown[] = []): Promise<T[]> {
  const conn = await openDb();
  try {
    return await conn.query<T>(text, params);
  } finally {
    await conn.close();
  }
}

/** Deletes every row, so the next app test file starts from an empty database. */
export async function clearDatabase(): Promise<void> {
  const conn = await openDb();
  try {
    await clearAllTables(conn);
  } finally {
    await conn.close();
  }
}
