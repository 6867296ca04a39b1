/**
 * Hostile input over every operation of the route table (lib/http/routes.ts): at least 1,000
 * requests, each built to be refused — bodies that break the operation's zod schema (checked here
 * with the same schema before sending), bodies that are not JSON or not UTF-8, bodies over the size
 * limit, path parameters that are too long, not numbers, or name nothing, other users' resources,
 * the wrong kind of actor, forged, revoked and expired tokens, malformed Authorization headers,
 * lone UTF-16 surrogates and values nested 10,000 deep in otherwise valid bodies,
 * forged session cookies and bad Idempotency-Keys. Every response must be a 4xx with an
 * application/problem+json body whose `status` matches, never a 5xx; and afterwards every table
 * of the database must hold exactly what it held before (row counts and a SHA-256 of all rows,
 * leaving out only the "last used" / "last seen" times that valid tokens refresh).
 *
 * The requests come from a PRNG with a fixed start value (RNG_START), so a failure reproduces: the
 * failure list names the request's index and shape. People are invented (Quillmoor Instruments).
 */
import { createHash, randomBytes } from "node:crypto";
import http from "node:http";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { mulberry32 } from "../helpers/prng";
import { routes, type RouteDef } from "../../lib/http/routes";
import { api, apiTokenFor, baseURL, clearDatabase, createAccount, openDb, signIn, sql } from "./api-client";
import { appTables } from "../harness/sql";

const RNG_START = 0x7a11_f022 ^ 0x1234; // fixed: change only on purpose
const PER_ROUTE = 20;
/** lib/http/handler.ts MAX_BODY_BYTES (not imported: that module opens the database). */
const MAX_BODY_BYTES = 2 * 1024 * 1024;

const rnd = mulberry32(RNG_START);
const pick = <T>(xs: readonly T[]): T => xs[Math.floor(rnd() * xs.length)];

/** Values of every wrong kind. */
const HOSTILE: readonly unknown[] = [
  null,
  true,
  false,
  0,
  -1,
  0.5,
  -0,
  1e308,
  -1e308,
  5e-324,
  -2.2e-308,
  "\ud800",
  2 ** 53 + 2,
  "NaN",
  "Infinity",
  "-Infinity",
  "1e309",
  "",
  " ",
  "\u0000",
  "x".repeat(70_000),
  "😀".repeat(3000),
  "<script>alert(1)</script>",
  "' OR 1=1 --",
  "=HYPERLINK(\"http://quillmoor.example\")",
  "2026-13-45T99:99:99Z",
  [],
  [1, "two", null],
  Array.from({ length: 600 }, (_, i) => i),
  {},
  { $gt: "" },
  JSON.parse('{"__proto__": {"polluted": true}}'),
];

/** Bodies that are not JSON (sent as raw text). */
const NOT_JSON = ["{", "[1,2", "{\"value\": NaN}", "{\"value\": Infinity}", "nul", "{'a': 1}", "{\"a\":1}}", "\u0000\u0001", "{\"a\": 01}"];

type Creds = { token?: string; cookie?: string; headers?: Record<string, string> };

let owner = "";
let other = "";
let revokedPat = "";
let panelist = "";
let expiredPanelist = "";
let revokedPanelist = "";
let P = "";
let Q = "";
let INV = "";
let MEMBER = "";
let TOKEN_ID = "";
let OTHER_EMAIL = "";
let P2 = "";
let Q2 = "";
let MEMBER2 = "";
let TOKEN_ID2 = "";

async function ok(method: string, path: string, token: string, body?: unknown): Promise<any> {
  const res = await api(method, path, { token, body });
  if (res.status >= 300) throw new Error(`${method} ${path} → ${res.status}: ${res.text}`);
  return res.body;
}

const QUESTION = { text: "Units of the QF-2 in year one?", unit: "units", targetPeriod: "year one", lowerBound: 0, upperBound: 1000, answerFormat: "single", aggregation: "shared" };

