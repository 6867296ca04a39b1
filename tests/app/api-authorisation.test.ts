/**
 * Authorisation matrix of the JSON API: every route of the route table (lib/http/routes.ts)
 * and the OpenAPI document, called as each of six roles — the panel's organiser, another
 * organiser, a reviewer the panel is shared with, a panelist of this panel, a panelist of
 * another panel, and an anonymous caller — asserting the exact status. Every error is
 * application/problem+json; 401 (no valid credentials) and 403 (not allowed) are distinct.
 * Also: bad input names the offending field, and bad credentials give 401.
 *
 * Routes that change or delete something get a fresh resource for every call, so no call
 * depends on the order of the others. People and e-mails are invented (example.com).
 */
import { randomBytes } from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { routes, type RouteName } from "../../lib/http/routes";
import { api, apiTokenFor, clearDatabase, createAccount, signIn, sql, type Credentials, type TestUser } from "./api-client";

const ROLES = ["anonymous", "panelistElsewhere", "panelistHere", "reviewer", "otherOrganiser", "owner"] as const;
type Role = (typeof ROLES)[number];

let owner = "";
/** The owner's session (tokens are created and revoked only with one). */
let ownerCookie = "";
let other = "";
let reviewerCookie = "";
let reviewer: TestUser;
let panelistHere = "";
let panelistElsewhere = "";
/** The main panel: round 1 closed (one answer), round 2 open, shared with the reviewer. */
let P = "";
let qP = "";
let memberP = "";
/** A panel (shared with the reviewer) whose question has a recorded outcome. */
let R = "";
let qR = "";
const BASELINE = { values: [400, 410, 405, 420, 415, 430], method: "naive", horizon: 1 };

const creds = (role: Role): Credentials =>
  ({
    anonymous: {},
    owner: { token: owner },
    otherOrganiser: { token: other },
    reviewer: { cookie: reviewerCookie },
    panelistHere: { token: panelistHere },
    panelistElsewhere: { token: panelistElsewhere },
  })[role];

const unique = () => randomBytes(5).toString("hex");
const QUESTION = { text: "Units in year one?", unit: "units", targetPeriod: "year one", lowerBound: 0, upperBound: 1000, answerFormat: "single", aggregation: "shared" };

async function ok<T = any>(method: string, path: string, token: string, body?: unknown): Promise<T> {
  const res = await api(method, path, { token, body });
  if (res.status >= 300) throw new Error(`${method} ${path} → ${res.status}: ${res.text}`);
  return res.body as T;
}

/** A new panel of the owner, shared with the reviewer, in the given state. */
async function freshPanel(state: "draft" | "open" | "closed" = "draft"): Promise<{ id: string; questionId: string }> {
  const p = await ok("POST", "/api/v1/panels", owner, { title: `Matrix panel ${unique()}`, questions: [QUESTION] });
  await ok("POST", `/api/v1/panels/${p.id}/shares`, owner, { email: reviewer.email, role: "reviewer" });
  if (state !== "draft") await ok("POST", `/api/v1/panels/${p.id}/rounds/1/open`, owner, {});
  if (state === "closed") await ok("POST", `/api/v1/panels/${p.id}/rounds/1/close`, owner);
  return { id: p.id, questionId: p.questions[0].id };
}

/** A new panel of the owner with round 1 closed and one answer in it (ready for its outcome). */
async function freshAnsweredPanel(): Promise<{ id: string; questionId: string }> {
  const p = await freshPanel("open");
  const [inv] = await ok("POST", `/api/v1/panels/${p.id}/invitations`, owner, { rosterMemberIds: [await freshMember()] });
  await ok("POST", "/api/v1/panelist/answers", inv.token, { questionId: p.questionId, value: 405 });
  await ok("POST", `/api/v1/panels/${p.id}/rounds/1/close`, owner);
  return p;
}

async function freshMember(): Promise<string> {
  return (await ok("POST", "/api/v1/roster", owner, { name: `Member ${unique()}`, email: `m.${unique()}@example.com` })).id;
}

async function freshInvitation(): Promise<string> {
  const [inv] = await ok("POST", `/api/v1/panels/${P}/invitations`, owner, { rosterMemberIds: [await freshMember()] });
  return inv.id;
}

