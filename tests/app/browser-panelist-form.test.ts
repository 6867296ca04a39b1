/**
 * The panelist's form in Chromium (playwright-core) against the suite's production server
 * (issue 15): a panelist whose browser is set to German (de-DE) answers two questions with one
 * "Save all answers"; numbers are read with the German marks, decimal "," and thousands "."
 * (Unicode CLDR, common/main/de.xml), so "2.600,5" is 2600.5 — the expected values are those
 * digits read by hand. Forms a program would read as a number but a person did not mean
 * ("0x10", "1_000") are refused with a message saying what is wrong, in the browser and again by
 * the server. In round 2 the form starts from the round 1 answer, "Keep my answer" stores it with
 * one tap, and saving unchanged answers again stores no new version. After the panel finishes,
 * the feedback no longer speaks of a next round. Panels are set up through the JSON API;
 * invented scenario (Quillmoor Instruments, Wren-2).
 */
import { randomBytes } from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { chromium, type Browser, type Page } from "playwright-core";
import { api, apiTokenFor, baseURL, clearDatabase, createAccount } from "./api-client";
import { expectAccessible, scriptBytes } from "./browser";

const LAUNCH_ARGS = ["--no-sandbox", "--disable-gpu", "--disable-background-networking", "--disable-component-update", "--no-first-run"];
const SINGLE = { text: "Wren-2 units shipped in year one?", unit: "units", targetPeriod: "first 12 months", lowerBound: 0, upperBound: 100_000, answerFormat: "single", aggregation: "shared" };
const THREE = { text: "Wren-2 units returned in year one?", unit: "units", targetPeriod: "first 12 months", lowerBound: 0, upperBound: 10_000, answerFormat: "three-point", aggregation: "shared" };

let browser: Browser;
let page: Page;
let token = "";
let panelId = "";
let link = "";
let q1 = "";
let q2 = "";

async function ok(method: string, path: string, body?: unknown): Promise<any> {
  const res = await api(method, path, { token, body });
  if (res.status >= 300) throw new Error(`${method} ${path} → ${res.status}: ${res.text}`);
  return res.body;
}

/** The final answers of round `n`, by question id (the organiser's view, one panelist). */
async function answersOf(n: number): Promise<Record<string, { value: number; low: number | null; high: number | null; version: number }>> {
  const r = await ok("GET", `/api/v1/panels/${panelId}/rounds/${n}/answers`);
  return Object.fromEntries(r.questions.filter((q: { answers: unknown[] }) => q.answers.length > 0).map((q: { questionId: string; answers: any[] }) => [q.questionId, q.answers[0]]));
}

beforeAll(async () => {
  token = await apiTokenFor(createAccount("Ilse Marwick"));
  const panel = await ok("POST", "/api/v1/panels", { title: `Wren-2 returns ${randomBytes(3).toString("hex")}`, questions: [SINGLE, THREE] });
  panelId = panel.id;
  [q1, q2] = panel.questions.map((q: { id: string }) => q.id);
  const member = await ok("POST", "/api/v1/roster", { name: "Lotte Brandauer", email: `lotte.${randomBytes(3).toString("hex")}@quillmoor.example` });
  const [inv] = await ok("POST", `/api/v1/panels/${panelId}/invitations`, { rosterMemberIds: [member.id] });
  link = `${baseURL}${inv.link}`;
  await ok("POST", `/api/v1/panels/${panelId}/rounds/1/open`, {});
  browser = await chromium.launch({ executablePath: "/usr/bin/chromium", args: LAUNCH_ARGS });
  const ctx = await browser.newContext({ locale: "de-DE", viewport: { width: 360, height: 800 }, isMobile: true, hasTouch: true });
  page = await ctx.newPage();
});

afterAll(async () => {
  await browser?.close();
  await clearDatabase();
});

