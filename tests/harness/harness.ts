/**
 * Shared by `npm run load` (bench/load.ts), the app suite's setup (tests/app/server-setup.ts) and
 * its fault, backup and two-instance tests:
 * start production servers on 127.0.0.1 on a database (a fresh SQLite file, or a PostgreSQL
 * database), create an organiser and an API token, build a panel of N invited panelists through
 * the JSON API, send answers with idempotency keys at bounded concurrency, and check the database
 * directly (tests/harness/sql.ts) against what the servers acknowledged.
 *
 * Traffic goes only to the loopback server this module starts. Demo names are invented
 * (Quillmoor Instruments).
 */
import { spawn, spawnSync, type ChildProcess } from "node:child_process";
import { randomBytes } from "node:crypto";
import { existsSync, readFileSync } from "node:fs";
import http from "node:http";
import { createServer } from "node:net";
import path from "node:path";
import { performance } from "node:perf_hooks";
import { openSql } from "./sql";
import { mulberry32 } from "../helpers/prng";
import heapLimits from "../../lib/work/heap-limits.json";

export { mulberry32 };

export const root = path.resolve(path.dirname(new URL(import.meta.url).pathname), "../..");
const bin = (name: string) => path.join(root, "node_modules", ".bin", name);

export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = createServer();
    srv.listen(0, "127.0.0.1", () => {
      const address = srv.address();
      srv.close(() => (typeof address === "object" && address ? resolve(address.port) : reject(new Error("no port"))));
    });
  });
}

function run(cmd: string, args: string[], env: NodeJS.ProcessEnv): void {
  const r = spawnSync(cmd, args, { cwd: root, env, encoding: "utf8" });
  if (r.status !== 0) throw new Error(`${path.basename(cmd)} ${args.join(" ")} failed:\n${r.stdout}\n${r.stderr}`);
}

export interface ServerOptions {
  /** DATABASE_URL: `file:…` (SQLite) or `postgresql://…`. */
  readonly databaseUrl: string;
  readonly port: number;
  /** The Next.js build folder (NEXT_DIST_DIR); default .next */
  readonly distDir?: string;
  /** NEXTAUTH_SECRET; instances that share sessions need the same one. */
  readonly secret?: string;
  /** More settings for the server (e.g. SMTP_URL and MAIL_FROM for the e-mail test). */
  readonly env?: Readonly<Record<string, string>>;
}

export function serverEnv(o: ServerOptions): NodeJS.ProcessEnv {
  const baseURL = `http://127.0.0.1:${o.port}`;
  return {
    ...process.env,
    NODE_ENV: "production",
    NEXT_TELEMETRY_DISABLED: "1",
    NEXT_DIST_DIR: o.distDir ?? process.env.NEXT_DIST_DIR ?? ".next",
    DATABASE_URL: o.databaseUrl,
    NEXTAUTH_SECRET: o.secret ?? "load-and-fault-secret-0123456789abcdef",
    NEXTAUTH_URL: baseURL,
    PORT: String(o.port),
    ...o.env,
  };
}

/** True when the build folder holds a production build. */
export function hasBuild(distDir: string): boolean {
  return existsSync(path.join(root, distDir, "BUILD_ID"));
}

/** `next build` into `distDir`. */
export function build(distDir: string): void {
  run(bin("next"), ["build"], { ...process.env, NEXT_DIST_DIR: distDir, NEXT_TELEMETRY_DISABLED: "1" });
}

/** Applies the migrations to a (new) database. */
export function migrate(o: ServerOptions): void {
  run(process.execPath, [path.join(root, "bin", "triangulate.mjs"), "migrate"], serverEnv(o));
}

export interface RunningServer {
  readonly baseURL: string;
  readonly child: ChildProcess;
  /** Stops the server (SIGTERM, or the given signal) and waits for the process to end. */
  stop(signal?: NodeJS.Signals): Promise<void>;
}