interface Row {
  readonly route: RouteName | "openapi";
  readonly path: () => string | Promise<string>;
  readonly body?: () => unknown;
  readonly expect: Readonly<Record<Role, number>>;
}

const all = (s: number) => ({ anonymous: s, panelistElsewhere: s, panelistHere: s, reviewer: s, otherOrganiser: s, owner: s });
/** Routes for any signed-in user. */
const userRoute = (status: number) => ({ ...all(403), anonymous: 401, reviewer: status, otherOrganiser: status, owner: status });
/** Routes for organisers only (own resources). */
const organiserRoute = (status: number) => ({ ...all(403), anonymous: 401, otherOrganiser: status, owner: status });
/** Owner-only resources: another organiser gets 404, the reviewer 403. */
const ownerOnly = (status: number) => ({ ...all(403), anonymous: 401, otherOrganiser: 404, owner: status });
/** Panel reads open to the reviewer. */
const panelRead = (status: number) => ({ ...ownerOnly(status), reviewer: status });
const panelistRoute = (status: number) => ({ ...all(403), anonymous: 401, panelistHere: status, panelistElsewhere: status });

const ROWS: readonly Row[] = [
  { route: "openapi", path: () => "/api/v1/openapi.json", expect: all(200) },
  { route: "setup", path: () => "/api/v1/setup", body: () => ({ email: `s.${unique()}@example.com`, name: "Second", password: "a-long-password-1" }), expect: all(409) },
  { route: "ruleDefaults", path: () => "/api/v1/rule-defaults", expect: all(200) },
  { route: "getAccount", path: () => "/api/v1/account", expect: userRoute(200) },
  { route: "listApiTokens", path: () => "/api/v1/tokens", expect: organiserRoute(200) },
  // Tokens are managed only with a session, never with a token (tests/app/security.test.ts has the session cases).
  { route: "createApiToken", path: () => "/api/v1/tokens", body: () => ({ name: "matrix" }), expect: { ...all(403), anonymous: 401 } },
  {
    route: "revokeApiToken",
    path: async () => `/api/v1/tokens/${(await api("POST", "/api/v1/tokens", { cookie: ownerCookie, body: { name: "to revoke" } })).body.id}`,
    expect: { ...all(403), anonymous: 401 },
  },
  { route: "changePassword", path: () => "/api/v1/account/password", body: () => ({ currentPassword: "not-the-password", newPassword: "a-long-password-1" }), expect: { ...all(403), anonymous: 401, reviewer: 422 } },
  { route: "listRoster", path: () => "/api/v1/roster", expect: organiserRoute(200) },
  { route: "addRosterMember", path: () => "/api/v1/roster", body: () => ({ name: "New Person", email: `n.${unique()}@example.com`, group: "sales" }), expect: organiserRoute(201) },
  { route: "updateRosterMember", path: () => `/api/v1/roster/${memberP}`, body: () => ({ group: "operations" }), expect: ownerOnly(200) },
  { route: "deleteRosterMember", path: async () => `/api/v1/roster/${await freshMember()}`, expect: ownerOnly(200) },
  { route: "listPanels", path: () => "/api/v1/panels", expect: userRoute(200) },
  { route: "createPanel", path: () => "/api/v1/panels", body: () => ({ title: "Made in the matrix", questions: [QUESTION] }), expect: organiserRoute(201) },
  { route: "getPanel", path: () => `/api/v1/panels/${P}`, expect: panelRead(200) },
  { route: "updatePanel", path: () => `/api/v1/panels/${P}`, body: () => ({ description: "changed" }), expect: ownerOnly(200) },
  { route: "deletePanel", path: async () => `/api/v1/panels/${(await freshPanel()).id}`, expect: ownerOnly(200) },
  { route: "addQuestion", path: async () => `/api/v1/panels/${(await freshPanel()).id}/questions`, body: () => QUESTION, expect: ownerOnly(201) },
  {
    route: "updateQuestion",
    path: async () => {
      const p = await freshPanel();
      return `/api/v1/panels/${p.id}/questions/${p.questionId}`;
    },
    body: () => ({ unit: "sensors" }),
    expect: ownerOnly(200),
  },
  {
    route: "deleteQuestion",
    path: async () => {
      const p = await freshPanel();
      return `/api/v1/panels/${p.id}/questions/${p.questionId}`;
    },
    expect: ownerOnly(200),
  },
  { route: "listShares", path: () => `/api/v1/panels/${P}/shares`, expect: ownerOnly(200) },
  { route: "sharePanel", path: () => `/api/v1/panels/${P}/shares`, body: () => ({ email: reviewer.email, role: "reviewer" }), expect: ownerOnly(201) },
  { route: "unsharePanel", path: async () => `/api/v1/panels/${(await freshPanel()).id}/shares/${encodeURIComponent(reviewer.email)}`, expect: ownerOnly(200) },
  { route: "listInvitations", path: () => `/api/v1/panels/${P}/invitations`, expect: ownerOnly(200) },
  { route: "createInvitations", path: () => `/api/v1/panels/${P}/invitations`, body: () => ({ rosterMemberIds: ["placeholder"] }), expect: ownerOnly(201) },
  { route: "revokeInvitation", path: async () => `/api/v1/panels/${P}/invitations/${await freshInvitation()}`, expect: ownerOnly(200) },
  { route: "reissueInvitation", path: async () => `/api/v1/panels/${P}/invitations/${await freshInvitation()}/reissue`, body: () => ({}), expect: ownerOnly(201) },
  // P's round 2 is open; the suite's server has no SMTP server, so notices go to the outbox.
  { route: "sendNotices", path: () => `/api/v1/panels/${P}/messages`, body: () => ({ kind: "round-opened" }), expect: ownerOnly(200) },
  { route: "listOutbox", path: () => `/api/v1/panels/${P}/outbox`, expect: ownerOnly(200) },
  {
    route: "deleteOutboxMessage",
    path: async () => {
      await ok("POST", `/api/v1/panels/${P}/messages`, owner, { kind: "round-opened" });
      const [message] = await ok("GET", `/api/v1/panels/${P}/outbox`, owner);
      return `/api/v1/panels/${P}/outbox/${message.id}`;
    },
    expect: ownerOnly(200),
  },
  { route: "listRounds", path: () => `/api/v1/panels/${P}/rounds`, expect: panelRead(200) },
  { route: "startNextRound", path: async () => `/api/v1/panels/${(await freshPanel("closed")).id}/rounds`, body: () => ({}), expect: ownerOnly(201) },
  { route: "openRound", path: async () => `/api/v1/panels/${(await freshPanel()).id}/rounds/1/open`, body: () => ({}), expect: ownerOnly(200) },
  { route: "closeRound", path: async () => `/api/v1/panels/${(await freshPanel("open")).id}/rounds/1/close`, expect: ownerOnly(200) },
  { route: "getRoundStatistics", path: () => `/api/v1/panels/${P}/rounds/1/statistics`, expect: panelRead(200) },
  { route: "getRoundAnswers", path: () => `/api/v1/panels/${P}/rounds/1/answers`, expect: ownerOnly(200) },
  { route: "getProgress", path: () => `/api/v1/panels/${P}/progress`, expect: ownerOnly(200) },
  { route: "getConvergence", path: () => `/api/v1/panels/${P}/convergence`, expect: panelRead(200) },
  { route: "revealIdentities", path: () => `/api/v1/panels/${P}/reveal`, body: () => ({ reason: "matrix" }), expect: ownerOnly(200) },
  { route: "finishPanel", path: async () => `/api/v1/panels/${(await freshPanel("closed")).id}/finish`, expect: ownerOnly(200) },
  { route: "listAuditEvents", path: () => `/api/v1/panels/${P}/audit`, expect: ownerOnly(200) },
  { route: "getPanelistPanel", path: () => "/api/v1/panelist/panel", expect: panelistRoute(200) },
  {
    route: "submitAnswer",
    path: () => "/api/v1/panelist/answers",
    body: () => ({ questionId: qP, value: 420, rationale: "matrix" }),
    // The other panel's panelist cannot even name this panel's question: 422 on questionId.
    expect: { ...panelistRoute(201), panelistElsewhere: 422 },
  },
  { route: "getFeedback", path: () => "/api/v1/panelist/feedback", expect: panelistRoute(200) },
  { route: "getBaseline", path: () => `/api/v1/panels/${P}/questions/${qP}/baseline`, expect: panelRead(200) },
  {
    route: "attachBaseline",
    path: async () => {
      const p = await freshPanel();
      return `/api/v1/panels/${p.id}/questions/${p.questionId}/baseline`;
    },
    body: () => BASELINE,
    expect: ownerOnly(200),
  },
  {
    route: "removeBaseline",
    path: async () => {
      const p = await freshPanel();
      await ok("PUT", `/api/v1/panels/${p.id}/questions/${p.questionId}/baseline`, owner, BASELINE);
      return `/api/v1/panels/${p.id}/questions/${p.questionId}/baseline`;
    },
    expect: ownerOnly(200),
  },
  { route: "previewBaseline", path: () => `/api/v1/panels/${P}/questions/${qP}/baseline/preview`, body: () => BASELINE, expect: ownerOnly(200) },
  { route: "setPanelBlendRule", path: () => `/api/v1/panels/${P}/blend-rule`, body: () => ({ rule: "inverse-mse" }), expect: ownerOnly(200) },
  { route: "setQuestionBlendRule", path: () => `/api/v1/panels/${P}/questions/${qP}/blend-rule`, body: () => ({ rule: "organiser", panelWeight: 0.6 }), expect: ownerOnly(200) },
  { route: "getTriangulation", path: () => `/api/v1/panels/${P}/questions/${qP}/triangulation`, expect: panelRead(200) },
  { route: "getOutcome", path: () => `/api/v1/panels/${R}/questions/${qR}/outcome`, expect: panelRead(200) },
  {
    route: "recordOutcome",
    path: async () => {
      const p = await freshAnsweredPanel();
      return `/api/v1/panels/${p.id}/questions/${p.questionId}/outcome`;
    },
    body: () => ({ outcomeValue: 410 }),
    expect: ownerOnly(201),
  },
  { route: "correctOutcome", path: () => `/api/v1/panels/${R}/questions/${qR}/outcome`, body: () => ({ outcomeValue: 412, reason: "matrix" }), expect: ownerOnly(200) },
  { route: "getQuestionReport", path: () => `/api/v1/panels/${P}/questions/${qP}/report.json`, expect: panelRead(200) },
  { route: "getQuestionReportCsv", path: () => `/api/v1/panels/${P}/questions/${qP}/report.csv`, expect: panelRead(200) },
  { route: "getPanelReportCsv", path: () => `/api/v1/panels/${P}/report.csv`, expect: panelRead(200) },
  {
    route: "setTrueValue",
    path: async () => {
      const p = await ok("POST", "/api/v1/panels", owner, { title: `Matrix calibration ${unique()}`, questions: [{ ...QUESTION, answerFormat: "three-point", calibration: true }] });
      await ok("POST", `/api/v1/panels/${p.id}/shares`, owner, { email: reviewer.email, role: "reviewer" });
      return `/api/v1/panels/${p.id}/questions/${p.questions[0].id}/true-value`;
    },
    body: () => ({ trueValue: 420 }),
    expect: ownerOnly(200),
  },
  { route: "getPerformanceWeights", path: () => `/api/v1/panels/${P}/performance-weights`, expect: panelRead(200) },
  { route: "listTrackRecords", path: () => "/api/v1/track-records", expect: organiserRoute(200) },
  { route: "getPortfolio", path: () => "/api/v1/portfolio", expect: userRoute(200) },
  { route: "getPortfolioCsv", path: () => "/api/v1/portfolio.csv", expect: userRoute(200) },
  { route: "getAccuracyHistory", path: () => "/api/v1/accuracy-history", expect: organiserRoute(200) },
];

