/**
 * Hostile input through the server actions (the pages' forms), which reach the domain services
 * without the route builder: every action the build registers is called as a browser calls it
 * (POST to a page with the `Next-Action` header and React's reply encoding: a FormData argument
 * as "$K1" with its entries as "_1_<name>", then field "0", the JSON of the arguments), with
 * hostile field values (NUL, lone surrogates, 5e-324, ±1e308, 70,000 characters, keys named
 * `__proto__` / `constructor`), arguments of the wrong type, and no or forged session cookies.
 * No response may be a 5xx. Then the checks the API makes, through the panelist's answer form:
 * a rationale with NUL and an answer of 5e-324 are refused and not stored, and the per-invitation
 * limit (120 a minute, lib/http/rate-limit.ts) holds for the form as for the API.
 * The requests come from a PRNG with a fixed start value (RNG_START). People are invented.
 */
import { readFileSync } from "node:fs";
import path from "node:path";
import { randomBytes } from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { mulberry32 } from "../helpers/prng";
import { api, apiTokenFor, baseURL, clearDatabase, createAccount, signIn, sql } from "./api-client";

const RNG_START = 0x5eed_0ac7 ^ 0x0b0e; // fixed: change only on purpose
const PER_ACTION = 12;

const rnd = mulberry32(RNG_START);
const pick = <T>(xs: readonly T[]): T => xs[Math.floor(rnd() * xs.length)];

/** The build's server actions: id, the file that exports it, its name and the page that uses it. */
interface ActionRef {
  readonly id: string;
  readonly file: string;
  readonly name: string;
  /** The page's route, e.g. `app/panels/[id]/page` */
  readonly page: string;
}

function registeredActions(): ActionRef[] {
  const dist = process.env.NEXT_DIST_DIR || ".next";
  const manifest = JSON.parse(readFileSync(path.join(dist, "server", "server-reference-manifest.json"), "utf8")) as {
    node: Record<string, { filename?: string; exportedName?: string; workers: Record<string, unknown> }>;
  };
  return Object.entries(manifest.node).map(([id, a]) => ({ id, file: a.filename ?? "?", name: a.exportedName ?? "?", page: Object.keys(a.workers)[0] ?? "app/page" }));
}

/** The address of an action's page with this test's panel, question and private link. */
function pagePath(a: ActionRef): string {
  const ids: Record<string, string> = { id: P, qid: Q, token: panelist };
  return a.page.replace(/^app/, "").replace(/\/page$/, "").replace(/\[(\w+)\]/g, (_, k: string) => ids[k] ?? k) || "/";
}

/** Text values of every hostile kind, as a form field would carry them. */
const HOSTILE_TEXT: readonly string[] = [
  "",
  " ",
  "\u0000",
  "rationale \u0000 with NUL",
  "lone \ud800 surrogate",
  "\udc00",
  "5e-324",
  "-5e-324",
  "1e308",
  "-1e308",
  "1e309",
  "NaN",
  "Infinity",
  "x".repeat(70_000),
  "😀".repeat(3000),
  "<script>alert(1)</script>",
  "=2+3",
  "c".repeat(64),
  "__proto__",
  "constructor",
];
const HOSTILE_KEYS = ["__proto__", "constructor", "toString", "value", "panelId", "questionId", "rationale", "outcomeValue", "future.constructor", "future.__proto__", "lowerBound", "k\ud800"];

/** Arguments that are not what the action declares. */
const HOSTILE_ARGS: readonly unknown[][] = [[], [null], [1, 2, 3], ["x", "y", "z"], [{}, "not a form"], [{ $gt: "" }, 5], [[[[[[]]]]]], ["\ud800", "\u0000"]];

let owner = "";
let cookie = "";
let P = "";
let Q = "";
let INV = "";
let MEMBER = "";
let panelist = "";
let limited = "";
let limitedInvitation = "";
let actions: ActionRef[] = [];

interface Call {
  readonly args?: unknown[];
  readonly form?: readonly (readonly [string, string])[];
  readonly cookie?: string;
  readonly page?: string;
}

