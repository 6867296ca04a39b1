/**
 * Browser test of the Delphi panel (issue 3), in Chromium through playwright-core against the
 * production build that tests/app/server-setup.ts starts with a fresh database.
 *
 * An organiser is created on the first-run page, signs in, creates a panel with one
 * shared-quantity question, puts five people on the expert roster, invites them and opens
 * round 1. Each panelist answers in a separate browser context; the organiser's live progress
 * reaches 5/5 without a reload. After the round closes each panelist's feedback must show the
 * median and quartiles that R computes with quantile(type = 7) on the same five answers, their
 * own answer marked, and none of the other panelists' names, e-mails, pseudonyms or roster ids.
 * Round 2 repeats with revised answers (those outside round 1's IQR must explain), and the
 * organiser's convergence view must match R for both rounds.
 *
 * The scenario is invented: Quillmoor Instruments and its Wren-2 soil-moisture sensor.
 * Screenshots of the main pages go to test-artifacts/screenshots/ (git-ignored).
 */
import { execFileSync } from "node:child_process";
import { mkdirSync } from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { chromium, type Browser, type BrowserContext, type Page } from "playwright-core";
import { expectClose, runR, rVector } from "../stats/rscript";
import { expectAccessible } from "./browser";

const baseURL = inject("baseURL");
const root = path.resolve(__dirname, "..", "..");
const shots = path.resolve(__dirname, "..", "..", "test-artifacts", "screenshots");

const REVIEWER = { name: "Dorian Vale", email: "dorian.vale@quillmoor.example", password: "board review of wren-2" };
const ORGANISER = { name: "Mira Oduya", email: "mira.oduya@quillmoor.example", password: "wren-2 launch planning" };

/** The five panelists (invented people at an invented company) and their answers per round. */
const PANELISTS = [
  { name: "Tobias Renfrew", email: "tobias.renfrew@quillmoor.example", group: "sales", r1: 1800, r2: 2600 },
  { name: "Ines Calloway", email: "ines.calloway@quillmoor.example", group: "sales", r1: 2400, r2: 2800 },
  { name: "Piotr Ashdown", email: "piotr.ashdown@quillmoor.example", group: "engineering", r1: 3000, r2: 3000 },
  { name: "Halvard Quince", email: "halvard.quince@quillmoor.example", group: "operations", r1: 4200, r2: 3600 },
  { name: "Selma Marchetti", email: "selma.marchetti@quillmoor.example", group: "marketing", r1: 6500, r2: 5200 },
] as const;

const LAUNCH_ARGS = ["--no-sandbox", "--disable-gpu", "--disable-background-networking", "--disable-component-update", "--no-first-run"];

interface Expected {
  readonly q1: number;
  readonly median: number;
  readonly q3: number;
  readonly iqr: number;
  readonly relativeIqr: number;
  readonly cv: number;
}

/**
 * Expected round statistics computed by R (Rscript, outside this project): quantile(x, type = 7)
 * at 0.25 / 0.5 / 0.75 (Hyndman & Fan 1996 definition 7, R's default), IQR(x), IQR / |median|,
 * and sd(x) / mean(x) (sample SD, divisor n − 1).
 */
function expectedFromR(values: readonly number[]): Expected {
  const [q, iqr, rel, cv] = runR(`
x <- ${rVector(values)}
out(quantile(x, c(0.25, 0.5, 0.75), type = 7, names = FALSE))
out(IQR(x))
out(IQR(x) / abs(median(x)))
out(sd(x) / mean(x))
`);
  return { q1: q[0], median: q[1], q3: q[2], iqr: iqr[0], relativeIqr: rel[0], cv: cv[0] };
}

async function statValue(scope: Page | ReturnType<Page["locator"]>, name: string): Promise<number> {
  const raw = await scope.locator(`[data-stat="${name}"]`).first().getAttribute("data-value");
  if (raw === null || raw === "") throw new Error(`no value for ${name}`);
  return Number(raw);
}

let browser: Browser;
let organiser: BrowserContext;
let org: Page;
let panelUrl = "";
const links = new Map<string, string>(); // e-mail → private link
const rosterIds: string[] = [];
const invitationIds: string[] = [];
const pseudonyms: string[] = [];
const panelistContexts = new Map<string, BrowserContext>();

