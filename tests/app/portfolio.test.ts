/**
 * The portfolio (issue 15) over HTTP and in Chromium: every question of the panels the user may
 * read, with the figures of each question's report.
 *
 * Set-up over the API (people, panels and numbers invented; Quillmoor Instruments' Wren-2):
 * - organiser A owns "Wren-2 launch year" (two shared-quantity questions; five panelists answer
 *   both in round 1 and only the first in round 2; a naive baseline on the first) shared with a
 *   reviewer, and "Wren-2 spares" (one question, three other panelists, outcome 41 recorded);
 * - organiser B owns "Wren-2 export markets", shared with nobody.
 * So the reviewer sees the launch-year panel's two rows, A sees three rows, B one.
 *
 * Expected values, by hand from the published rules the app states (docs/methods.md):
 * - panel figure: the median of five answers (the middle one);
 * - naive baseline (Hyndman & Athanasopoulos, FPP3 §5.2): the forecast is the last observation, 80;
 * - equal weights, the default (Bates & Granger 1969; Blattberg & Hoch 1990's 50/50):
 *   blend = 0.5 × panel + 0.5 × baseline; the launch-year panel's members have no outcome
 *   recorded on any question, so their bias factors are 1 and the corrected figure is the raw one.
 *   Round 1 median 70 → blend 75; round 2 median 72 → blend 76; change since round 1: +1.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, Page } from "playwright-core";
import { api, apiTokenFor, baseURL, clearDatabase, createAccount, signIn, type TestUser } from "./api-client";
import { expectAccessible, launchChromium, signInPage } from "./browser";

const ROUND1 = [60, 64, 70, 72, 80];
const ROUND2 = [66, 68, 72, 73, 75];
const SECOND = [40, 45, 50, 55, 90];
const HISTORY = [52, 58, 61, 66, 70, 74, 77, 80];
const SPARES = [30, 38, 44];
const OUTCOME = 41;

let orgA = "";
let orgB = "";
let reviewer: TestUser;
let reviewerCookie = "";
let launch = { id: "", q1: "", q2: "" };
let spares = { id: "", q: "" };
let exportPanel = "";

async function ok<T = any>(method: string, path: string, token: string, body?: unknown): Promise<T> {
  const res = await api(method, path, { token, body });
  if (res.status >= 300) throw new Error(`${method} ${path} → ${res.status}: ${res.text}`);
  return res.body as T;
}

const question = (text: string) => ({ text, unit: "units", targetPeriod: "year one", lowerBound: 0, upperBound: 1000, answerFormat: "single", aggregation: "shared" });

/** Invites `n` new roster members of `owner` and returns their invitation tokens. */
async function invite(owner: string, panelId: string, n: number, tag: string): Promise<string[]> {
  const members: { id: string }[] = [];
  for (let i = 0; i < n; i++) members.push(await ok("POST", "/api/v1/roster", owner, { name: `${tag} expert ${i + 1}`, email: `${tag}.${i + 1}.${Date.now()}@example.com` }));
  const issued = await ok<any[]>("POST", `/api/v1/panels/${panelId}/invitations`, owner, { rosterMemberIds: members.map((m) => m.id) });
  return members.map((m) => issued.find((x) => x.rosterMemberId === m.id).token);
}

const answer = (token: string, questionId: string, value: number) => ok("POST", "/api/v1/panelist/answers", token, { questionId, value, rationale: "invented" });

