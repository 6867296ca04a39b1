/**
 * Two app instances on one database: the suite's server (instance A) and a second `triangulate serve`
 * on another port (instance B) with the same database and secret, as behind a load balancer.
 * Nothing either instance keeps in memory may make them disagree:
 * - a session cookie issued by A is accepted by B;
 * - an answer sent to B shows up at once in the live progress read from A;
 * - a passed deadline closes the round exactly once, while both instances are asked at once
 *   (one "round.closed" audit event, one statistics row per question);
 * - sign-in attempts are rate-limited across both (10 per account and address in all).
 * Runs on the suite's database: SQLite (two processes sharing the file in WAL mode) in the "app"
 * project, PostgreSQL in "app-postgres". The expected values follow from the rules themselves.
 */
import { randomBytes } from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { inject } from "vitest";
import { freePort, startServer, type RunningServer } from "../harness/harness";
import { api, apiTokenFor, baseURL, clearDatabase, createAccount, databaseUrl, signIn, signInAttempt, sql, type TestUser } from "./api-client";

const A = baseURL;
let B: string;
let second: RunningServer | undefined;
let owner: TestUser;
let token: string;

const QUESTION = { text: "Wren-2 units shipped in the first year?", unit: "units", targetPeriod: "first 12 months", lowerBound: 0, upperBound: 100_000, answerFormat: "single", aggregation: "shared" };

beforeAll(async () => {
  second = await startServer({ databaseUrl, port: await freePort(), distDir: process.env.NEXT_DIST_DIR || ".next", secret: inject("authSecret") });
  B = second.baseURL;
  owner = createAccount("Mirela Stroud");
  token = await apiTokenFor(owner);
});

afterAll(async () => {
  await second?.stop();
  await clearDatabase();
});

/** A request to instance `base` (api() of api-client goes to A only). */
async function at(base: string, method: string, path: string, o: { token?: string; cookie?: string; body?: unknown } = {}) {
  const headers: Record<string, string> = {};
  if (o.token) headers.authorization = `Bearer ${o.token}`;
  if (o.cookie) Object.assign(headers, { cookie: o.cookie, origin: base });
  if (o.body !== undefined) headers["content-type"] = "application/json";
  const res = await fetch(`${base}${path}`, { method, headers, body: o.body === undefined ? undefined : JSON.stringify(o.body) });
  const text = await res.text();
  return { status: res.status, body: text ? JSON.parse(text) : undefined, headers: res.headers };
}

/** A panel with one question and `n` invited panelists, round 1 open; returns ids and panelist tokens. */
async function runningPanel(n: number) {
  const panel = await api("POST", "/api/v1/panels", { token, body: { title: `Wren-2 year one ${randomBytes(3).toString("hex")}`, questions: [QUESTION] } });
  expect(panel.status).toBe(201);
  const members = [];
  for (let i = 0; i < n; i++) {
    const m = await api("POST", "/api/v1/roster", { token, body: { name: `Estimator ${i + 1}`, email: `est.${i}.${randomBytes(3).toString("hex")}@quillmoor.example` } });
    members.push(m.body.id as string);
  }
  const inv = await api("POST", `/api/v1/panels/${panel.body.id}/invitations`, { token, body: { rosterMemberIds: members } });
  expect(inv.status).toBe(201);
  expect((await api("POST", `/api/v1/panels/${panel.body.id}/rounds/1/open`, { token, body: {} })).status).toBe(200);
  return { panelId: panel.body.id as string, questionId: panel.body.questions[0].id as string, panelists: (inv.body as { token: string }[]).map((i) => i.token) };
}