function acceptDialogs(page: Page): void {
  page.on("dialog", (d) => void d.accept());
}

async function panelistPage(email: string, phone = false): Promise<Page> {
  let ctx = panelistContexts.get(email);
  if (!ctx) {
    ctx = await browser.newContext(phone ? { viewport: { width: 390, height: 844 }, deviceScaleFactor: 2, isMobile: true, hasTouch: true } : {});
    panelistContexts.set(email, ctx);
  }
  const page = await ctx.newPage();
  acceptDialogs(page);
  return page;
}

/** Everything a panelist's browser received for a page: the HTML (with the RSC payload inlined). */
async function rawHtml(page: Page, url: string): Promise<string> {
  const res = await page.context().request.get(url);
  expect(res.status()).toBe(200);
  return res.text();
}

function expectNoOtherIdentity(html: string, self: (typeof PANELISTS)[number]): void {
  for (const p of PANELISTS) {
    if (p.email === self.email) continue;
    expect(html, `must not contain ${p.name}`).not.toContain(p.name);
    expect(html, `must not contain ${p.email}`).not.toContain(p.email);
  }
  for (const pseudonym of pseudonyms) expect(html, `must not contain the pseudonym ${pseudonym}`).not.toContain(pseudonym);
  for (const id of rosterIds) expect(html, `must not contain the roster id ${id}`).not.toContain(id);
  for (const id of invitationIds) expect(html, `must not contain the invitation id ${id}`).not.toContain(id);
}