beforeAll(async () => {
  const ownerUser = createAccount("Ada Fenwick");
  owner = await apiTokenFor(ownerUser);
  ownerCookie = await signIn(ownerUser);
  other = await apiTokenFor(createAccount("Bram Oakes"));
  reviewer = createAccount("Cleo Marr", "reviewer");
  reviewerCookie = await signIn(reviewer);

  const main = await freshPanel("open");
  P = main.id;
  qP = main.questionId;
  memberP = await freshMember();
  const [inv] = await ok("POST", `/api/v1/panels/${P}/invitations`, owner, { rosterMemberIds: [memberP] });
  panelistHere = inv.token;
  await ok("POST", "/api/v1/panelist/answers", panelistHere, { questionId: qP, value: 400 });
  await ok("POST", `/api/v1/panels/${P}/rounds/1/close`, owner);
  await ok("POST", `/api/v1/panels/${P}/rounds`, owner, { open: true });
  await ok("PUT", `/api/v1/panels/${P}/questions/${qP}/baseline`, owner, BASELINE);
  const withOutcome = await freshAnsweredPanel();
  R = withOutcome.id;
  qR = withOutcome.questionId;
  await ok("POST", `/api/v1/panels/${R}/questions/${qR}/outcome`, owner, { outcomeValue: 411 });

  const p2 = await ok("POST", "/api/v1/panels", other, { title: "Another organiser's panel", questions: [QUESTION] });
  const m2 = await ok("POST", "/api/v1/roster", other, { name: "Dana Quill", email: `d.${unique()}@example.com` });
  const [inv2] = await ok("POST", `/api/v1/panels/${p2.id}/invitations`, other, { rosterMemberIds: [m2.id] });
  panelistElsewhere = inv2.token;
  await ok("POST", `/api/v1/panels/${p2.id}/rounds/1/open`, other, {});
});
afterAll(() => clearDatabase());