describe("two instances sharing one database", () => {
  it("a session cookie from instance A is accepted by instance B", async () => {
    const cookie = await signIn(owner);
    const onA = await at(A, "GET", "/api/v1/account", { cookie });
    const onB = await at(B, "GET", "/api/v1/account", { cookie });
    expect(onA.status).toBe(200);
    expect(onB.status).toBe(200);
    expect(onB.body.id).toBe(onA.body.id);
    expect(onB.body.email).toBe(owner.email);
  });

  it("an answer sent to B shows up in the live progress read from A", async () => {
    const { panelId, questionId, panelists } = await runningPanel(3);
    const before = await at(A, "GET", `/api/v1/panels/${panelId}/progress`, { token });
    expect(before.body.answeredAll).toBe(0);
    const sent = await at(B, "POST", "/api/v1/panelist/answers", { token: panelists[1], body: { questionId, value: 4200 } });
    expect(sent.status).toBe(201);
    const after = await at(A, "GET", `/api/v1/panels/${panelId}/progress`, { token });
    expect(after.body.answeredAll).toBe(1);
    expect(after.body.panelists.filter((p: { questionsAnswered: number }) => p.questionsAnswered === 1)).toHaveLength(1);
    // And a revision through A is version 2 of the answer B stored.
    const revised = await at(A, "POST", "/api/v1/panelist/answers", { token: panelists[1], body: { questionId, value: 4300 } });
    expect(revised.status).toBe(201);
    expect(revised.body.answer.version).toBe(2);
  });

  it("a passed deadline closes the round exactly once while both instances are asked at once", async () => {
    const { panelId, questionId, panelists } = await runningPanel(4);
    for (const [i, p] of panelists.entries()) {
      expect((await at(i % 2 ? A : B, "POST", "/api/v1/panelist/answers", { token: p, body: { questionId, value: 1000 * (i + 1) } })).status).toBe(201);
    }
    const deadline = new Date(Date.now() - 5_000);
    await sql(`UPDATE "Round" SET "deadline" = ? WHERE "panelId" = ? AND "number" = 1`, [deadline, panelId]);
    // 24 requests at once, half to each instance: organiser reads and late answers all settle the deadline first.
    const calls = Array.from({ length: 24 }, (_, i) => {
      const base = i % 2 ? A : B;
      return i % 3 === 0
        ? at(base, "POST", "/api/v1/panelist/answers", { token: panelists[i % 4], body: { questionId, value: 9999 } })
        : at(base, "GET", `/api/v1/panels/${panelId}/rounds`, { token });
    });
    const results = await Promise.all(calls);
    for (const [i, r] of results.entries()) expect(r.status, `call ${i}`).toBe(i % 3 === 0 ? 409 : 200);
    const closed = await sql<{ n: number }>(`SELECT COUNT(*) AS "n" FROM "AuditEvent" WHERE "panelId" = ? AND "action" = 'round.closed'`, [panelId]);
    expect(closed[0].n).toBe(1);
    const stats = await sql<{ n: number }>(`SELECT COUNT(*) AS "n" FROM "RoundStatistic" s JOIN "Round" r ON r."id" = s."roundId" WHERE r."panelId" = ?`, [panelId]);
    expect(stats[0].n).toBe(1);
    const [round] = await sql<{ status: string; closedAt: Date }>(`SELECT "status", "closedAt" FROM "Round" WHERE "panelId" = ? AND "number" = 1`, [panelId]);
    expect(round.status).toBe("closed");
    expect(round.closedAt.getTime()).toBe(deadline.getTime());
    // The late answers were refused and none was stored: 4 answers, one per panelist.
    const answers = await sql<{ n: number }>(`SELECT COUNT(*) AS "n" FROM "Answer" a JOIN "Round" r ON r."id" = a."roundId" WHERE r."panelId" = ?`, [panelId]);
    expect(answers[0].n).toBe(4);
    // Both instances report the round closed, with the same statistics (median of 1000…4000 = 2500).
    const fromA = await at(A, "GET", `/api/v1/panels/${panelId}/rounds/1/statistics`, { token });
    const fromB = await at(B, "GET", `/api/v1/panels/${panelId}/rounds/1/statistics`, { token });
    expect(fromA.status).toBe(200);
    expect(fromB.body).toEqual(fromA.body);
  });

  it("sign-in attempts are counted across both instances: the 11th for one account is 429 on either", async () => {
    const user = createAccount("Joss Penhale");
    const attempt = (base: string, password: string) => signInAttempt(user.email, password, base);
    for (let i = 0; i < 10; i++) expect((await attempt(i % 2 ? A : B, `wrong-${i}`)).status).not.toBe(429);
    const onA = await attempt(A, user.password);
    const onB = await attempt(B, user.password);
    expect(onA.status).toBe(429);
    expect(onB.status).toBe(429);
    expect(onB.headers.get("content-type")).toBe("application/problem+json");
  });
});