/** A schema-valid body per operation (used where something else must make the request fail). */
function validBody(op: string): unknown {
  const bodies: Record<string, unknown> = {
    createFirstOrganiser: { email: "late.organiser@quillmoor.example", name: "Late Organiser", password: "a long enough passphrase" },
    createApiToken: { name: "fuzz" },
    addRosterMember: { name: "Quillmoor Estimator", email: "estimator@quillmoor.example" },
    updateRosterMember: { name: "Renamed" },
    createPanel: { title: "Quillmoor panel", questions: [QUESTION] },
    updatePanel: { title: "Renamed panel" },
    addQuestion: QUESTION,
    updateQuestion: { unit: "boxes" },
    sharePanel: { email: "nobody@quillmoor.example", role: "reviewer" },
    createInvitations: { rosterMemberIds: [MEMBER] },
    reissueInvitation: {},
    sendNotices: { kind: "round-opened" },
    startNextRound: { open: true },
    openRound: {},
    revealIdentities: { reason: "fuzz" },
    submitAnswer: { questionId: Q, value: 500 },
    attachBaseline: { values: [1, 2, 3, 4, 5, 6, 7, 8] },
    previewBaseline: { values: [1, 2, 3, 4, 5, 6, 7, 8] },
    setPanelBlendRule: { rule: "equal" },
    setQuestionBlendRule: { rule: "equal" },
    recordOutcome: { outcomeValue: 500 },
    correctOutcome: { outcomeValue: 501, reason: "fuzz" },
  };
  return bodies[op] ?? {};
}

/** A body that the operation's own zod schema refuses (so the server must refuse it too). */
function invalidBody(r: RouteDef): unknown {
  const schema = r.body!;
  for (let tries = 0; tries < 50; tries++) {
    const base = JSON.parse(JSON.stringify(validBody(r.operationId))) as Record<string, unknown>;
    const keys = Object.keys(base);
    const shape = (schema as unknown as { shape?: Record<string, unknown> }).shape ?? (schema as any)._zod?.def?.in?.shape ?? {};
    const fields = [...new Set([...keys, ...Object.keys(shape)])];
    let candidate: unknown;
    switch (Math.floor(rnd() * 5)) {
      case 0: // the whole body of a wrong type
        candidate = pick([[], 42, "text", null, true, [base]]);
        break;
      case 1: // a field of a wrong type or out of range
        candidate = { ...base, [pick(fields.length ? fields : ["value"])]: pick(HOSTILE) };
        break;
      case 2: // two fields, plus extra fields
        candidate = { ...base, [pick(fields.length ? fields : ["x"])]: pick(HOSTILE), [pick(fields.length ? fields : ["y"])]: pick(HOSTILE), extra: pick(HOSTILE), isAdmin: true };
        break;
      case 3: {
        // a required field missing
        const c = { ...base };
        delete c[pick(keys.length ? keys : ["x"])];
        candidate = c;
        break;
      }
      default: // every field hostile
        candidate = Object.fromEntries(fields.map((f) => [f, pick(HOSTILE)]));
    }
    if (!schema.safeParse(candidate).success) return candidate;
  }
  return 12345; // no schema here takes a bare number
}

/** Path parameters of the owner's resources. */
function ownPath(r: RouteDef, overrides: Record<string, string> = {}): string {
  const ids: Record<string, string> = { panelId: P, questionId: Q, roundNumber: "1", invitationId: INV, email: OTHER_EMAIL, memberId: MEMBER, tokenId: TOKEN_ID, messageId: "c0000000000000000000000001", ...overrides };
  return r.path.replace(/\{(\w+)\}/g, (_, name: string) => encodeURIComponent(ids[name]));
}

/** Path parameters naming another organiser's resources. */
function othersPath(r: RouteDef): string {
  return ownPath(r, { panelId: P2, questionId: Q2, memberId: MEMBER2, tokenId: TOKEN_ID2, invitationId: "c0000000000000000000000000" });
}

const HOSTILE_PARAMS = ["x".repeat(65), "NaN", "Infinity", "-1", "0", "1.5", "1e309", "99999999999999999999", "%00", "' OR '1'='1", "😀", "null", "undefined", "__proto__", "constructor", " ", "c".repeat(64)];

function hostilePath(r: RouteDef): string {
  const names = [...r.path.matchAll(/\{(\w+)\}/g)].map((m) => m[1]);
  const target = pick(names);
  return ownPath(r, { [target]: pick(HOSTILE_PARAMS) });
}

/** Forged or dead credentials; `bearerOnly` for public routes, where a missing session is no error. */
function forgedCreds(bearerOnly: boolean): Creds {
  const all: Creds[] = [
    { token: `trg_pat_${randomBytes(32).toString("base64url")}` },
    { token: randomBytes(32).toString("base64url") },
    { token: revokedPat },
    { token: expiredPanelist },
    { token: revokedPanelist },
    { token: owner.slice(0, -1) + (owner.endsWith("A") ? "B" : "A") },
    { headers: { authorization: "Bearer" } },
    { headers: { authorization: `Basic ${Buffer.from("a:b").toString("base64")}` } },
    { headers: { authorization: "Bearer a b" } },
    { headers: { authorization: `Bearer ${"x".repeat(5000)}` } },
    { headers: { cookie: `next-auth.session-token=${randomBytes(40).toString("base64url")}` } },
    { headers: { cookie: "next-auth.session-token=eyJhbGciOiJub25lIn0.eyJzdWIiOiJ4In0." } },
  ];
  return pick(bearerOnly ? all.filter((c) => !c.headers?.cookie) : all);
}