/** Starts the production server (`triangulate serve`, lib/http/server.ts) on 127.0.0.1 and waits until it answers. */
export async function startServer(o: ServerOptions, timeoutMs = 60_000): Promise<RunningServer> {
  const baseURL = `http://127.0.0.1:${o.port}`;
  // The server runs in this child process (Next.js included, no worker), so a signal to the child reaches it.
  // SERVER_NODE_ARGS, e.g. "--cpu-prof --cpu-prof-dir=/tmp/prof", profiles the server under load.
  const nodeArgs = (process.env.SERVER_NODE_ARGS ?? "").split(" ").filter(Boolean);
  // The main thread's heap bounded as `npm start` bounds it (scripts/start.mjs), unless SERVER_NODE_ARGS bounds the old space.
  if (!nodeArgs.some((a) => a.startsWith("--max-old-space-size"))) {
    nodeArgs.unshift(`--max-old-space-size=${heapLimits.serverOldSpaceMiB}`, `--max-semi-space-size=${heapLimits.serverSemiSpaceMiB}`);
  }
  const child = spawn(process.execPath, [...nodeArgs, path.join(root, "bin", "triangulate.mjs"), "serve", "--port", String(o.port), "--hostname", "127.0.0.1"], {
    cwd: root,
    env: serverEnv(o),
    stdio: ["ignore", "ignore", "inherit"],
  });
  const exited = new Promise<void>((resolve) => child.once("exit", () => resolve()));
  const until = Date.now() + timeoutMs;
  for (;;) {
    if (child.exitCode !== null || child.signalCode !== null) throw new Error(`server exited (${child.exitCode ?? child.signalCode})`);
    try {
      // No keep-alive: an idle pooled socket could be closed by the server before the next use.
      const res = await fetch(`${baseURL}/api/v1/rule-defaults`, { headers: { connection: "close" } });
      if (res.status === 200) break;
    } catch {
      // not listening yet
    }
    if (Date.now() > until) {
      child.kill("SIGKILL");
      throw new Error(`server did not answer at ${baseURL} within ${timeoutMs} ms`);
    }
    await new Promise((r) => setTimeout(r, 200));
  }
  return {
    baseURL,
    child,
    async stop(signal: NodeJS.Signals = "SIGTERM") {
      if (child.exitCode === null && child.signalCode === null) child.kill(signal);
      await exited;
    },
  };
}

/** Creates an organiser (or reviewer) account through the admin CLI on the database. */
export function createOrganiser(databaseUrl: string, role: "organiser" | "reviewer" = "organiser"): { email: string; password: string } {
  const email = `${role}.${randomBytes(4).toString("hex")}@quillmoor.example`;
  const password = `pw-${randomBytes(12).toString("base64url")}`;
  const name = role === "organiser" ? "Quillmoor Planning" : "Quillmoor Finance Review";
  run(process.execPath, [path.join(root, "bin", "triangulate.mjs"), "create-organiser", "--email", email, "--name", name, "--password", password, "--role", role], {
    ...process.env,
    DATABASE_URL: databaseUrl,
  });
  return { email, password };
}

// ---------------------------------------------------------------------------------------------
// HTTP with a keep-alive agent (bounded sockets)

export interface HttpResult {
  readonly status: number;
  readonly contentType: string;
  readonly body: any;
  readonly ms: number;
}

export class Client {
  readonly agent: http.Agent;
  constructor(
    readonly baseURL: string,
    maxSockets = 64,
  ) {
    this.agent = new http.Agent({ keepAlive: true, maxSockets });
  }