/** One server-action request; returns status and body text. */
async function callAction(id: string, call: Call): Promise<{ status: number; text: string }> {
  const body = new FormData();
  const args = call.args ?? [];
  // As React's encodeReply writes it: the form's entries first, the arguments ("0") last.
  for (const [k, v] of call.form ?? []) body.append(`_1_${k}`, v);
  body.set("0", JSON.stringify(call.form ? [...args, "$K1"] : args));
  const headers: Record<string, string> = { "next-action": id, origin: new URL(baseURL).origin, accept: "text/x-component" };
  if (call.cookie) headers.cookie = call.cookie;
  const res = await fetch(`${baseURL}${call.page ?? "/"}`, { method: "POST", headers, body, redirect: "manual" });
  return { status: res.status, text: await res.text() };
}

/** A form for `action` with its ids filled in and one to three hostile fields. */
function hostileForm(): [string, string][] {
  const form: [string, string][] = [
    ["panelId", P],
    ["questionId", Q],
    ["invitationId", INV],
    ["memberId", MEMBER],
    ["roundNumber", "1"],
    ["value", "500"],
  ];
  const n = 1 + Math.floor(rnd() * 3);
  for (let i = 0; i < n; i++) form.push([pick(HOSTILE_KEYS), pick(HOSTILE_TEXT)]);
  return form;
}

beforeAll(async () => {
  const user = createAccount("Ines Quillmoor");
  owner = await apiTokenFor(user);
  cookie = await signIn(user);
  const ok = async (method: string, p: string, b?: unknown) => {
    const res = await api(method, p, { token: owner, body: b });
    if (res.status >= 300) throw new Error(`${method} ${p} → ${res.status}: ${res.text}`);
    return res.body;
  };
  const panel = await ok("POST", "/api/v1/panels", {
    title: "Quillmoor QF-2 year one",
    questions: [{ text: "Units of the QF-2 in year one?", unit: "units", targetPeriod: "year one", lowerBound: 0, upperBound: 100_000, answerFormat: "single", aggregation: "shared" }],
  });
  P = panel.id;
  Q = panel.questions[0].id;
  const members = await Promise.all(
    ["Ruth Calder", "Amos Pike"].map((name, i) => ok("POST", "/api/v1/roster", { name, email: `actions.${i}.${randomBytes(3).toString("hex")}@quillmoor.example` })),
  );
  MEMBER = members[0].id;
  const invs = await ok("POST", `/api/v1/panels/${P}/invitations`, { rosterMemberIds: members.map((m: { id: string }) => m.id) });
  INV = invs[0].id;
  panelist = invs[0].token;
  limited = invs[1].token;
  limitedInvitation = invs[1].id;
  await ok("POST", `/api/v1/panels/${P}/rounds/1/open`, {});
  actions = registeredActions();
});
afterAll(() => clearDatabase());

const answersOf = async (invitationId: string) =>
  (await sql<{ n: number | bigint }>(`SELECT COUNT(*) AS "n" FROM "Answer" WHERE "invitationId" = ?`, [invitationId])).map((r) => Number(r.n))[0];

