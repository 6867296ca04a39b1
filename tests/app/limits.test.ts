/**
 * Size limits and the worker pool over HTTP (issue 11, item 7): a panel's questions, its
 * panelists, a roster and a baseline history are capped with a 422 naming the field and the
 * limit (lib/validation/limits.ts), and a panelist's answer is acknowledged while an
 * organiser's baseline is being fitted on the worker thread (lib/work/pool.ts): the order in
 * which responses arrive, not their timing. People, panels and series are invented.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { api, apiTokenFor, clearDatabase, createAccount, sql, type TestUser } from "./api-client";

let organiser: TestUser;
let owner = "";

async function ok<T = any>(method: string, path: string, token: string, body?: unknown): Promise<T> {
  const res = await api(method, path, { token, body });
  if (res.status >= 300) throw new Error(`${method} ${path} → ${res.status}: ${res.text}`);
  return res.body as T;
}

const question = (i: number) => ({ text: `Wren-2 units sold in region ${i}?`, unit: "units", targetPeriod: "2027 Q1", lowerBound: 0, upperBound: 100000, answerFormat: "single", aggregation: "shared" });

/** `count` roster members of the organiser written directly (numbered from `from`), as a large roster would be. */
async function fillRoster(userId: string, from: number, count: number): Promise<void> {
  await sql(
    `INSERT INTO "RosterMember" ("id", "ownerId", "name", "email", "group", "createdAt")
     WITH RECURSIVE n(i) AS (SELECT CAST(? AS INTEGER) UNION ALL SELECT i + 1 FROM n WHERE i < CAST(? AS INTEGER))
     SELECT 'filler-' || i, ?, 'Filler ' || i, 'filler' || i || '@example.com', '', ? FROM n`,
    [from, from + count - 1, userId, new Date()],
  );
}

beforeAll(async () => {
  organiser = createAccount("Maren Tolley");
  owner = await apiTokenFor(organiser);
});
afterAll(() => clearDatabase());

describe("limits", () => {
  let panelId = "";
  let questionId = "";
  let userId = "";

  beforeAll(async () => {
    const panel = await ok("POST", "/api/v1/panels", owner, { title: "Wren-2 regional volumes", questions: Array.from({ length: 50 }, (_, i) => question(i + 1)) });
    panelId = panel.id;
    questionId = panel.questions[0].id;
    for (let i = 51; i <= 100; i++) await ok("POST", `/api/v1/panels/${panelId}/questions`, owner, question(i));
    [{ id: userId }] = await sql<{ id: string }>(`SELECT "id" FROM "User" WHERE "email" = ?`, [organiser.email]);
  });

  it("a panel takes 100 questions; the 101st added one by one is refused with 422 naming the limit", async () => {
    const res = await api("POST", `/api/v1/panels/${panelId}/questions`, { token: owner, body: question(101) });
    expect(res.status, res.text.slice(0, 300)).toBe(422);
    expect(res.contentType).toContain("application/problem+json");
    expect(res.body.errors[0]).toEqual({ field: "questions", message: "A panel holds at most 100 questions; it has 100" });
    const [{ n }] = await sql<{ n: number | bigint }>(`SELECT COUNT(*) AS "n" FROM "Question" WHERE "panelId" = ?`, [panelId]);
    expect(Number(n)).toBe(100);
  });

  it("a baseline history over 5,000 rows is refused with 422 naming the field, by PUT and by preview, as CSV or pasted values", async () => {
    const csv = ["month,value", ...Array.from({ length: 5001 }, (_, i) => `${i + 1},${100 + (i % 9)}`)].join("\n");
    for (const path of ["baseline", "baseline/preview"]) {
      const res = await api(path === "baseline" ? "PUT" : "POST", `/api/v1/panels/${panelId}/questions/${questionId}/${path}`, { token: owner, body: { csv } });
      expect(res.status, res.text.slice(0, 300)).toBe(422);
      expect(res.body.errors[0].field).toBe("csv");
      expect(res.body.errors[0].message).toContain("at most 5000 data rows");
    }
    const values = await api("PUT", `/api/v1/panels/${panelId}/questions/${questionId}/baseline`, { token: owner, body: { values: Array.from({ length: 5001 }, (_, i) => i % 9) } });
    expect(values.status, values.text.slice(0, 300)).toBe(422);
    expect(values.body.errors[0]).toMatchObject({ field: "values", message: expect.stringContaining("at most 5000 values") });
    expect((await sql(`SELECT "id" FROM "Baseline" WHERE "questionId" = ?`, [questionId])).length).toBe(0);
  });

  it("a panel takes 2,000 panelists; inviting one more is refused with 422", async () => {
    await fillRoster(userId, 1, 2000);
    await sql(
      `INSERT INTO "Invitation" ("id", "panelId", "rosterMemberId", "pseudonym", "tokenHash", "expiresAt", "createdAt")
       SELECT 'inv-' || "id", ?, "id", 'Filler ' || "id", 'hash-' || "id", ?, ? FROM "RosterMember" WHERE "ownerId" = ?`,
      [panelId, new Date(Date.now() + 86_400_000), new Date(), userId],
    );
    const member = await ok("POST", "/api/v1/roster", owner, { name: "Oskar Venn", email: "oskar.venn@example.com" });
    const res = await api("POST", `/api/v1/panels/${panelId}/invitations`, { token: owner, body: { rosterMemberIds: [member.id] } });
    expect(res.status, res.text.slice(0, 300)).toBe(422);
    expect(res.body.errors[0]).toMatchObject({ field: "rosterMemberIds", message: expect.stringContaining("at most 2000 panelists") });
  });

  it("a roster takes 5,000 people; the next is refused with 422", async () => {
    await fillRoster(userId, 2001, 2999); // 2,000 + 2,999 + Oskar Venn = 5,000
    const res = await api("POST", "/api/v1/roster", { token: owner, body: { name: "Pia Lund", email: "pia.lund@example.com" } });
    expect(res.status, res.text.slice(0, 300)).toBe(422);
    expect(res.body.errors[0]).toEqual({ field: "email", message: "A roster holds at most 5000 people; it has 5000" });
  });
});