describe("authorisation matrix", () => {
  it("covers every route of the route table", () => {
    expect(new Set(ROWS.map((r) => r.route))).toEqual(new Set([...Object.keys(routes), "openapi"]));
  });

  for (const row of ROWS) {
    const def = row.route === "openapi" ? { method: "GET", path: "/api/v1/openapi.json" } : routes[row.route];
    it(`${def.method} ${def.path}`, async () => {
      const seen: Record<string, number> = {};
      for (const role of ROLES) {
        let body = row.body?.();
        if (row.route === "createInvitations") body = { rosterMemberIds: [await freshMember()] };
        const res = await api(def.method, await row.path(), { ...creds(role), body });
        seen[role] = res.status;
        if (res.status >= 400) {
          expect(res.contentType, `${role}: ${res.text}`).toContain("application/problem+json");
          expect(res.body.status).toBe(res.status);
        } else {
          expect(res.contentType).toContain(("produces" in def && def.produces) || "application/json");
        }
      }
      expect(seen).toEqual(row.expect);
    });
  }
});

describe("credentials", () => {
  it("an unknown, malformed or revoked Bearer token is 401 with a WWW-Authenticate challenge", async () => {
    const unknown = await fetch(`${(await import("./api-client")).baseURL}/api/v1/panels`, { headers: { authorization: "Bearer trg_pat_nope" } });
    expect(unknown.status).toBe(401);
    expect(unknown.headers.get("www-authenticate")).toMatch(/^Bearer/);
    expect((await api("GET", "/api/v1/panels", { headers: { authorization: "Basic abc" } })).status).toBe(401);
    const t = (await api("POST", "/api/v1/tokens", { cookie: ownerCookie, body: { name: "short-lived" } })).body;
    expect((await api("GET", "/api/v1/panels", { token: t.token })).status).toBe(200);
    expect((await api("DELETE", `/api/v1/tokens/${t.id}`, { cookie: ownerCookie })).status).toBe(200);
    const revoked = await api("GET", "/api/v1/panels", { token: t.token });
    expect(revoked.status).toBe(401);
    expect(revoked.body.detail).toMatch(/revoked/);
    expect(revoked.body.type).toBe("/problems/unauthenticated");
  });

  it("a change made with the session cookie must come from this site (Origin check)", async () => {
    const cookie = await signIn(createAccount("Elin Rask"));
    const foreign = await api("POST", "/api/v1/tokens", { cookie, body: { name: "x" }, headers: { origin: "https://elsewhere.example" } });
    expect(foreign.status).toBe(403);
    expect(foreign.body.detail).toMatch(/Cross-site/);
    expect(foreign.body.type).toBe("/problems/forbidden");
    const { baseURL } = await import("./api-client");
    const same = await api("POST", "/api/v1/tokens", { cookie, body: { name: "x" }, headers: { origin: baseURL } });
    expect(same.status).toBe(201);
  });

  it("an expired invitation is 401 and says it expired", async () => {
    const id = await freshInvitation();
    const token = (await ok("POST", `/api/v1/panels/${P}/invitations/${id}/reissue`, owner, {})).token;
    expect((await api("GET", "/api/v1/panelist/panel", { token })).status).toBe(200);
    await sql(`UPDATE "Invitation" SET "expiresAt" = ? WHERE "id" = ?`, [new Date(Date.now() - 1000), id]);
    const res = await api("GET", "/api/v1/panelist/panel", { token });
    expect(res.status).toBe(401);
    expect(res.body.detail).toMatch(/expired/);
  });

  it("API tokens and passwords are stored only as hashes", async () => {
    const tokens = await sql<{ tokenHash: string }>(`SELECT "tokenHash" FROM "ApiToken"`);
    const users = await sql<{ passwordHash: string }>(`SELECT "passwordHash" FROM "User"`);
    expect(tokens.every((t) => /^[0-9a-f]{64}$/.test(t.tokenHash))).toBe(true);
    expect(tokens.some((t) => t.tokenHash.includes(owner))).toBe(false);
    expect(users.every((u) => /^scrypt\$15\$8\$1\$[A-Za-z0-9_-]{22}\$[A-Za-z0-9_-]{43}$/.test(u.passwordHash))).toBe(true);
  });
});