describe("server actions check input and limits as the API does", () => {
  // First, while the panel is as set up: the fuzz below may close its round or withdraw links.
  const submit = () => actions.find((a) => a.name === "submitAnswerAction")!.id;

  it("a rationale with NUL and an answer of 5e-324 are refused by the answer form and not stored", async () => {
    const before = await answersOf(INV);
    const nul = await callAction(submit(), { args: [panelist, {}], form: [["questionId", Q], ["value", "500"], ["rationale", "fine \u0000 print"]], page: `/p/${panelist}` });
    expect(nul.status).toBe(200);
    expect(nul.text).toContain("must not contain the NUL character");
    // The form takes numbers as people write them (lib/validation/typed-number.ts): an exponent is
    // refused as such, and the same tiny number written in full meets the range rule.
    const tiny = await callAction(submit(), { args: [panelist, {}], form: [["questionId", Q], ["value", "5e-324"]], page: `/p/${panelist}` });
    expect(tiny.text).toContain("contains letters");
    const tinyInFull = await callAction(submit(), { args: [panelist, {}], form: [["questionId", Q], ["value", `0.${"0".repeat(19)}5`]], page: `/p/${panelist}` });
    expect(tinyInFull.text).toContain("must be 0 or between 1e-12 and 1000000000000000 in size");
    expect(await answersOf(INV)).toBe(before);
    // A valid answer through the same form is stored (the refusals above were the input's fault).
    const good = await callAction(submit(), { args: [panelist, {}], form: [["questionId", Q], ["value", "500"], ["rationale", "sound"]], page: `/p/${panelist}` });
    expect(good.text).toContain("Your answer was saved");
    expect(await answersOf(INV)).toBe(before + 1);
  });

  it("a lone surrogate in an action's arguments is refused naming it (a form's multipart encoding cannot carry one; the JSON arguments can)", async () => {
    const reveal = actions.find((a) => a.name === "revealNamesAction")!.id;
    const res = await callAction(reveal, { args: [P, "audit \ud800"], cookie, page: `/panels/${P}` });
    expect(res.status).toBe(200);
    expect(res.text).toContain("lone UTF-16 surrogate");
    expect((await sql(`SELECT "id" FROM "AuditEvent" WHERE "action" LIKE ?`, ["%reveal%"])).length).toBe(0);
  });

  it("the form counts against the invitation's limit of 120 requests a minute, as the API does", async () => {
    // The limit and window are lib/http/rate-limit.ts `limits.panelist` (120 per minute per invitation).
    const texts: string[] = [];
    for (let i = 0; i < 125; i++) {
      const res = await callAction(submit(), { args: [limited, {}], form: [["questionId", Q], ["value", String(100 + i)]], page: `/p/${limited}` });
      texts.push(res.text);
    }
    const refused = texts.filter((t) => t.includes("Too many requests")).length;
    expect(refused).toBeGreaterThanOrEqual(5);
    expect(await answersOf(limitedInvitation)).toBeLessThanOrEqual(120);
    // The API sees the same counter: the invitation is over its limit there too.
    expect((await api("GET", "/api/v1/panelist/panel", { token: limited })).status).toBe(429);
  });
});

describe("fuzz: hostile input through every server action", () => {
  it("the build registers the app's server actions", () => {
    const names = actions.map((a) => a.name);
    for (const n of ["submitAnswerAction", "addQuestionAction", "inviteAction", "baselineAction", "recordOutcomeAction", "createPanelAction", "revealNamesAction", "createFirstOrganiserAction"]) {
      expect(names).toContain(n);
    }
  });

  it(`${PER_ACTION} hostile calls per action: none answers 5xx`, async () => {
    const bad: string[] = [];
    let sent = 0;
    for (const a of actions) {
      for (let k = 0; k < PER_ACTION; k++) {
        const kind = pick(["form", "form", "form", "args", "no-session", "forged-session"] as const);
        const who = kind === "no-session" ? undefined : kind === "forged-session" ? `next-auth.session-token=${randomBytes(40).toString("base64url")}` : cookie;
        // Panelist actions take the private link first; organiser actions take the previous state.
        const lead = a.name === "submitAnswerAction" ? [pick([panelist, "x".repeat(30), "\u0000", "\ud800".repeat(25), panelist])] : [];
        const call: Call =
          kind === "args"
            ? { args: [...lead, ...pick(HOSTILE_ARGS)], cookie: who }
            : a.name === "revealNamesAction"
              ? { args: [pick([P, ...HOSTILE_TEXT]), pick(HOSTILE_TEXT)], cookie: who }
              : { args: [...lead, {}], form: hostileForm(), cookie: who };
        const res = await callAction(a.id, { ...call, page: pagePath(a) });
        sent++;
        if (res.status >= 500) bad.push(`${a.name} (${a.file}) ${kind} → ${res.status}: ${res.text.slice(0, 200)}`);
      }
    }
    expect(sent).toBeGreaterThanOrEqual(actions.length * PER_ACTION);
    expect(bad, `rng start ${RNG_START}: ${bad.length} server-action calls answered 5xx:\n${bad.slice(0, 15).join("\n")}`).toEqual([]);
  });
});
