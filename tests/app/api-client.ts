/**
 * Helpers for the API tests (tests/app/api-*.test.ts): HTTP calls against the server that
 * tests/app/server-setup.ts started, account creation through the admin CLI on the same
 * database, sign-in through next-auth's credentials endpoint, and clearing the database after
 * a file so that other app tests (the browser test's first-run page) find it empty.
 * Every JSON response `api()` receives is parsed with the schema the route table declares for it
 * (checkResponse), so the OpenAPI document generated from that table cannot drift from the API.
 */
import { execFileSync } from "node:child_process";
import { randomBytes } from "node:crypto";
import path from "node:path";
import { expect, inject } from "vitest";
import { isProblemKind, PROBLEM_TYPES, problemTypeUri } from "../../lib/problem-types";
import { routes, type RouteDef } from "../../lib/http/routes";
import { problem } from "../../lib/validation/outputs";
import { signInAttempt as attemptSignIn } from "../harness/harness";
import { clearAllTables, dialectOf, openSql, type SqlConnection } from "../harness/sql";

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
  const contentType = res.headers.get("content-type") ?? "";
  checkResponse(method, urlPath, res.status, contentType, parsed);
  return { status: res.status, contentType, body: parsed as T, text };
}

/** The route-table entry (lib/http/routes.ts) serving `method` on `urlPath`, if any. */
export function routeOf(method: string, urlPath: string): RouteDef | undefined {
  const pathname = urlPath.split("?")[0];
  return (Object.values(routes) as RouteDef[]).find(
    (r) => r.method === method.toUpperCase() && new RegExp(`^${r.path.replace(/\./g, "\\.").replace(/\{[^}]+\}/g, "[^/]+")}$`).test(pathname),
  );
}

/**
 * Fails the test when a response does not match what the route table declares: a success body
 * (the route's status, or 200 for the replay of an idempotent request) against the route's
 * response schema; a problem+json body against the Problem schema, with a known problem type whose
 * status is the response's.
 */
export function checkResponse(method: string, urlPath: string, status: number, contentType: string, body: unknown): void {
  const where = `${method} ${urlPath} → ${status}`;
  if (contentType.startsWith("application/problem+json")) {
    const parsed = problem.safeParse(body);
    if (!parsed.success) throw new Error(`${where}: the problem body does not match the Problem schema: ${parsed.error.message}`);
    const kind = parsed.data.type.replace(/^\/problems\//, "");
    if (!isProblemKind(kind) || problemTypeUri(kind) !== parsed.data.type) throw new Error(`${where}: unknown problem type ${parsed.data.type}`);
    if (PROBLEM_TYPES[kind].status !== status) throw new Error(`${where}: problem type ${parsed.data.type} is documented with status ${PROBLEM_TYPES[kind].status}`);
    return;
  }
  const route = routeOf(method, urlPath);
  if (!route || !contentType.startsWith("application/json") || route.produces) return;
  if (status !== route.status && !(route.idempotent && status === 200)) {
    throw new Error(`${where}: the route table documents ${route.status}${route.idempotent ? " (or 200 on replay)" : ""} as the success status`);
  }
  const parsed = route.response.safeParse(body);
  if (!parsed.success) throw new Error(`${where}: the body does not match the ${route.operationId} response schema: ${parsed.error.message}`);
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

/** One sign-in attempt (tests/harness/harness.ts), on the suite's server unless `base` names another. */
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

/** Opens the test database directly (tests/harness/sql.ts: `?` placeholders, double-quoted names). */
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