describe("a baseline fit does not hold panelists' answers back", () => {
  it("answers sent one after another while a 5,000-row baseline is being fitted are acknowledged before the baseline's response", async () => {
    // Another organiser: the first one's roster is full from the limits above.
    const owner = await apiTokenFor(createAccount("Lio Banner"));
    const panel = await ok("POST", "/api/v1/panels", owner, { title: "Wren-2 annual volume", questions: [question(1), question(2)] });
    const member = await ok("POST", "/api/v1/roster", owner, { name: "Rhea Castell", email: "rhea.castell@example.com" });
    const [invited] = await ok<any[]>("POST", `/api/v1/panels/${panel.id}/invitations`, owner, { rosterMemberIds: [member.id] });
    await ok("POST", `/api/v1/panels/${panel.id}/rounds/1/open`, owner, {});
    // Invented monthly history: trend, yearly season and a repeating wobble; automatic method choice with season 12.
    const csv = ["month,value", ...Array.from({ length: 5000 }, (_, i) => `${i + 1},${(100 + i * 0.1 + 10 * Math.sin((2 * Math.PI * i) / 12) + ((i * 7919) % 13)).toFixed(3)}`)].join("\n");
    // A small fit first, so that the route is loaded and the worker started before the heavy one.
    await ok("PUT", `/api/v1/panels/${panel.id}/questions/${panel.questions[1].id}/baseline`, owner, { values: [3, 5, 4, 6, 5, 7], method: "naive" });
    const order: string[] = [];
    let fitted = false;
    const fit = api("PUT", `/api/v1/panels/${panel.id}/questions/${panel.questions[1].id}/baseline`, { token: owner, body: { csv, season: 12, horizon: 4 } }).then((res) => {
      fitted = true;
      order.push(`baseline ${res.status}`);
    });
    // One answer after another while the fit runs (at most 20: the per-invitation rate limit).
    for (let i = 0; i < 20 && !fitted; i++) {
      const res = await api("POST", "/api/v1/panelist/answers", { token: invited.token, body: { questionId: panel.questions[0].id, value: 500 + i, rationale: "invented" } });
      order.push(`answer ${res.status}`);
    }
    await fit;
    // Fitting on the request thread holds every answer that arrives during the fit until it
    // ends: only those before the fit starts or while the result is stored get through first.
    expect(order.slice(0, 10)).toEqual(Array(10).fill("answer 201"));
    expect(order).toContain("baseline 200");
  });
});