beforeAll(async () => {
  orgA = await apiTokenFor(createAccount("Maren Tullock"));
  orgB = await apiTokenFor(createAccount("Ivo Brackley"));
  reviewer = createAccount("Hester Quayle", "reviewer");
  reviewerCookie = await signIn(reviewer);

  const p1 = await ok("POST", "/api/v1/panels", orgA, { title: "Wren-2 launch year", questions: [question("Wren-2 units sold in year one?"), question("Wren-2 units returned in year one?")] });
  launch = { id: p1.id, q1: p1.questions[0].id, q2: p1.questions[1].id };
  await ok("POST", `/api/v1/panels/${launch.id}/shares`, orgA, { email: reviewer.email, role: "reviewer" });
  const t1 = await invite(orgA, launch.id, 5, "launch");
  await ok("POST", `/api/v1/panels/${launch.id}/rounds/1/open`, orgA, {});
  for (let i = 0; i < 5; i++) {
    await answer(t1[i], launch.q1, ROUND1[i]);
    await answer(t1[i], launch.q2, SECOND[i]);
  }
  await ok("POST", `/api/v1/panels/${launch.id}/rounds/1/close`, orgA);
  await ok("POST", `/api/v1/panels/${launch.id}/rounds`, orgA, { open: true });
  for (let i = 0; i < 5; i++) await answer(t1[i], launch.q1, ROUND2[i]);
  await ok("POST", `/api/v1/panels/${launch.id}/rounds/2/close`, orgA);
  const csv = ["period,value", ...HISTORY.map((v, i) => `${i + 1},${v}`)].join("\n");
  await ok("PUT", `/api/v1/panels/${launch.id}/questions/${launch.q1}/baseline`, orgA, { csv, method: "naive", horizon: 1 });

  const p2 = await ok("POST", "/api/v1/panels", orgA, { title: "Wren-2 spares", questions: [question("Wren-2 spare probes sold in year one?")] });
  spares = { id: p2.id, q: p2.questions[0].id };
  const t2 = await invite(orgA, spares.id, 3, "spares");
  await ok("POST", `/api/v1/panels/${spares.id}/rounds/1/open`, orgA, {});
  for (let i = 0; i < 3; i++) await answer(t2[i], spares.q, SPARES[i]);
  await ok("POST", `/api/v1/panels/${spares.id}/rounds/1/close`, orgA);
  await ok("POST", `/api/v1/panels/${spares.id}/questions/${spares.q}/outcome`, orgA, { outcomeValue: OUTCOME, note: "invented" });

  const p3 = await ok("POST", "/api/v1/panels", orgB, { title: "Wren-2 export markets", questions: [question("Wren-2 units sold abroad in year one?")] });
  exportPanel = p3.id;
});
afterAll(() => clearDatabase());

describe("the portfolio over HTTP", () => {
  it("lists exactly the questions each user may read", async () => {
    const a = await api("GET", "/api/v1/portfolio", { token: orgA });
    const b = await api("GET", "/api/v1/portfolio", { token: orgB });
    const r = await api("GET", "/api/v1/portfolio", { cookie: reviewerCookie });
    for (const res of [a, b, r]) expect(res.status, res.text).toBe(200);
    // Panels newest first, questions in the panel's order.
    expect(a.body.rows.map((x: any) => x.questionId)).toEqual([spares.q, launch.q1, launch.q2]);
    expect(b.body.rows.map((x: any) => x.panelId)).toEqual([exportPanel]);
    expect(r.body.rows.map((x: any) => x.questionId)).toEqual([launch.q1, launch.q2]);
    expect(r.body.rows.every((x: any) => x.role === "reviewer")).toBe(true);
    expect((await api("GET", "/api/v1/portfolio")).status).toBe(401);
    expect((await api("GET", "/api/v1/portfolio.csv")).status).toBe(401);
  });

  it("gives each question's report figures, the outcome, and the change since the previous closed round", async () => {
    const rows = (await api("GET", "/api/v1/portfolio", { cookie: reviewerCookie })).body.rows;
    const [one, two] = rows;
    const report = (await api("GET", `/api/v1/panels/${launch.id}/questions/${launch.q1}/report.json`, { cookie: reviewerCookie })).body;
    const iv80 = report.blend.intervals.find((x: any) => x.level === 80);
    expect(one.figure).toBe(report.blend.figure);
    expect(one.lower80).toBe(iv80.lower);
    expect(one.upper80).toBe(iv80.upper);
    // Hand computation (module comment): 0.5 × 72 + 0.5 × 80 = 76; before round 2, 0.5 × 70 + 0.5 × 80 = 75.
    expect(one.figure).toBeCloseTo(76, 9);
    expect(one.movement.fromRound).toBe(1);
    expect(one.movement.toRound).toBe(2);
    expect(one.movement.previousFigure).toBeCloseTo(75, 9);
    expect(one.movement.change).toBeCloseTo(1, 9);
    expect(report.movement).toEqual(one.movement);
    expect(one.latestRound).toBe(2);
    expect(one.convergence).toBe(report.convergence.verdict.settled ? "settled" : "not-settled");
    expect(one.outcome).toBeNull();
    // The second question: no baseline (no blend), answered in round 1 only (no change to show).
    expect(two.figure).toBeNull();
    expect(two.lower80).toBeNull();
    expect(two.movement).toBeNull();
    expect(two.latestRound).toBe(1);

    const mine = (await api("GET", "/api/v1/portfolio", { token: orgA })).body.rows;
    const spare = mine.find((x: any) => x.questionId === spares.q);
    expect(spare.outcome).toBe(OUTCOME);
    expect(spare.outcomeRecordedAt).not.toBeNull();
    expect(spare.convergence).toBe("not-settled");
  });

  it("names no panelist and shows no pseudonym (THREATS.md)", async () => {
    const text = (await api("GET", "/api/v1/portfolio", { token: orgA })).text;
    expect(text).not.toMatch(/expert \d/);
    const answers = (await api("GET", `/api/v1/panels/${launch.id}/rounds/2/answers`, { token: orgA })).body;
    const pseudonyms = JSON.stringify(answers).match(/"pseudonym":"([^"]+)"/g) ?? [];
    expect(pseudonyms.length).toBeGreaterThan(0);
    for (const p of pseudonyms) expect(text).not.toContain(p.split(":")[1]);
  });

  it("exports the same rows as CSV", async () => {
    const res = await api("GET", "/api/v1/portfolio.csv", { cookie: reviewerCookie });
    expect(res.status).toBe(200);
    expect(res.contentType).toContain("text/csv");
    const lines = res.text.trimEnd().split("\r\n");
    expect(lines[0]).toBe("panel,question,unit,target period,blended figure,80% lower,80% upper,convergence,latest closed round,outcome,change since previous round,previous round,previous figure");
    expect(lines).toHaveLength(3);
    const cells = lines[1].split(",");
    expect(cells.slice(0, 4)).toEqual(["Wren-2 launch year", "Wren-2 units sold in year one?", "units", "year one"]);
    expect(Number(cells[4])).toBeCloseTo(76, 9);
    expect(Number(cells[10])).toBeCloseTo(1, 9);
    expect(cells[11]).toBe("1");
    expect(lines[2].split(",")[4]).toBe("");
  });
});

