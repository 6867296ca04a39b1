/**
 * A panelist's own record over HTTP (issue 18, part 2; docs/methods.md §22; THREATS.md): a roster
 * member answered two earlier panels whose questions have recorded outcomes (and a calibration
 * question with its true value); their private link on a third panel opens "Your record", whose
 * figures equal the organiser's named track record of that person (`/api/v1/track-records`, what
 * the organiser sees by name) and, independently, R run in the test on the answers as given.
 * Another panelist's link shows only their own figures; a withdrawn link shows nothing; the page
 * names no organiser and no other panelist. People and panels are invented (Quillmoor Instruments).
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { api, apiTokenFor, baseURL, clearDatabase, createAccount } from "./api-client";
import { runR } from "../stats/rscript";

let owner = "";
const tokens: Record<string, string> = {};
const memberIds: Record<string, string> = {};
const ORGANISER = "Odile Marchbank";
const NAMES = { a: "Tamsin Brackley", b: "Ewan Harrowgate", c: "Lise Pennock" };

// Each person's answers: [low, mid, high] (three-point) or a single value, per question.
// Distinctive values, so that a leak into another person's page would be found by text search.
const A = { q1: [80.25, 101.75, 120.5], q2: 50.125, q3: [200.5, 251.25, 300.75], cal: [90.5, 103.25, 130.5] };
const B = { q1: [95.5, 107.5, 111.5], q2: 66.5, q3: [300.5, 330.5, 360.5], cal: [60.5, 70.5, 80.5] };
const ACTUAL = { q1: 110, q2: 60, q3: 320, cal: 125 };

async function ok<T = any>(method: string, path: string, token: string, body?: unknown): Promise<T> {
  const res = await api(method, path, { token, body });
  if (res.status >= 300) throw new Error(`${method} ${path} → ${res.status}: ${res.text}`);
  return res.body as T;
}

const question = (text: string, answerFormat: "single" | "three-point", extra: Record<string, unknown> = {}) => ({
  text,
  unit: "units",
  targetPeriod: "2025",
  lowerBound: 0,
  upperBound: 10000,
  answerFormat,
  aggregation: "shared",
  ...extra,
});

/** A panel with these questions, the given people invited; returns question ids and tokens by person. */
async function panel(title: string, questions: object[], people: string[]): Promise<{ id: string; questionIds: string[]; tokens: Record<string, string>; invitations: Record<string, string> }> {
  const p = await ok("POST", "/api/v1/panels", owner, { title, questions });
  const issued = await ok<any[]>("POST", `/api/v1/panels/${p.id}/invitations`, owner, { rosterMemberIds: people.map((x) => memberIds[x]) });
  const byPerson = (f: (x: any) => string) => Object.fromEntries(people.map((x) => [x, f(issued.find((i) => i.rosterMemberId === memberIds[x]))]));
  return { id: p.id, questionIds: p.questions.map((q: { id: string }) => q.id), tokens: byPerson((i) => i.token), invitations: byPerson((i) => i.id) };
}

async function answer(token: string, questionId: string, a: number | number[]) {
  const body = Array.isArray(a) ? { questionId, low: a[0], value: a[1], high: a[2] } : { questionId, value: a };
  await ok("POST", "/api/v1/panelist/answers", token, { ...body, rationale: "invented" });
}

beforeAll(async () => {
  const user = createAccount(ORGANISER);
  owner = await apiTokenFor(user);
  for (const [k, name] of Object.entries(NAMES)) memberIds[k] = (await ok("POST", "/api/v1/roster", owner, { name, email: `${k}.${Date.now()}@example.com` })).id;

  // Earlier panel 1: a three-point and a single-value question.
  const p1 = await panel("Wren-1 launch year", [question("Wren-1 units in Q1", "three-point"), question("Wren-1 resellers", "single")], ["a", "b"]);
  await ok("POST", `/api/v1/panels/${p1.id}/rounds/1/open`, owner, {});
  for (const [k, x] of [["a", A], ["b", B]] as const) {
    await answer(p1.tokens[k], p1.questionIds[0], x.q1);
    await answer(p1.tokens[k], p1.questionIds[1], x.q2);
  }
  await ok("POST", `/api/v1/panels/${p1.id}/rounds/1/close`, owner);
  await ok("POST", `/api/v1/panels/${p1.id}/questions/${p1.questionIds[0]}/outcome`, owner, { outcomeValue: ACTUAL.q1 });
  await ok("POST", `/api/v1/panels/${p1.id}/questions/${p1.questionIds[1]}/outcome`, owner, { outcomeValue: ACTUAL.q2 });

  // Earlier panel 2: a three-point question and a calibration question (P5 / P50 / P95) with its true value.
  const p2 = await panel("Wren-1 second year", [question("Wren-1 units in year two", "three-point"), question("Wren-1 field units", "three-point", { calibration: true, trueValue: ACTUAL.cal })], ["a", "b"]);
  await ok("POST", `/api/v1/panels/${p2.id}/rounds/1/open`, owner, {});
  for (const [k, x] of [["a", A], ["b", B]] as const) {
    await answer(p2.tokens[k], p2.questionIds[0], x.q3);
    await answer(p2.tokens[k], p2.questionIds[1], x.cal);
  }
  await ok("POST", `/api/v1/panels/${p2.id}/rounds/1/close`, owner);
  await ok("POST", `/api/v1/panels/${p2.id}/questions/${p2.questionIds[0]}/outcome`, owner, { outcomeValue: ACTUAL.q3 });

  // The current panel: a and b invited; c invited, then withdrawn.
  const p3 = await panel("Wren-2 first year", [question("Wren-2 units in year one", "single")], ["a", "b", "c"]);
  Object.assign(tokens, p3.tokens);
  await ok("DELETE", `/api/v1/panels/${p3.id}/invitations/${p3.invitations.c}`, owner);
});
afterAll(() => clearDatabase());