  request(method: string, urlPath: string, o: { token?: string; cookie?: string; body?: unknown; headers?: Record<string, string>; timeoutMs?: number } = {}): Promise<HttpResult> {
    const url = new URL(urlPath, this.baseURL);
    const payload = o.body === undefined ? undefined : typeof o.body === "string" ? o.body : JSON.stringify(o.body);
    const headers: Record<string, string> = { ...o.headers };
    if (o.token) headers.authorization = `Bearer ${o.token}`;
    if (o.cookie) headers.cookie = o.cookie;
    if (payload !== undefined) {
      headers["content-type"] ??= "application/json";
      headers["content-length"] = String(Buffer.byteLength(payload));
    }
    const started = performance.now();
    return new Promise((resolve, reject) => {
      const req = http.request(url, { method, headers, agent: this.agent }, (res) => {
        const chunks: Buffer[] = [];
        res.on("data", (c: Buffer) => chunks.push(c));
        res.on("end", () => {
          const text = Buffer.concat(chunks).toString("utf8");
          let body: unknown = text;
          try {
            body = text ? JSON.parse(text) : undefined;
          } catch {
            // not JSON
          }
          resolve({ status: res.statusCode ?? 0, contentType: String(res.headers["content-type"] ?? ""), body, ms: performance.now() - started });
        });
        res.on("error", reject);
      });
      req.setTimeout(o.timeoutMs ?? 30_000, () => req.destroy(new Error("timeout")));
      req.on("error", reject);
      if (payload !== undefined) req.write(payload);
      req.end();
    });
  }

  async ok(method: string, urlPath: string, o: { token?: string; cookie?: string; body?: unknown } = {}): Promise<any> {
    const r = await this.request(method, urlPath, o);
    if (r.status >= 300) throw new Error(`${method} ${urlPath} → ${r.status}: ${JSON.stringify(r.body)}`);
    return r.body;
  }

  close(): void {
    this.agent.destroy();
  }
}

/** One sign-in attempt on the server at `baseURL` through next-auth's credentials callback (CSRF token first). */
export async function signInAttempt(baseURL: string, email: string, password: string): Promise<Response> {
  const csrfRes = await fetch(`${baseURL}/api/auth/csrf`);
  const { csrfToken } = (await csrfRes.json()) as { csrfToken: string };
  const csrfCookie = csrfRes.headers.getSetCookie().map((c) => c.split(";")[0]).join("; ");
  return fetch(`${baseURL}/api/auth/callback/credentials`, {
    method: "POST",
    redirect: "manual",
    headers: { "content-type": "application/x-www-form-urlencoded", cookie: csrfCookie },
    body: new URLSearchParams({ csrfToken, email, password, json: "true" }).toString(),
  });
}

/** Signs in through next-auth's credentials callback; returns the session cookie (`name=value`). */
export async function sessionCookie(baseURL: string, user: { email: string; password: string }): Promise<string> {
  const res = await signInAttempt(baseURL, user.email, user.password);
  const session = res.headers.getSetCookie().find((c) => c.startsWith("next-auth.session-token="));
  if (!session) throw new Error(`sign-in gave no session cookie (status ${res.status})`);
  return session.split(";")[0];
}

/** Signs in through next-auth's credentials callback and creates a personal API token. */
export async function organiserToken(baseURL: string, user: { email: string; password: string }): Promise<string> {
  const cookie = await sessionCookie(baseURL, user);
  const tok = await fetch(`${baseURL}/api/v1/tokens`, {
    method: "POST",
    headers: { cookie, "content-type": "application/json", origin: baseURL },
    body: JSON.stringify({ name: "load script" }),
  });
  if (tok.status !== 201) throw new Error(`token creation → ${tok.status}`);
  return ((await tok.json()) as { token: string }).token;
}

export interface Panelist {
  readonly invitationId: string;
  readonly token: string;
}

export interface PanelSetup {
  readonly panelId: string;
  readonly questionIds: readonly string[];
  readonly panelists: readonly Panelist[];
}


/** Runs `fn` over `items` with at most `limit` calls in flight. */
export async function pool<T, R>(items: readonly T[], limit: number, fn: (item: T, index: number) => Promise<R>): Promise<R[]> {
  const out: R[] = new Array(items.length);
  let next = 0;
  const worker = async () => {
    for (;;) {
      const i = next++;
      if (i >= items.length) return;
      out[i] = await fn(items[i], i);
    }
  };
  await Promise.all(Array.from({ length: Math.min(limit, items.length) }, worker));
  return out;
}