describe("the panelist's form", () => {
  it("refuses 0x10 and 1_000 with what is wrong, in the browser and on the server, never 'required'", async () => {
    // The JavaScript a panelist's phone loads for the page, compressed as sent: issue 15's goal is
    // at most 150 kB (a budget the project set, not a published figure).
    const js = await scriptBytes(page, () => page.goto(link));
    console.log(`panelist page: ${js.files} scripts, ${(js.bytes / 1000).toFixed(1)} kB of JavaScript as sent (content-encoding: ${js.encodings.join(", ")}): ${js.largest.join(", ")}`);
    expect(js.bytes, js.largest.join(", ")).toBeLessThanOrEqual(150_000);
    const form = page.getByRole("form", { name: "Your answers" });
    await expect.poll(() => form.count()).toBe(1);
    // The locale field is filled once the page runs in the browser.
    await expect.poll(() => form.locator('input[name="locale"]').first().inputValue()).toBe("de-DE");
    await expectAccessible(page);
    const estimate = form.locator('input[name="q0.value"]');
    await estimate.fill("0x10");
    await estimate.blur();
    await expect.poll(() => form.locator('[data-typed-number-error="q0.value"]').textContent()).toContain("hexadecimal");
    await expectAccessible(page);
    await estimate.fill("1_000");
    await form.getByRole("button", { name: "Save all answers" }).click();
    await expect.poll(() => form.locator('[data-field="q0.value"]').textContent()).toContain("underscores");
    expect(await form.locator('[data-field="q0.value"]').textContent()).not.toMatch(/required/i);
    await expectAccessible(page);
    expect(await answersOf(1)).toEqual({});
  });

  it("reads German marks and saves both questions with one 'Save all answers'", async () => {
    const form = page.getByRole("form", { name: "Your answers" });
    await form.locator('input[name="q0.value"]').fill("2.600,5");
    await form.locator('input[name="q1.low"]').fill("1.000");
    await form.locator('input[name="q1.value"]').fill("1.500");
    await form.locator('input[name="q1.high"]').fill("2.000,5");
    await form.getByRole("button", { name: "Save all answers" }).click();
    await expect.poll(() => form.locator(".notice").last().textContent()).toContain("2 answers were saved");
    await expectAccessible(page);
    const a = await answersOf(1);
    expect(a[q1]).toMatchObject({ value: 2600.5, version: 1 });
    expect(a[q2]).toMatchObject({ low: 1000, value: 1500, high: 2000.5, version: 1 });
  });

  it("starts round 2 from the round 1 answer; 'Keep my answer' stores it with one tap, and saving again adds no version", async () => {
    await ok("POST", `/api/v1/panels/${panelId}/rounds/1/close`);
    await ok("POST", `/api/v1/panels/${panelId}/rounds`, { open: true });
    await page.goto(link);
    await expect.poll(() => page.locator("[data-round-open]").getAttribute("data-round-open")).toBe("2");
    const form = page.getByRole("form", { name: "Your answers" });
    // Prefilled, shown with the German decimal mark.
    await expect.poll(() => form.locator('input[name="q0.value"]').inputValue()).toBe("2600,5");
    expect(await form.locator('input[name="q1.high"]').inputValue()).toBe("2000,5");
    // "Keep my answer" is disabled until the page's script has run (a click before that would be
    // the browser's own submit, losing the action); it says when it is live (data-ready).
    expect(await form.locator(`[data-keep="${q1}"]`).count()).toBe(1);
    await form.locator(`[data-keep="${q1}"][data-ready]:enabled`).click();
    await expect.poll(() => form.locator(".notice").last().textContent()).toContain("kept");
    await expectAccessible(page);
    expect((await answersOf(2))[q1]).toMatchObject({ value: 2600.5, version: 1 });
    await page.screenshot({ path: "test-artifacts/screenshots/panelist-round-2-keep-phone.png", fullPage: true });
    // Save all now stores question 2 (prefilled) and skips question 1, already this round's.
    await page.reload();
    await page.locator('form[aria-label="Your answers"][data-ready]').waitFor();
    await page.getByRole("form", { name: "Your answers" }).getByRole("button", { name: "Save all answers" }).click();
    await expect.poll(() => page.locator(".notice").last().textContent()).toContain("1 answer was saved");
    await expectAccessible(page);
    const a = await answersOf(2);
    expect(a[q1].version).toBe(1);
    expect(a[q2]).toMatchObject({ low: 1000, value: 1500, high: 2000.5, version: 1 });
  });

  it("after the panel finishes, the feedback does not speak of a next round", async () => {
    await ok("POST", `/api/v1/panels/${panelId}/rounds/2/close`);
    await ok("POST", `/api/v1/panels/${panelId}/finish`);
    await page.goto(`${link}/feedback`);
    // The page streams in after its loading state: wait until its content is there, not only its heading.
    await expect.poll(() => page.locator("h1").textContent()).toContain("Feedback of round 2");
    await expect.poll(() => page.locator("main").textContent()).toContain("The panel is finished");
    const text = (await page.locator("main").textContent()) ?? "";
    expect(text).not.toMatch(/next round/i);
    await expectAccessible(page);
  });
});