async function page(token: string): Promise<{ status: number; html: string; stat: (name: string) => number | null }> {
  const res = await fetch(`${baseURL}/p/${token}/record`);
  const html = await res.text();
  const stat = (name: string) => {
    const m = html.match(new RegExp(`data-stat="${name}" data-value="([^"]*)"`));
    if (!m) throw new Error(`no figure ${name} on the page`);
    return m[1] === "" ? null : Number(m[1]);
  };
  return { status: res.status, html, stat };
}

describe("Your record (/p/<token>/record)", () => {
  it("shows the person's figures, equal to the organiser's named track record and to R", async () => {
    const records = await ok<any[]>("GET", "/api/v1/track-records", owner);
    for (const [k, x] of [["a", A], ["b", B]] as const) {
      const named = records.find((r) => r.rosterMemberId === memberIds[k]).record;
      const p = await page(tokens[k]);
      expect(p.status).toBe(200);
      expect(p.stat("count")).toBe(named.count);
      expect(p.stat("interval80-hits")).toBe(named.intervalHitRate.hits);
      expect(p.stat("interval80-count")).toBe(named.intervalHitRate.count);
      expect(p.stat("interval80-rate")).toBe(named.intervalHitRate.rate);
      expect(p.stat("bias-factor")).toBe(named.bias.factor);
      expect(p.stat("bias-raw")).toBe(named.bias.raw);
      expect(p.stat("bias-credibility")).toBe(named.bias.credibility);
      // Independently, R on the answers as given: 3 outcomes, credibility 3/(3 + 5),
      // factor exp(Z · mean(log(actual/answer))), hit count of the P10–P90 ranges, and of the P5–P95 range (90%).
      const [[factor, raw, credibility, hits80, n80, hits90]] = runR(`
        act <- c(${ACTUAL.q1}, ${ACTUAL.q2}, ${ACTUAL.q3}); ans <- c(${x.q1[1]}, ${x.q2}, ${x.q3[1]})
        m <- mean(log(act / ans)); z <- 3 / (3 + 5)
        lo <- c(${x.q1[0]}, ${x.q3[0]}); hi <- c(${x.q1[2]}, ${x.q3[2]}); a3 <- c(${ACTUAL.q1}, ${ACTUAL.q3})
        cat(sprintf("%.17g", c(exp(z * m), exp(m), z, sum(a3 >= lo & a3 <= hi), 2, as.numeric(${ACTUAL.cal} >= ${x.cal[0]} && ${ACTUAL.cal} <= ${x.cal[2]}))), "\\n")`);
      expect(p.stat("count")).toBe(3);
      expect(Math.abs(p.stat("bias-factor")! - factor) / factor).toBeLessThan(1e-12);
      expect(Math.abs(p.stat("bias-raw")! - raw) / raw).toBeLessThan(1e-12);
      expect(p.stat("bias-credibility")).toBeCloseTo(credibility, 14);
      expect(p.stat("interval80-hits")).toBe(hits80);
      expect(p.stat("interval80-count")).toBe(n80);
      expect(p.stat("interval90-hits")).toBe(hits90);
      expect(p.stat("interval90-count")).toBe(1);
      expect(p.stat("interval90-nominal")).toBe(0.9);
      // Fewer than 5 outcomes: the advice says so instead of advising.
      expect(p.html).toContain("too few outcomes to say whether they are too narrow or too wide");
      expect(p.html).toContain("Only 3 of your answers have a recorded outcome: too few to say whether you answer high or low");
    }
  });

  it("shows no other panelist's data, no names and no organiser", async () => {
    const a = await page(tokens.a);
    const b = await page(tokens.b);
    // Hand count: a's q1 110 in [80.25, 120.5] held, q3 320 outside [200.5, 300.75]; b's q1 110 in [95.5, 111.5] and q3 320 in [300.5, 360.5] both held.
    expect(a.stat("interval80-hits")).toBe(1);
    expect(b.stat("interval80-hits")).toBe(2);
    for (const [p, other] of [[a, B], [b, A]] as const) {
      for (const v of [...other.q1, other.q2, ...other.q3, ...other.cal]) expect(p.html).not.toContain(String(v));
      for (const name of [ORGANISER, ...Object.values(NAMES)]) expect(p.html).not.toContain(name);
    }
    // Nor its own answers or the outcomes themselves (the chart carries errors only).
    for (const v of [...A.q1, A.q2, ...A.q3]) expect(a.html).not.toContain(String(v));
  });

  it("is linked from the panelist's panel page", async () => {
    const res = await fetch(`${baseURL}/p/${tokens.a}`);
    expect(await res.text()).toContain(`href="/p/${tokens.a}/record"`);
  });

  it("a withdrawn link gets nothing, nor does an unknown one", async () => {
    for (const t of [tokens.c, tokens.a.slice(0, -4) + "AAAA"]) {
      const p = await page(t);
      expect(p.html).toContain("This link does not work");
      expect(p.html).not.toContain('data-section="figures"');
      expect(p.html).not.toContain("data-stat=");
    }
  });
});