/** `n` roster members "Quillmoor estimator i" (half sales, half engineering); returns their ids. */
export function createRoster(c: Client, token: string, n: number, tag = randomBytes(3).toString("hex")): Promise<string[]> {
  return pool(Array.from({ length: n }, (_, i) => i), 16, async (i) => {
    const m = await c.ok("POST", "/api/v1/roster", {
      token,
      body: { name: `Quillmoor estimator ${i + 1}`, email: `estimator.${i + 1}.${tag}@quillmoor.example`, group: i % 2 ? "sales" : "engineering" },
    });
    return m.id as string;
  });
}

/** Invites the roster members to the panel (200 per request); returns the invitations with their link tokens. */
export async function invite(c: Client, token: string, panelId: string, memberIds: readonly string[]): Promise<Panelist[]> {
  const panelists: Panelist[] = [];
  for (let i = 0; i < memberIds.length; i += 200) {
    const issued = await c.ok("POST", `/api/v1/panels/${panelId}/invitations`, { token, body: { rosterMemberIds: memberIds.slice(i, i + 200) } });
    for (const inv of issued) panelists.push({ invitationId: inv.id, token: inv.token });
  }
  return panelists;
}

/**
 * A panel "Quillmoor field sensor, year-one units" with `questions` single-value questions
 * (bounds 0…100 000), `n` roster members invited, round 1 open.
 */
export async function createPanel(c: Client, token: string, n: number, questions: number): Promise<PanelSetup> {
  const tag = randomBytes(3).toString("hex");
  const memberIds = await createRoster(c, token, n, tag);
  const panel = await c.ok("POST", "/api/v1/panels", {
    token,
    body: {
      title: `Quillmoor field sensor, year-one units (${tag})`,
      questions: Array.from({ length: questions }, (_, q) => ({
        text: `Units of the Quillmoor QF-${q + 1} field sensor sold in its first year?`,
        unit: "units",
        targetPeriod: "first 12 months after launch",
        lowerBound: 0,
        upperBound: 100_000,
        answerFormat: "single",
        aggregation: "shared",
      })),
    },
  });
  const panelists = await invite(c, token, panel.id, memberIds);
  await c.ok("POST", `/api/v1/panels/${panel.id}/rounds/1/open`, { token, body: {} });
  return { panelId: panel.id, questionIds: panel.questions.map((q: { id: string }) => q.id), panelists };
}

// ---------------------------------------------------------------------------------------------
// Answers and what the server said about them

export interface AnswerAttempt {
  readonly invitationId: string;
  readonly token: string;
  readonly questionId: string;
  readonly value: number;
  readonly idempotencyKey: string;
  /** Deliberately outside the question's bounds: the server must refuse it (422). */
  readonly invalid: boolean;
}

export interface AnswerOutcome {
  readonly attempt: AnswerAttempt;
  /** HTTP status, or 0 when the request got no response (connection reset, timeout). */
  readonly status: number;
  readonly ms: number;
  /** The stored version the server acknowledged (201/200). */
  readonly version?: number;
  readonly replayed?: boolean;
  readonly body?: unknown;
}

export async function sendAnswer(c: Client, a: AnswerAttempt, timeoutMs = 30_000): Promise<AnswerOutcome> {
  try {
    const r = await c.request("POST", "/api/v1/panelist/answers", {
      token: a.token,
      headers: { "idempotency-key": a.idempotencyKey },
      body: { questionId: a.questionId, value: a.value, rationale: `Quillmoor channel estimate ${a.value}` },
      timeoutMs,
    });
    const ok = r.status === 201 || r.status === 200;
    return { attempt: a, status: r.status, ms: r.ms, body: r.body, ...(ok ? { version: r.body.answer.version as number, replayed: r.body.replayed as boolean } : {}) };
  } catch {
    return { attempt: a, status: 0, ms: 0 };
  }
}

export function newKey(): string {
  return `ans-${randomBytes(12).toString("base64url")}`;
}

