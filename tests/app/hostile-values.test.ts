/**
 * One hostile number must not break an organiser's reports (issue 11, item 3), over HTTP:
 * an answer of 5e-324 (IEEE 754 binary64's smallest subnormal, 2^-1074: ln(actual / 5e-324) is
 * Infinity) and bounds of ±1e308 (sums overflow) are refused at input with 422 naming the field;
 * and an answer of 5e-324 stored before that rule (written here with direct SQL) is left out of
 * its panelist's track record and counted, while the track records, the other question's
 * triangulation and report, and a newly recorded outcome all still answer. People are invented.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { api, apiTokenFor, clearDatabase, createAccount, sql } from "./api-client";

let owner = "";
let P = "";
let Q1 = "";
let Q2 = "";
let tokens: string[] = [];
let members: { id: string; name: string }[] = [];

async function ok<T = any>(method: string, path: string, body?: unknown): Promise<T> {
  const res = await api(method, path, { token: owner, body });
  if (res.status >= 300) throw new Error(`${method} ${path} → ${res.status}: ${res.text}`);
  return res.body as T;
}

const QUESTION = { unit: "units", targetPeriod: "year one", lowerBound: 0, upperBound: 100_000, answerFormat: "single", aggregation: "shared" };

beforeAll(async () => {
  owner = await apiTokenFor(createAccount("Ines Quillmoor"));
  const panel = await ok("POST", "/api/v1/panels", {
    title: "Quillmoor QF-2 and QF-3",
    questions: [
      { ...QUESTION, text: "QF-2 units in year one?" },
      { ...QUESTION, text: "QF-3 units in year one?" },
    ],
  });
  P = panel.id;
  [Q1, Q2] = panel.questions.map((q: { id: string }) => q.id);
  members = [];
  for (const name of ["Ruth Calder", "Amos Pike", "Lena Voss"]) members.push(await ok("POST", "/api/v1/roster", { name, email: `${name.split(" ")[0].toLowerCase()}.${Date.now()}@quillmoor.example` }));
  const invs = await ok<{ token: string; rosterMemberId: string }[]>("POST", `/api/v1/panels/${P}/invitations`, { rosterMemberIds: members.map((m) => m.id) });
  tokens = members.map((m) => invs.find((i) => i.rosterMemberId === m.id)!.token);
  await ok("POST", `/api/v1/panels/${P}/rounds/1/open`, {});
});
afterAll(() => clearDatabase());

describe("values whose ratios or sums overflow are refused at input", () => {
  it("an answer of 5e-324 inside bounds 0–100,000 is 422 naming the value", async () => {
    const res = await api("POST", "/api/v1/panelist/answers", { token: tokens[0], body: { questionId: Q1, value: 5e-324 } });
    expect(res.status).toBe(422);
    expect(JSON.stringify(res.body)).toContain("value");
    expect(res.text).toContain("must be 0 or between 1e-12 and 1000000000000000");
  });

  it("bounds of ±1e308 are 422 naming both bounds", async () => {
    const res = await api("POST", `/api/v1/panels/${P}/questions`, { token: owner, body: { ...QUESTION, text: "Huge?", lowerBound: -1e308, upperBound: 1e308 } });
    expect(res.status).toBe(422);
    expect(res.text).toContain("lowerBound");
    expect(res.text).toContain("upperBound");
  });
});

describe("an answer of 5e-324 stored before the rule", () => {
  it("is left out of its panelist's record and counted; every other figure still answers", async () => {
    // Round 1: Q1 and Q2 answered by all three; Amos Pike's Q1 answer then set to 5e-324 directly.
    for (const [i, token] of tokens.entries()) {
      for (const [q, v] of [[Q1, 400 + 50 * i], [Q2, 900 + 100 * i]] as const) {
        const res = await api("POST", "/api/v1/panelist/answers", { token, body: { questionId: q, value: v } });
        expect(res.status).toBe(201);
      }
    }
    await sql(`UPDATE "Answer" SET "value" = ? WHERE "questionId" = ? AND "value" = ?`, [5e-324, Q1, 450]);
    await ok("POST", `/api/v1/panels/${P}/rounds/1/close`, {});

    expect((await api("POST", `/api/v1/panels/${P}/questions/${Q1}/outcome`, { token: owner, body: { outcomeValue: 480 } })).status).toBe(201);

    const records = await api("GET", "/api/v1/track-records", { token: owner });
    expect(records.status).toBe(200);
    const byName = new Map((records.body as { name: string; skipped: number; record: { count: number } }[]).map((r) => [r.name, r]));
    expect(byName.get("Amos Pike")).toMatchObject({ skipped: 1, record: { count: 0 } });
    expect(byName.get("Ruth Calder")).toMatchObject({ skipped: 0, record: { count: 1 } });
    // Ruth Calder answered 400 for an actual of 480: ln(480/400) = ln 1.2 = 0.1823215567939546 (by hand).
    expect((byName.get("Ruth Calder") as any).record.meanLogRatio).toBeCloseTo(0.1823215567939546, 12);

    // The other question's views, and those of the question that holds the stored value.
    for (const q of [Q2, Q1]) {
      for (const path of ["triangulation", "report.json", "report.csv"]) {
        const res = await api("GET", `/api/v1/panels/${P}/questions/${q}/${path}`, { token: owner });
        expect(res.status, `${q === Q1 ? "Q1" : "Q2"} ${path}`).toBe(200);
      }
    }
    expect((await api("POST", `/api/v1/panels/${P}/questions/${Q2}/outcome`, { token: owner, body: { outcomeValue: 1000 } })).status).toBe(201);
    // Correcting the first actual works as well.
    expect((await api("PATCH", `/api/v1/panels/${P}/questions/${Q1}/outcome`, { token: owner, body: { outcomeValue: 470, reason: "typo" } })).status).toBe(200);
    expect((await api("GET", "/api/v1/track-records", { token: owner })).status).toBe(200);
    expect((await api("GET", "/api/v1/accuracy-history", { token: owner })).status).toBe(200);
  });
});