describe("the portfolio page in Chromium", () => {
  let browser: Browser;
  let page: Page;
  beforeAll(async () => {
    browser = await launchChromium();
    const ctx = await browser.newContext({ viewport: { width: 1280, height: 900 } });
    page = await signInPage(ctx, reviewer, "/reports");
  });
  afterAll(() => browser?.close());

  const questionsShown = () => page.locator('[data-portfolio-row] td:nth-child(2) a').allTextContents();

  it("lists the rows and sorts by a column, then the other way", async () => {
    await page.goto(`${baseURL}/portfolio`);
    await expect.poll(() => page.locator("[data-portfolio-row]").count()).toBe(2);
    expect(await page.locator('[data-stat="portfolio-figure"]').getAttribute("data-value")).toMatch(/^7[56]/);
    await expectAccessible(page);
    await page.getByRole("button", { name: "Question" }).click();
    await expect.poll(() => page.locator("[data-portfolio]").getAttribute("data-sort")).toBe("question ascending");
    await expectAccessible(page);
    expect(await questionsShown()).toEqual(["Wren-2 units returned in year one?", "Wren-2 units sold in year one?"]);
    await expect.poll(() => page.getByRole("columnheader", { name: /Question/ }).getAttribute("aria-sort")).toBe("ascending");
    await page.getByRole("button", { name: /Question/ }).click();
    await expect.poll(() => page.locator("[data-portfolio]").getAttribute("data-sort")).toBe("question descending");
    expect(await questionsShown()).toEqual(["Wren-2 units sold in year one?", "Wren-2 units returned in year one?"]);
    // The row without a blend stays last whichever way the figure column is sorted.
    await page.getByRole("button", { name: "Blended figure" }).click();
    await expect.poll(() => page.locator("[data-portfolio]").getAttribute("data-sort")).toBe("figure ascending");
    await page.getByRole("button", { name: /Blended figure/ }).click();
    await expect.poll(() => page.locator("[data-portfolio]").getAttribute("data-sort")).toBe("figure descending");
    expect(await questionsShown()).toEqual(["Wren-2 units sold in year one?", "Wren-2 units returned in year one?"]);
    await expect.poll(async () => Number(await page.locator('[data-portfolio-row] [data-stat="portfolio-change"]').getAttribute("data-value"))).toBeCloseTo(1, 9);
    await expectAccessible(page);
  });
});