export interface Verification {
  readonly acknowledged: number;
  readonly missing: string[];
  readonly duplicated: string[];
  readonly refusedButStored: string[];
  readonly mismatched: string[];
  /** Rows that no acknowledgement accounts for (allowed only for requests that got no response). */
  readonly unacknowledgedRows: number;
  /** SQLite's `PRAGMA integrity_check` ("ok"); null on PostgreSQL, which has no such check. */
  readonly integrity: string | null;
}

/**
 * Reads the Answer table directly and checks, per idempotency key:
 * - every acknowledged answer (201/200) is stored exactly once, with the acknowledged version and value;
 * - no refused answer (4xx) is stored;
 * and, on SQLite, runs `PRAGMA integrity_check`. Requests that got no response may or may not be stored.
 */
export async function verifyAnswers(databaseUrl: string, outcomes: readonly AnswerOutcome[]): Promise<Verification> {
  const conn = await openSql(databaseUrl, { readonly: true });
  try {
    const rows = await conn.query<{ invitationId: string; questionId: string; version: number; value: number; idempotencyKey: string | null }>(
      `SELECT "invitationId", "questionId", "version", "value", "idempotencyKey" FROM "Answer"`,
    );
    const byKey = new Map<string, typeof rows>();
    for (const r of rows) {
      const k = `${r.invitationId}/${r.idempotencyKey}`;
      byKey.set(k, [...(byKey.get(k) ?? []), r]);
    }
    const missing: string[] = [];
    const duplicated: string[] = [];
    const refusedButStored: string[] = [];
    const mismatched: string[] = [];
    const acknowledgedKeys = new Set<string>();
    for (const o of outcomes) {
      const k = `${o.attempt.invitationId}/${o.attempt.idempotencyKey}`;
      const stored = byKey.get(k) ?? [];
      if (o.status === 201 || o.status === 200) {
        acknowledgedKeys.add(k);
        if (stored.length === 0) missing.push(k);
        else if (stored.length > 1) duplicated.push(k);
        else if (stored[0].version !== o.version || stored[0].value !== o.attempt.value || stored[0].questionId !== o.attempt.questionId) mismatched.push(k);
      } else if (o.status >= 400 && o.status < 500 && stored.length > 0) {
        refusedButStored.push(k);
      }
    }
    // Versions per (invitation, question) must be 1…n without gaps or repeats.
    const versions = await conn.query<{ invitationId: string; questionId: string; n: number; d: number; m: number }>(
      `SELECT "invitationId", "questionId", COUNT(*) AS "n", COUNT(DISTINCT "version") AS "d", MAX("version") AS "m" FROM "Answer" GROUP BY "roundId", "invitationId", "questionId"`,
    );
    for (const v of versions) if (v.n !== v.d || v.m !== v.n) duplicated.push(`${v.invitationId}/${v.questionId}: ${v.n} rows, versions up to ${v.m}`);
    const integrity =
      conn.dialect === "sqlite" ? (await conn.query<{ integrity_check: string }>("PRAGMA integrity_check")).map((r) => r.integrity_check).join("; ") : null;
    return {
      acknowledged: acknowledgedKeys.size,
      missing,
      duplicated,
      refusedButStored,
      mismatched,
      unacknowledgedRows: rows.filter((r) => !acknowledgedKeys.has(`${r.invitationId}/${r.idempotencyKey}`)).length,
      integrity,
    };
  } finally {
    await conn.close();
  }
}

/** CPU seconds (user + system) the process has used so far, from /proc (Linux); NaN elsewhere. */
export function cpuSeconds(pid: number | undefined): number {
  try {
    const fields = readFileSync(`/proc/${pid}/stat`, "utf8").split(") ")[1].split(" ");
    return (Number(fields[11]) + Number(fields[12])) / 100; // utime, stime in clock ticks (USER_HZ = 100)
  } catch {
    return Number.NaN;
  }
}

/** The p-th percentile (nearest rank) of `xs`. */
export function percentile(xs: readonly number[], p: number): number {
  if (xs.length === 0) return NaN;
  const sorted = [...xs].sort((a, b) => a - b);
  return sorted[Math.min(sorted.length - 1, Math.max(0, Math.ceil((p / 100) * sorted.length) - 1))];
}