describe("bad input names the field (422, problem+json)", () => {
  const cases: [string, string, () => string, unknown, string][] = [
    ["panel with bounds reversed", "POST", () => "/api/v1/panels", { title: "x", questions: [{ ...QUESTION, lowerBound: 10, upperBound: 5 }] }, "questions.0.lowerBound"],
    ["panel with an unknown answer format", "POST", () => "/api/v1/panels", { title: "x", questions: [QUESTION, { ...QUESTION, answerFormat: "multiple" }] }, "questions.1.answerFormat"],
    ["panel without a title", "POST", () => "/api/v1/panels", { questions: [] }, "title"],
    ["roster member with a bad e-mail", "POST", () => "/api/v1/roster", { name: "x", email: "not-an-e-mail" }, "email"],
    ["round with a deadline that is not a date", "POST", () => `/api/v1/panels/${P}/rounds`, { deadline: "next Tuesday" }, "deadline"],
    ["round number that is not a number", "GET", () => `/api/v1/panels/${P}/rounds/first/statistics`, undefined, "roundNumber"],
    ["stability threshold above 100%", "PATCH", () => `/api/v1/panels/${P}`, { stabilityThreshold: 1.5 }, "stabilityThreshold"],
  ];
  for (const [label, method, path, body, field] of cases) {
    it(label, async () => {
      const res = await api(method, path(), { token: owner, body });
      expect(res.status).toBe(422);
      expect(res.contentType).toContain("application/problem+json");
      expect(res.body.type).toBe("/problems/validation-failed");
      expect(res.body.errors.map((e: { field: string }) => e.field)).toContain(field);
    });
  }

  it("a round number in the path that is not one says so in plain words, not the validator's text", async () => {
    for (const part of ["abc", "0", "1.5"]) {
      const res = await api("GET", `/api/v1/panels/${P}/rounds/${part}/statistics`, { token: owner });
      expect(res.status, part).toBe(422);
      expect(res.body.errors, part).toEqual([{ field: "roundNumber", message: "round must be a round number such as 2" }]);
    }
  });

  it("the first-run endpoint checks the password before anything else", async () => {
    const res = await api("POST", "/api/v1/setup", { body: { email: "x@example.com", name: "X", password: "short" } });
    expect(res.status).toBe(422);
    expect(res.body.errors).toEqual([{ field: "password", message: "at least 12 characters" }]);
  });
});