describe("Delphi panel in the browser", () => {
  beforeAll(async () => {
    mkdirSync(shots, { recursive: true });
    browser = await chromium.launch({ executablePath: "/usr/bin/chromium", args: LAUNCH_ARGS });
    organiser = await browser.newContext({ viewport: { width: 1280, height: 900 } });
    org = await organiser.newPage();
    acceptDialogs(org);
  });

  afterAll(async () => {
    await browser?.close();
  });

  it("creates the first organiser on /setup, which then refuses a second one, and signs in", async () => {
    await org.goto(`${baseURL}/setup`);
    await org.getByLabel("Name").fill(ORGANISER.name);
    await org.getByLabel("E-mail").fill(ORGANISER.email);
    await org.getByLabel("Password").fill("short");
    await org.getByRole("button", { name: "Create organiser" }).click();
    await expect.poll(() => org.locator('[data-field="password"]').textContent()).toContain("at least 12 characters");
    await expectAccessible(org);
    await org.getByLabel("Password").fill(ORGANISER.password);
    await org.getByRole("button", { name: "Create organiser" }).click();
    await org.waitForURL(/\/sign-in/);

    await org.goto(`${baseURL}/setup`);
    await expect.poll(() => org.locator("main").textContent()).toContain("already exists");
    await expectAccessible(org);

    await org.goto(`${baseURL}/sign-in`);
    await org.getByLabel("E-mail").fill(ORGANISER.email);
    await org.getByLabel("Password").fill("not the password");
    await org.getByRole("button", { name: "Sign in" }).click();
    await expect.poll(() => org.locator(".error-banner").textContent()).toContain("do not match");
    await expectAccessible(org);
    await org.getByLabel("Password").fill(ORGANISER.password);
    await org.getByRole("button", { name: "Sign in" }).click();
    await org.waitForURL(/\/panels$/);
    // The header reflects who is signed in.
    await expect.poll(() => org.locator(".site-header").textContent()).toContain(ORGANISER.name);
    expect(await org.locator(".site-header").textContent()).toContain("Expert roster");
    await expectAccessible(org);
  });

  it("puts five people on the expert roster", async () => {
    await org.goto(`${baseURL}/roster`);
    const form = org.getByRole("form", { name: "Add a person" });
    for (const p of PANELISTS) {
      await form.getByLabel("Name").fill(p.name);
      await form.getByLabel("E-mail").fill(p.email);
      await form.getByLabel("Group").fill(p.group);
      await form.getByRole("button", { name: "Add to roster" }).click();
      await expect.poll(() => form.locator(".notice").textContent()).toContain(`${p.name} was added`);
    }
    await expect.poll(() => org.locator("tr[data-roster-member]").count()).toBe(5);
    await expectAccessible(org);
  });

  it("creates a panel with a shared-quantity question, showing each default with its source", async () => {
    await org.goto(`${baseURL}/panels/new`);
    const page = await org.content();
    expect(page).toContain("convention, not verified");
    expect(page).toContain("Scheibe");
    expect(page).toContain("English");
    await expectAccessible(org);
    await org.getByLabel(/^Title/).fill("Year-one volume of the Wren-2 soil-moisture sensor");
    await org.getByLabel(/^Description/).fill("Quillmoor Instruments plans the Wren-2 launch: how many units will ship in the first year?");
    await org.getByRole("button", { name: "Create panel" }).click();
    await org.waitForURL((url) => /^\/panels\/[^/]+$/.test(url.pathname) && !url.pathname.endsWith("/new"));
    panelUrl = org.url();

    const add = org.getByRole("form", { name: "Add a question" });
    await add.getByLabel(/^Question/).fill("How many Wren-2 sensors will Quillmoor ship in the first 12 months after launch?");
    await add.getByLabel(/^Unit/).fill("units");
    await add.getByLabel(/^Target period/).fill("first 12 months after launch");
    await add.getByLabel("Lower plausible bound").fill("500");
    await add.getByLabel("Upper plausible bound").fill("100");
    await add.getByRole("button", { name: "Add question" }).click();
    // The schema's message appears beside the field.
    await expect.poll(() => add.locator('[data-field="lowerBound"]').textContent()).toContain("lower bound must be below the upper bound");
    await expectAccessible(org);
    await add.getByLabel("Lower plausible bound").fill("0");
    await add.getByLabel("Upper plausible bound").fill("50000");
    await add.getByRole("button", { name: "Add question" }).click();
    await expect.poll(() => org.locator("[data-question]").count()).toBe(1);
    await expectAccessible(org);
  });

  it("invites the five from the roster and shows each private link once", async () => {
    const form = org.getByRole("form", { name: "Invite panelists" });
    for (const v of await form.locator('input[name="rosterMemberIds"]').evaluateAll((els) => els.map((e) => (e as HTMLInputElement).value))) {
      rosterIds.push(v);
    }
    expect(rosterIds).toHaveLength(5);
    // The page leads with its steps: questions and invitations come before the rounds, and with
    // a question written the next step is to invite (issue 15).
    expect(await org.locator("[data-step]").evaluateAll((els) => els.map((e) => e.getAttribute("data-step")))).toEqual(["questions", "invite", "rounds", "blend", "outcome", "report"]);
    expect(await org.locator("[data-next-step]").getAttribute("data-next-step")).toBe("invite");
    const order = await org.locator("section[id]").evaluateAll((els) => els.map((e) => e.id));
    expect(order.indexOf("questions")).toBeLessThan(order.indexOf("invitations"));
    expect(order.indexOf("invitations")).toBeLessThan(order.indexOf("rounds"));
    // Nobody is pre-checked: one click must not invite the whole roster.
    const boxes = form.locator('input[name="rosterMemberIds"]');
    expect(await boxes.evaluateAll((els) => els.filter((e) => (e as HTMLInputElement).checked).length)).toBe(0);
    for (const box of await boxes.all()) await box.check();
    await form.getByRole("button", { name: "Create invitations" }).click();
    await expect.poll(() => org.locator(".secret-once").count()).toBe(5);
    for (const box of await org.locator(".secret-once").all()) {
      const label = (await box.getAttribute("data-secret-label")) ?? "";
      const link = ((await box.locator("code").textContent()) ?? "").trim();
      const email = /<([^>]+)>/.exec(label)?.[1];
      expect(email).toBeTruthy();
      expect(link).toMatch(/\/p\/[A-Za-z0-9_-]{40,}$/);
      links.set(email!, link);
    }
    expect(links.size).toBe(5);
    await expectAccessible(org);
    await org.screenshot({ path: path.join(shots, "organiser-panel-page.png"), fullPage: true });
    // The suite's server has no SMTP server: each invitation waits in the outbox, one per person,
    // with that person's link and nobody else's name, e-mail or link.
    await expect.poll(() => org.locator("[data-outbox-count]").getAttribute("data-outbox-count")).toBe("5");
    await org.goto(`${panelUrl}/outbox`);
    const messages = org.locator("[data-outbox-message]");
    await expect.poll(() => messages.count()).toBe(5);
    for (const m of await messages.all()) {
      const to = (await m.locator("[data-outbox-to]").textContent()) ?? "";
      const body = (await m.locator("[data-outbox-body]").textContent()) ?? "";
      const self = PANELISTS.find((p) => to.includes(p.email))!;
      expect(body).toContain(links.get(self.email)!);
      for (const other of PANELISTS.filter((p) => p !== self)) {
        expect(body).not.toContain(other.name);
        expect(body).not.toContain(other.email);
        expect(body).not.toContain(links.get(other.email)!);
      }
      // The copy and download buttons are drawn once the page is interactive: wait on them.
      await expect.poll(() => m.getByRole("button", { name: "Copy message" }).count()).toBe(1);
      await expect.poll(() => m.getByRole("button", { name: "Download .eml" }).count()).toBe(1);
    }
    await org.screenshot({ path: path.join(shots, "organiser-outbox.png"), fullPage: true });
    await expectAccessible(org);
    await org.goto(panelUrl);
    // Shown once: after a reload the links are gone.
    await org.reload();
    expect(await org.locator(".secret-once").count()).toBe(0);
    expect(await org.locator("tr[data-invitation]").count()).toBe(5);
    // Each row's forms are rendered when it is opened; the row names its invitation id.
    for (const v of await org.locator("[data-invitation-id]").evaluateAll((els) => els.map((e) => e.getAttribute("data-invitation-id") ?? ""))) {
      if (!invitationIds.includes(v)) invitationIds.push(v);
    }
    expect(invitationIds).toHaveLength(5);
    await expectAccessible(org);
  });

  it("opens round 1; the panelists answer in separate browsers and live progress reaches 5/5 without a reload", async () => {
    await org.getByRole("button", { name: "Open round 1" }).click();
    await expect.poll(() => org.locator('[data-testid="progress-count"]').textContent(), { timeout: 15_000 }).toBe("0/5");
    for (const row of await org.locator("tr[data-pseudonym]").all()) pseudonyms.push((await row.getAttribute("data-pseudonym"))!);
    expect(pseudonyms).toHaveLength(5);
    await expectAccessible(org);
    // A marker that a reload would wipe out.
    await org.evaluate(() => ((window as unknown as { notReloaded: boolean }).notReloaded = true));

    for (const [i, p] of PANELISTS.entries()) {
      const page = await panelistPage(p.email, i === 0);
      await page.goto(links.get(p.email)!);
      await expect.poll(() => page.locator("[data-round-open]").getAttribute("data-round-open")).toBe("1");
      if (i === 0) {
        // An answer outside the plausible bounds is refused, with the message beside the field.
        await page.getByLabel(/^Your estimate/).fill("90000");
        await page.getByRole("button", { name: "Save answer" }).click();
        await expect.poll(() => page.locator('[data-field="value"]').textContent()).toContain("plausible bounds");
        await expectAccessible(page);
        await page.screenshot({ path: path.join(shots, "panelist-answer-phone-error.png"), fullPage: true });
      }
      await page.getByLabel(/^Your estimate/).fill(String(p.r1));
      await page.getByLabel(/^Rationale/).fill(`Round 1 reasoning of a ${p.group} colleague about Wren-2 demand.`);
      await page.getByRole("button", { name: /Save( revised)? answer/ }).click();
      await expect.poll(() => page.locator(".notice").last().textContent()).toContain("Your answer was saved");
      await expect.poll(() => page.locator("[data-current-answer]").getAttribute("data-current-answer")).toBe(String(p.r1));
      await expectAccessible(page);
      if (i === 0) {
        await page.screenshot({ path: path.join(shots, "panelist-answer-phone.png"), fullPage: true });
        const width = await page.evaluate(() => document.documentElement.scrollWidth);
        expect(width, "no horizontal scrolling at 390 px").toBeLessThanOrEqual(390);
      }
      expectNoOtherIdentity(await rawHtml(page, links.get(p.email)!), p);
      await page.close();
    }

    await expect.poll(() => org.locator('[data-testid="progress-count"]').textContent(), { timeout: 20_000 }).toBe("5/5");
    expect(await org.evaluate(() => (window as unknown as { notReloaded?: boolean }).notReloaded)).toBe(true);
    await org.locator("#live-progress").screenshot({ path: path.join(shots, "organiser-live-progress.png") });
    await expectAccessible(org);

    // Revealing names asks for a reason, warns that it is logged, and is then in the audit log.
    await org.getByLabel(/^Reason for revealing names/).fill("Checking that the sales team answered");
    await org.getByRole("button", { name: "Reveal names (logged)" }).click();
    await expect.poll(() => org.locator("#live-progress").textContent()).toContain("recorded in the audit log");
    await expectAccessible(org);
    for (const p of PANELISTS) expect(await org.locator("#live-progress").textContent()).toContain(p.name);
    await org.reload();
    expect(await org.locator("#live-progress").textContent()).not.toContain(PANELISTS[0].name);
    expect(await org.locator("section[aria-labelledby=audit-h]").textContent()).toContain("revealed the names behind");
    expect(await org.locator("section[aria-labelledby=audit-h]").textContent()).toContain("Checking that the sales team answered");
  });

  it("closes round 1; each panelist's feedback matches R's quantile(type = 7) and marks their own answer", async () => {
    await org.getByRole("button", { name: "Close round 1" }).click();
    await expect.poll(() => org.locator('tr[data-round="1"]').count(), { timeout: 15_000 }).toBe(1);

    const r1 = PANELISTS.map((p) => p.r1);
    const want = expectedFromR(r1);
    for (const [i, p] of PANELISTS.entries()) {
      const page = await panelistPage(p.email);
      const url = `${links.get(p.email)!}/feedback`;
      await page.goto(url);
      await expect.poll(() => page.locator("h1").textContent()).toContain("Feedback of round 1");
      expectClose(
        [await statValue(page, "q1"), await statValue(page, "median"), await statValue(page, "q3")],
        [want.q1, want.median, want.q3],
        1e-12,
        `feedback of ${p.name}`,
      );
      expect(await page.locator("[data-own-answer]").first().getAttribute("data-own-answer")).toBe(String(p.r1));
      const chart = page.locator('[data-chart="spread"]').first();
      expect(await chart.getAttribute("data-own")).toBe(String(p.r1));
      expect(await chart.getAttribute("data-answers")).toBe("5");
      expect(await chart.locator("canvas").count()).toBe(1);
      await expectAccessible(page);
      const outside = p.r1 < want.q1 || p.r1 > want.q3;
      expect(await page.locator('[data-explanation-requested="true"]').count()).toBe(outside ? 1 : 0);
      expectNoOtherIdentity(await rawHtml(page, url), p);
      expectNoOtherIdentity(await page.content(), p);
      if (i === 0) await page.screenshot({ path: path.join(shots, "panelist-feedback-phone.png"), fullPage: true });
      if (i === 4) await page.screenshot({ path: path.join(shots, "panelist-feedback.png"), fullPage: true });
      await page.close();
    }
  });

  it("runs round 2 with revised answers; those outside round 1's IQR must explain", async () => {
    await org.getByRole("button", { name: "Start round 2" }).click();
    await expect.poll(() => org.locator('[data-testid="progress-count"]').textContent(), { timeout: 15_000 }).toBe("0/5");
    const want1 = expectedFromR(PANELISTS.map((p) => p.r1));
    for (const p of PANELISTS) {
      const page = await panelistPage(p.email);
      await page.goto(links.get(p.email)!);
      await expect.poll(() => page.locator("[data-round-open]").getAttribute("data-round-open")).toBe("2");
      const outside = p.r1 < want1.q1 || p.r1 > want1.q3;
      expect(await page.locator('[data-rationale-required="true"]').count()).toBe(outside ? 1 : 0);
      // Round 2 starts from the panelist's round 1 answer, with a one-tap "keep my answer".
      expect(await page.getByLabel(/^Your estimate/).inputValue()).toBe(String(p.r1));
      expect(await page.locator("[data-keep]").count()).toBe(1);
      await expectAccessible(page);
      await page.getByLabel(/^Your estimate/).fill(String(p.r2));
      await page.getByLabel(/^Rationale/).fill("");
      await page.getByRole("button", { name: /Save( revised)? answer/ }).click();
      if (outside) {
        await expect.poll(() => page.locator('[data-field="rationale"]').textContent()).toContain("explain");
        await page.getByLabel(/^Rationale/).fill(`Round 2: kept my view on Wren-2 volumes for ${p.group} reasons.`);
        await page.getByRole("button", { name: /Save( revised)? answer/ }).click();
      }
      await expect.poll(() => page.locator(".notice").last().textContent()).toContain("Your answer was saved");
      await page.close();
    }
    await expect.poll(() => org.locator('[data-testid="progress-count"]').textContent(), { timeout: 20_000 }).toBe("5/5");
    await org.getByRole("button", { name: "Close round 2" }).click();
    await expect.poll(() => org.locator('tr[data-round="2"]').count(), { timeout: 15_000 }).toBe(1);
    // After the round the main (not "secondary") button follows the stopping rules' verdict.
    const verdict = await org.locator("[data-recommendation]").getAttribute("data-recommendation");
    const after = org.locator('[data-after-round="2"]');
    expect(await after.getAttribute("data-rules-say")).toBe(verdict);
    const primary = await after.locator("button[type=submit]:not(.secondary):not([hidden])").allTextContents();
    expect(primary).toEqual([verdict === "stop" ? "Finish the panel" : "Start round 3"]);
    await expectAccessible(org);
  });

  it("shows the organiser a convergence view whose figures match R for both rounds", async () => {
    await org.goto(panelUrl);
    for (const [round, values] of [
      [1, PANELISTS.map((p) => p.r1)],
      [2, PANELISTS.map((p) => p.r2)],
    ] as const) {
      const want = expectedFromR(values);
      const row = org.locator(`table.convergence-table tr[data-round="${round}"]`);
      expect(await statValue(row, "n")).toBe(5);
      expectClose(
        [
          await statValue(row, "median"),
          await statValue(row, "q1"),
          await statValue(row, "q3"),
          await statValue(row, "iqr"),
          await statValue(row, "relativeIqr"),
          await statValue(row, "cv"),
        ],
        [want.median, want.q1, want.q3, want.iqr, want.relativeIqr, want.cv],
        1e-12,
        `convergence round ${round}`,
      );
    }
    const rec = org.locator("[data-recommendation]");
    expect(["stop", "another-round"]).toContain(await rec.getAttribute("data-recommendation"));
    const text = (await org.locator("#convergence").textContent()) ?? "";
    expect(text).toContain("Consensus rule");
    expect(text).toContain("Stability rule");
    expect(text).toContain("the median changed by");
    expect(text).toContain("supports your decision");
    await expectAccessible(org);
    await org.locator("#convergence").screenshot({ path: path.join(shots, "organiser-convergence.png") });

    // Each panelist now sees round 2 feedback with their own round 2 answer marked.
    const p = PANELISTS[2];
    const page = await panelistPage(p.email);
    await page.goto(`${links.get(p.email)!}/feedback`);
    await expect.poll(() => page.locator("h1").textContent()).toContain("Feedback of round 2");
    const want2 = expectedFromR(PANELISTS.map((x) => x.r2));
    expectClose([await statValue(page, "median")], [want2.median], 1e-12, "round 2 feedback median");
    await expectAccessible(page);
    expect(await page.locator("[data-own-answer]").first().getAttribute("data-own-answer")).toBe(String(p.r2));
    await page.close();
  });

  it("lets a reviewer (created with the admin command) read the shared panel's convergence view, read-only", async () => {
    execFileSync(
      process.execPath,
      ["bin/triangulate.mjs", "create-organiser", "--email", REVIEWER.email, "--name", REVIEWER.name, "--password", REVIEWER.password, "--role", "reviewer"],
      { cwd: root, env: { ...process.env, DATABASE_URL: inject("databaseUrl") }, stdio: "pipe" },
    );
    await org.goto(panelUrl);
    await org.locator("section[aria-labelledby=sharing-h] summary").click();
    await org.getByLabel("Their e-mail").fill(REVIEWER.email);
    await org.getByRole("button", { name: "Share", exact: true }).click();
    await expect.poll(() => org.locator("section[aria-labelledby=sharing-h]").textContent()).toContain(`${REVIEWER.email} — reviewer, read only`);
    await expectAccessible(org);

    const ctx = await browser.newContext();
    const page = await ctx.newPage();
    await page.goto(`${baseURL}/sign-in`);
    await page.getByLabel("E-mail").fill(REVIEWER.email);
    await page.getByLabel("Password").fill(REVIEWER.password);
    await page.getByRole("button", { name: "Sign in" }).click();
    await page.waitForURL(/\/reports$/);
    await expectAccessible(page);
    const header = (await page.locator(".site-header").textContent()) ?? "";
    expect(header).toContain(REVIEWER.name);
    expect(header).not.toContain("Expert roster");
    await page.getByRole("link", { name: "Year-one volume of the Wren-2 soil-moisture sensor" }).click();
    await page.waitForURL(/\/reports\/[^/]+$/);
    const want = expectedFromR(PANELISTS.map((p) => p.r2));
    const row = page.locator('table.convergence-table tr[data-round="2"]');
    expectClose([await statValue(row, "median"), await statValue(row, "q1"), await statValue(row, "q3")], [want.median, want.q1, want.q3], 1e-12, "reviewer view");
    await expectAccessible(page);
    expect(await page.locator("form").count()).toBe(0);
    // The organiser's page is not theirs: they are sent to the read-only report.
    await page.goto(panelUrl);
    await page.waitForURL(/\/reports\//);
    // The redirect lands on the loading state first: wait for the report itself.
    await page.locator("table.convergence-table").waitFor({ state: "visible" });
    await page.screenshot({ path: path.join(shots, "reviewer-report.png"), fullPage: true });
    await expectAccessible(page);
    // Signing out returns the header to its signed-out state.
    await page.getByRole("button", { name: "Sign out" }).click();
    await expect.poll(() => page.locator(".site-header").textContent(), { timeout: 15_000 }).toContain("Sign in");
    expect(await page.locator(".site-header").textContent()).not.toContain(REVIEWER.name);
    await ctx.close();
    // The page withdraws the share by its e-mail, as the API does.
    await org.goto(panelUrl);
    const sharing = org.locator("section[aria-labelledby=sharing-h]");
    await sharing.getByRole("button", { name: "Stop sharing" }).click();
    await expect.poll(() => sharing.textContent(), { timeout: 15_000 }).toContain("Not shared with anyone.");
  });

  it("revokes a private link and re-issues a new one, shown once; the old link stops working", async () => {
    const p = PANELISTS[0];
    await org.goto(panelUrl);
    const row = org.locator(`tr[data-invitation="${p.email}"]`);
    await row.locator("summary").click();
    await row.getByRole("button", { name: "Revoke link" }).click();
    await expect.poll(() => row.textContent()).toContain("revoked");

    const page = await panelistPage(p.email);
    await page.goto(links.get(p.email)!);
    expect(await page.locator("h1").textContent()).toContain("This link does not work");
    expect(await page.locator(".error-banner").textContent()).toContain("withdrawn");
    await expectAccessible(page);

    await row.locator("details").evaluate((d) => ((d as HTMLDetailsElement).open = true));
    await row.getByRole("button", { name: "Re-issue link" }).click();
    await expect.poll(() => row.locator(".secret-once code").count()).toBe(1);
    await expectAccessible(org);
    const fresh = ((await row.locator(".secret-once code").textContent()) ?? "").trim();
    expect(fresh).not.toBe(links.get(p.email));
    await page.goto(links.get(p.email)!);
    expect(await page.locator(".error-banner").textContent()).toContain("not valid");
    await page.goto(fresh);
    expect(await page.locator("h1").textContent()).toContain("Wren-2");
    await expectAccessible(page);
    await page.close();
  });
});