/** Status recorded when the server closed the connection before an oversized body was sent. */
const CLOSED_UNREAD = -1;

interface Sent {
  readonly i: number;
  readonly kind: string;
  readonly method: string;
  readonly path: string;
  readonly status: number;
  readonly contentType: string;
  readonly problemStatus: unknown;
  readonly text: string;
}

/**
 * One request over node:http that reads the server's answer even when the server answers before
 * the whole body is sent (a 413 on an oversized body) and closes the connection: fetch would
 * fail with EPIPE there, although an HTTP client may read such an early response (RFC 9112 §9.6).
 */
function request(url: string, method: string, headers: Record<string, string>, payload?: string | Uint8Array): Promise<{ status: number; contentType: string; text: string }> {
  return new Promise((resolve, reject) => {
    let answered = false;
    const req = http.request(url, { method, headers: { ...headers, ...(payload !== undefined ? { "content-length": String(Buffer.byteLength(payload)) } : {}) }, agent: false }, (res) => {
      answered = true;
      const chunks: Buffer[] = [];
      res.on("data", (c: Buffer) => chunks.push(c));
      res.on("end", () => resolve({ status: res.statusCode ?? 0, contentType: String(res.headers["content-type"] ?? ""), text: Buffer.concat(chunks).toString("utf8") }));
      res.on("error", reject);
    });
    // A write error after the answer has begun (the server closed early) is not a failure.
    req.on("error", (err) => (answered ? undefined : reject(err)));
    req.end(payload);
  });
}

async function send(i: number, kind: string, method: string, path: string, creds: Creds, body?: unknown, raw?: string | Uint8Array): Promise<Sent> {
  const headers: Record<string, string> = { ...creds.headers };
  if (creds.token) headers.authorization = `Bearer ${creds.token}`;
  if (creds.cookie) headers.cookie = creds.cookie;
  let payload: string | Uint8Array | undefined;
  if (raw !== undefined) payload = raw;
  else if (body !== undefined) payload = JSON.stringify(body);
  if (payload !== undefined) headers["content-type"] = "application/json";
  let res: { status: number; contentType: string; text: string };
  try {
    res = await request(`${baseURL}${path}`, method, headers, payload);
  } catch (err) {
    // An oversized body may be refused unread: the server answers 413 and closes the connection
    // while the body is still being sent, and the write fails before the answer is read.
    const code = (err as NodeJS.ErrnoException).code;
    if (kind !== "oversized" || (code !== "EPIPE" && code !== "ECONNRESET")) throw err;
    res = { status: CLOSED_UNREAD, contentType: "", text: `connection closed by the server while the body was sent (${code})` };
  }
  const text = res.text;
  let problemStatus: unknown;
  try {
    problemStatus = JSON.parse(text).status;
  } catch {
    problemStatus = undefined;
  }
  return { i, kind, method, path: path.length > 120 ? `${path.slice(0, 120)}…` : path, status: res.status, contentType: res.contentType, problemStatus, text: text.slice(0, 200) };
}

/**
 * Every table's row count and a SHA-256 over its rows (sorted, so the storage order does not matter). Left out: the "last used"
 * times, and the rate-limit counters, which count the hostile requests by design.
 */
async function snapshot(): Promise<Record<string, { rows: number; sha256: string }>> {
  const IGNORED: Record<string, readonly string[]> = { ApiToken: ["lastUsedAt"], Invitation: ["lastSeenAt"] };
  const conn = await openDb();
  try {
    const tables = (await appTables(conn)).filter((t) => t !== "RateLimitWindow");
    const out: Record<string, { rows: number; sha256: string }> = {};
    for (const t of tables) {
      const rows = (await conn.query(`SELECT * FROM "${t}"`)).map((row) => {
        for (const col of IGNORED[t] ?? []) delete row[col];
        return JSON.stringify(row, (_, v) => (typeof v === "bigint" ? v.toString() : v));
      });
      const h = createHash("sha256");
      for (const row of rows.sort()) h.update(row);
      out[t] = { rows: rows.length, sha256: h.digest("hex") };
    }
    return out;
  } finally {
    await conn.close();
  }
}

