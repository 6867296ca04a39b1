/**
 * Private links as e-mail programs mangle them, and an answer that arrives after its round closed
 * (issue 15), against the production build.
 *
 * - A link with the punctuation an e-mail program appends (`.`, `,`, `)`, `>`, also encoded) leads
 *   to the clean link (a redirect) and the panelist's page; a link cut short says it is cut short;
 *   one with characters added says so; an unknown link of the right shape says it is not valid.
 * - In Chromium: the panelist fills the form while round 1 is open; the organiser closes the round;
 *   the panelist then saves. The page shows the closed round (not "Round 1 is open"), and that the
 *   answer was not stored, with the closing time as a plain date and time (no ISO timestamp);
 *   nothing was stored.
 *
 * People and panel invented (Quillmoor Instruments, Wren-2).
 */
import { randomBytes } from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, Page } from "playwright-core";
import { api, apiTokenFor, baseURL, clearDatabase, createAccount } from "./api-client";
import { expectAccessible, launchChromium } from "./browser";

let org = "";
let panelId = "";
let questionId = "";
/** The invitation's path, /p/<token>. */
let link = "";
let browser: Browser;
let page: Page;

async function ok(method: string, path: string, body?: unknown): Promise<any> {
  const res = await api(method, path, { token: org, body });
  if (res.status >= 300) throw new Error(`${method} ${path} → ${res.status}: ${res.text}`);
  return res.body;
}

/** One GET of a page without following redirects. */
const visit = (path: string) => fetch(`${baseURL}${path}`, { redirect: "manual" });

beforeAll(async () => {
  org = await apiTokenFor(createAccount("Rosalind Quarry"));
  const panel = await ok("POST", "/api/v1/panels", {
    title: "Wren-2 dealer stock",
    questions: [{ text: "Wren-2 units in dealer stock at year end?", unit: "units", targetPeriod: "year end", lowerBound: 0, upperBound: 10000, answerFormat: "single", aggregation: "shared" }],
  });
  panelId = panel.id;
  questionId = panel.questions[0].id;
  const member = await ok("POST", "/api/v1/roster", { name: "Edwin Larch", email: `edwin.${randomBytes(3).toString("hex")}@quillmoor.example` });
  const [inv] = await ok("POST", `/api/v1/panels/${panelId}/invitations`, { rosterMemberIds: [member.id] });
  link = inv.link;
  await ok("POST", `/api/v1/panels/${panelId}/rounds/1/open`, {});
  browser = await launchChromium();
  page = await (await browser.newContext({ viewport: { width: 360, height: 800 } })).newPage();
});

afterAll(async () => {
  await browser?.close();
  await clearDatabase();
});

describe("mangled private links", () => {
  it("punctuation at the end leads to the clean link", async () => {
    expect(link).toMatch(/^\/p\/[A-Za-z0-9_-]{43}$/);
    for (const tail of [".", ",", ")", "%3E", ").", "%3E,"]) {
      const res = await visit(`${link}${tail}`);
      expect(res.status, tail).toBe(308);
      expect(new URL(res.headers.get("location")!, baseURL).pathname, tail).toBe(link);
    }
    const feedback = await visit(`${link}%29/feedback`);
    expect(new URL(feedback.headers.get("location")!, baseURL).pathname).toBe(`${link}/feedback`);
    const clean = await visit(link);
    expect(clean.status).toBe(200);
    expect(await clean.text()).toContain("Wren-2 dealer stock");
  });

  it("a link cut short says it is cut short; one with characters added says that; an unknown one says it is not valid", async () => {
    const short = await (await visit(link.slice(0, -10))).text();
    expect(short).toContain("This link is cut short");
    expect(short).not.toContain("not part of it");
    const added = await (await visit(`${link}xyz`)).text();
    expect(added).toContain("characters that are not part of it");
    expect(added).not.toContain("cut short");
    const unknown = await (await visit(`/p/${"A".repeat(43)}`)).text();
    expect(unknown).toContain("not valid");
    for (const bad of [link.slice(0, -10), `${link}xyz`]) {
      await page.goto(`${baseURL}${bad}`);
      await expect.poll(() => page.locator("h1").count()).toBe(1);
      await expectAccessible(page);
    }
  });
});

describe("an answer sent after its round closed", () => {
  it("shows the closed round and a plain closing time, and stores nothing", async () => {
    await page.goto(`${baseURL}${link}`);
    await expect.poll(() => page.locator("[data-round-open]").count()).toBe(1);
    await expectAccessible(page);
    const form = page.getByRole("form", { name: "Answer to question 1" });
    await form.locator('input[name="value"]').fill("420");
    await form.locator('textarea[name="rationale"]').fill("Dealer orders so far.");
    await ok("POST", `/api/v1/panels/${panelId}/rounds/1/close`);
    await form.getByRole("button", { name: "Save answer" }).click();
    await expect.poll(() => page.locator("[data-late-answer]").count()).toBe(1);
    const late = (await page.locator("[data-late-answer]").textContent()) ?? "";
    expect(late).toMatch(/^Your last answer was not stored: round 1 had closed \(on \d{1,2} [A-Z][a-z]{2} \d{4}, \d{2}:\d{2} UTC\) before it\s+arrived\.$/);
    expect(late).not.toMatch(/\d{4}-\d{2}-\d{2}T/);
    expect(await page.locator("[data-round-open]").count()).toBe(0);
    expect(await page.locator(".notice").first().textContent()).toContain("Round 1 is closed");
    await expectAccessible(page);
    const answers = await ok("GET", `/api/v1/panels/${panelId}/rounds/1/answers`);
    expect(answers.questions.find((q: { questionId: string }) => q.questionId === questionId).answers).toEqual([]);
  });
});

describe("keyboard use", () => {
  it("the first Tab reaches a visible skip link with a focus outline, and it moves focus to the main content", async () => {
    await page.goto(`${baseURL}${link}`);
    await expect.poll(() => page.locator("h1").count()).toBe(1);
    await page.keyboard.press("Tab");
    const focused = await page.evaluate(() => {
      const el = document.activeElement as HTMLElement;
      const style = getComputedStyle(el);
      const box = el.getBoundingClientRect();
      return { text: el.textContent?.trim(), href: el.getAttribute("href"), outline: `${style.outlineStyle} ${style.outlineWidth}`, top: box.top, bottom: box.bottom };
    });
    expect(focused.text).toBe("Skip to main content");
    expect(focused.href).toBe("#main");
    expect(focused.outline).toBe("solid 3px"); // app/globals.css :focus-visible
    expect(focused.top).toBeGreaterThanOrEqual(0); // on screen once focused
    expect(focused.bottom).toBeGreaterThan(focused.top);
    await page.keyboard.press("Enter");
    await expect.poll(() => page.evaluate(() => document.activeElement?.id)).toBe("main");
  });
});