beforeAll(async () => {
  const ownerUser = createAccount("Ines Quillmoor");
  owner = await apiTokenFor(ownerUser);
  other = await apiTokenFor(createAccount("Otto Farrow"));
  OTHER_EMAIL = (await ok("GET", "/api/v1/account", other)).email;
  const tokens = await ok("GET", "/api/v1/tokens", owner);
  TOKEN_ID = tokens[0].id;
  TOKEN_ID2 = (await ok("GET", "/api/v1/tokens", other))[0].id;
  // Tokens are created and revoked with a session only.
  const ownerCookie = await signIn(ownerUser);
  const spare = (await api("POST", "/api/v1/tokens", { cookie: ownerCookie, body: { name: "to revoke" } })).body;
  expect((await api("DELETE", `/api/v1/tokens/${spare.id}`, { cookie: ownerCookie })).status).toBe(200);
  revokedPat = spare.token;

  const panel = await ok("POST", "/api/v1/panels", owner, { title: "Quillmoor QF-2 year one", questions: [QUESTION] });
  P = panel.id;
  Q = panel.questions[0].id;
  const members = await Promise.all(
    ["Ruth Calder", "Amos Pike", "Lena Voss"].map((name, i) => ok("POST", "/api/v1/roster", owner, { name, email: `fuzz.${i}.${randomBytes(3).toString("hex")}@quillmoor.example` })),
  );
  MEMBER = members[0].id;
  const invs = await ok("POST", `/api/v1/panels/${P}/invitations`, owner, { rosterMemberIds: members.map((m: { id: string }) => m.id) });
  INV = invs[0].id;
  panelist = invs[0].token;
  revokedPanelist = invs[1].token;
  await ok("DELETE", `/api/v1/panels/${P}/invitations/${invs[1].id}`, owner);
  expiredPanelist = invs[2].token;
  await sql(`UPDATE "Invitation" SET "expiresAt" = ? WHERE "id" = ?`, [new Date(Date.now() - 60_000), invs[2].id]);
  await ok("POST", `/api/v1/panels/${P}/rounds/1/open`, owner, {});
  await ok("POST", "/api/v1/panelist/answers", panelist, { questionId: Q, value: 420 });

  const p2 = await ok("POST", "/api/v1/panels", other, { title: "Another organiser's panel", questions: [QUESTION] });
  P2 = p2.id;
  Q2 = p2.questions[0].id;
  MEMBER2 = (await ok("POST", "/api/v1/roster", other, { name: "Nell Brant", email: `nell.${randomBytes(3).toString("hex")}@quillmoor.example` })).id;
  // Refresh every "last used" time now, so that the snapshot's ignored columns are the only ones that move.
  await ok("GET", "/api/v1/panelist/panel", panelist);
});
afterAll(() => clearDatabase());

describe("fuzz: hostile requests over every route", () => {
  it(`refuses ${PER_ROUTE} per route (≥ 1,000 in all) with 4xx problem+json and leaves the database unchanged`, async () => {
    const before = await snapshot();
    const sent: Sent[] = [];
    const all = Object.values(routes) as RouteDef[];
    let i = 0;
    for (const r of all) {
      const hasParams = r.path.includes("{");
      for (let k = 0; k < PER_ROUTE; k++) {
        const kinds: string[] = ["forged-credentials"];
        if (r.auth !== "none") kinds.push("wrong-actor");
        if (hasParams && r.auth === "user") kinds.push("others-ids", "hostile-params");
        if (r.body) kinds.push("invalid-body", "invalid-body", "not-json", "oversized", "hostile-text");
        if (r.operationId === "submitAnswer") kinds.push("answer-out-of-bounds", "answer-other-panel", "bad-idempotency-key");
        if (r.operationId === "createFirstOrganiser") kinds.push("setup-again");
        const kind = kinds[k % kinds.length]; // every kind for every route; the details are random
        const own = hasParams ? ownPath(r) : r.path;
        const actorOwn: Creds = { token: r.auth === "panelist" ? panelist : owner };
        let res: Sent;
        switch (kind) {
          case "forged-credentials": {
            // From outside addresses (X-Forwarded-For), so that the per-address limit on invalid
            // credentials (lib/http/rate-limit.ts) counts them apart from the other tests' traffic.
            const c = forgedCreds(r.auth === "none");
            res = await send(i, kind, r.method, own, { ...c, headers: { ...c.headers, "x-forwarded-for": `198.51.100.${i % 200}` } }, r.body ? validBody(r.operationId) : undefined);
            break;
          }
          case "wrong-actor":
            res = await send(i, kind, r.method, own, { token: r.auth === "panelist" ? owner : panelist }, r.body ? validBody(r.operationId) : undefined);
            break;
          case "others-ids":
            res = await send(i, kind, r.method, othersPath(r), { token: owner }, r.body ? validBody(r.operationId) : undefined);
            break;
          case "hostile-params":
            res = await send(i, kind, r.method, hostilePath(r), { token: owner }, r.body ? validBody(r.operationId) : undefined);
            break;
          case "invalid-body":
            res = await send(i, kind, r.method, own, actorOwn, invalidBody(r));
            break;
          case "not-json": {
            const raw = rnd() < 0.3 ? new Uint8Array([0x7b, 0x22, 0x61, 0x22, 0x3a, 0x22, 0xff, 0xfe, 0x22, 0x7d]) : pick(NOT_JSON);
            res = await send(i, kind, r.method, own, actorOwn, undefined, raw);
            break;
          }
          case "oversized":
            res = await send(i, kind, r.method, own, actorOwn, undefined, JSON.stringify({ name: "x".repeat(MAX_BODY_BYTES + 1000) }));
            break;
          case "hostile-text": {
            // A valid body plus a lone surrogate in a string, or a value nested 10,000 deep
            // (lib/validation/nul.ts refuses both before any schema: 422 naming the field).
            const base = validBody(r.operationId) as Record<string, unknown>;
            const strings = Object.keys(base).filter((f) => typeof base[f] === "string");
            if (rnd() < 0.5) {
              res = await send(i, kind, r.method, own, actorOwn, { ...base, [strings.length > 0 ? pick(strings) : "note"]: `text \ud800 ${i}` });
            } else {
              // Written as text: JSON.stringify itself recurses and cannot write 10,000 levels.
              const rest = JSON.stringify(base).slice(1);
              const raw = `{"nested":${"[".repeat(10_000)}${"]".repeat(10_000)}${rest === "}" ? "" : ","}${rest}`;
              res = await send(i, kind, r.method, own, actorOwn, undefined, raw);
            }
            break;
          }
          case "answer-out-of-bounds":
            res = await send(i, kind, r.method, own, actorOwn, { questionId: Q, value: pick([1e308, -1e308, -1, 1001, 2 ** 60, Number.MIN_VALUE - 1]) });
            break;
          case "answer-other-panel":
            res = await send(i, kind, r.method, own, actorOwn, { questionId: pick([Q2, "c".repeat(64), "x"]), value: 500 });
            break;
          case "bad-idempotency-key":
            res = await send(i, kind, r.method, own, { token: panelist, headers: { "idempotency-key": pick(["has space", "", "k".repeat(201), "tab\tkey", "quote\"d key"]) } }, { questionId: Q, value: 1e308 });
            break;
          default: // setup-again: an organiser exists, so a valid first-organiser body is a 409
            res = await send(i, kind, r.method, own, {}, validBody(r.operationId));
        }
        sent.push(res);
        i++;
      }
    }
    expect(sent.length).toBeGreaterThanOrEqual(1000);
    const bad = sent.filter(
      (s) => s.status === CLOSED_UNREAD ? s.kind !== "oversized" : s.status < 400 || s.status >= 500 || !s.contentType.startsWith("application/problem+json") || s.problemStatus !== s.status,
    );
    expect(bad, `rng start ${RNG_START}: ${bad.length} responses were not 4xx problem+json:\n${bad.slice(0, 15).map((b) => JSON.stringify(b)).join("\n")}`).toEqual([]);

    // Every kind of hostility was tried, and each got its status class.
    const byKind = new Map<string, Set<number>>();
    for (const s of sent) byKind.set(s.kind, new Set([...(byKind.get(s.kind) ?? []), s.status]));
    expect([...byKind.keys()].sort()).toEqual(
      ["answer-other-panel", "answer-out-of-bounds", "bad-idempotency-key", "forged-credentials", "hostile-params", "hostile-text", "invalid-body", "not-json", "others-ids", "oversized", "setup-again", "wrong-actor"].sort(),
    );
    // 413, or the connection closed by the server before the body was sent (refused unread).
    expect([...byKind.get("oversized")!].every((s) => s === 413 || s === CLOSED_UNREAD)).toBe(true);
    // 422, or 429 where a route's rate limit (counted first, lib/http/handler.ts) is reached by the run.
    expect([...byKind.get("hostile-text")!].sort()).toContain(422);
    expect([...byKind.get("hostile-text")!].every((s) => s === 422 || s === 429)).toBe(true);
    expect([...byKind.get("forged-credentials")!].every((s) => s === 401 || s === 429)).toBe(true);

    expect(await snapshot()).toEqual(before);
  });
});
