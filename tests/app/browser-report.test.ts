/**
 * Browser test of triangulation (issue 4): baseline on a question, blend, departures,
 * outcome, track records, accuracy history and the reviewer's report, in Chromium through
 * playwright-core against the production build that tests/app/server-setup.ts starts.
 *
 * Set-up over the API: an organiser and a reviewer are created with the admin CLI
 * (`triangulate create-organiser`), the organiser's API token creates a panel with one
 * shared-quantity question, five roster members are invited and answer round 1 with their
 * invitation tokens, and the round closes. Then, in the browser:
 * - the organiser pastes the NIST/SEMATECH e-Handbook §6.4.3.1 series
 *   (tests/reference-data/nist_handbook_6431_ses12.csv) as a CSV, first with a broken cell
 *   (the error names the row and the column), previews it (12 observations read), attaches it
 *   with the naive method, and the baseline figure and its 80%/95% bounds equal those of R's
 *   forecast::naive() on the same series;
 * - chooses equal weights: the blended figure equals 0.5 × panel median + 0.5 × baseline
 *   (Blattberg & Hoch 1990 default; hand computation below), the panel median from R;
 * - the departure table's z of one answer equals R's (x − mean) / sd with the sd implied by
 *   R's own 80% interval, sd = (upper80 − lower80) / (2·qnorm(0.9));
 * - records the outcome in two steps: an outcome of −100 (outside the question's 0–1000 bounds) is
 *   refused before any confirmation; 73 shows "Record 73 hundred units …" and nothing is stored
 *   (the API's GET answers 404) until that is confirmed; the correction shows the old and new
 *   numbers with the unit the same way;
 * - records the outcome: the scores follow outcome − forecast (hand computation); the
 *   expert roster shows each person's track record (mean log ratio ln(outcome/answer) and the
 *   shrunk bias factor exp(n/(n+5) · ln ratio) computed here), and the accuracy page lists the
 *   question;
 * - the reviewer opens the report: the blended figure comes first, then the three legs, the
 *   departure table; the CSV export downloads with the same figures.
 *
 * The scenario is invented: Quillmoor Instruments and its Wren-2 soil-moisture sensor.
 * Screenshots go to test-artifacts/screenshots/ (git-ignored).
 */
import { readFileSync, mkdirSync } from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, BrowserContext, Page } from "playwright-core";
import { expectClose, runR, rVector } from "../stats/rscript";
import { api, apiTokenFor, baseURL, clearDatabase, createAccount, sql, type TestUser } from "./api-client";
import { expectAccessible, launchChromium, overflowing, signInPage, stat } from "./browser";

const shots = path.resolve(__dirname, "..", "..", "test-artifacts", "screenshots");

/** The NIST/SEMATECH e-Handbook §6.4.3.1 series, read from the reference file (header t,y). */
const NIST_CSV = readFileSync(path.resolve(__dirname, "..", "reference-data", "nist_handbook_6431_ses12.csv"), "utf8");
const NIST_Y = NIST_CSV.trim()
  .split(/\r?\n/)
  .slice(1)
  .map((l) => Number(l.split(",")[1]));

/** Invented panelists and their round-1 answers (hundreds of Wren-2 units in the next month). */
const PANELISTS = [
  { name: "Oskar Fenwright", answer: 66 },
  { name: "Priya Halloran", answer: 72 },
  { name: "Tamsin Okonkwo-Reyes", answer: 74 },
  { name: "Bram Etheridge", answer: 78 },
  { name: "Della Marchbank", answer: 90 },
] as const;
const ACTUAL = 73;
/** The outcome value after the organiser's audited correction. */
const CORRECTED = 75;

interface RBaseline {
  readonly mean: number;
  readonly lower80: number;
  readonly upper80: number;
  readonly lower95: number;
  readonly upper95: number;
  readonly median: number;
  /** z of the answer 90 with the sd implied by R's 80% interval. */
  readonly z90: number;
  readonly sd: number;
  /** As the CSV gives them: R's signif(x, 4) of the figures, signif(z, 3) (the digits the report page shows). */
  readonly csv: { readonly blend: number; readonly mean: number; readonly lower80: number; readonly upper95: number; readonly z90: number };
}

/**
 * Expected values from R (outside this project): forecast::naive(y, h = 1, level = c(80, 95))
 * on the NIST series (Hyndman's `forecast` package: random walk, sigma² = mean of the squared
 * one-step differences, normal intervals); median(answers) (type 7 = R's default);
 * z = (x − mean) / sd with sd = (upper80 − lower80) / (2·qnorm(0.9)).
 */
function fromR(): RBaseline {
  const [f, m, z, c] = runR(`
suppressPackageStartupMessages(library(forecast))
y <- ${rVector(NIST_Y)}
f <- naive(y, h = 1, level = c(80, 95))
out(c(f$mean[1], f$lower[1, 1], f$upper[1, 1], f$lower[1, 2], f$upper[1, 2]))
out(median(${rVector(PANELISTS.map((p) => p.answer))}))
sd <- (f$upper[1, 1] - f$lower[1, 1]) / (2 * qnorm(0.9))
out(c((90 - f$mean[1]) / sd, sd))
b <- 0.5 * median(${rVector(PANELISTS.map((p) => p.answer))}) + 0.5 * f$mean[1]
out(c(signif(c(b, f$mean[1], f$lower[1, 1], f$upper[1, 2]), 4), signif((90 - f$mean[1]) / sd, 3)))
`);
  return { mean: f[0], lower80: f[1], upper80: f[2], lower95: f[3], upper95: f[4], median: m[0], z90: z[0], sd: z[1], csv: { blend: c[0], mean: c[1], lower80: c[2], upper95: c[3], z90: c[4] } };
}

let browser: Browser;
let orgCtx: BrowserContext;
let org: Page;
let organiser: TestUser;
let reviewer: TestUser;
let token = "";
let panelId = "";
let questionId = "";
let expected: RBaseline;

/** One figure against its expected value, to a relative tolerance (R's figures are printed with 17 digits). */
function near(actual: number, expected: number, rel: number, label: string): void {
  expect(Number.isFinite(actual), `${label}: ${actual} is not a number`).toBe(true);
  expectClose([actual], [expected], rel, label);
}



async function ok(method: string, url: string, body?: unknown, bearer = token): Promise<any> {
  const res = await api(method, url, { token: bearer, body });
  if (res.status >= 300) throw new Error(`${method} ${url}: ${res.status} ${res.text}`);
  return res.body;
}

describe("triangulation in the browser", () => {
  beforeAll(async () => {
    mkdirSync(shots, { recursive: true });
    expected = fromR();
    organiser = createAccount("Mirela Saxby");
    reviewer = createAccount("Corwin Ashgrove", "reviewer");
    token = await apiTokenFor(organiser);

    const panel = await ok("POST", "/api/v1/panels", {
      title: "Wren-2 shipments next month (Quillmoor Instruments)",
      questions: [
        {
          text: "How many Wren-2 sensors will ship next month?",
          unit: "hundred units",
          targetPeriod: "next month",
          lowerBound: 0,
          upperBound: 1000,
          answerFormat: "single",
          aggregation: "shared",
        },
      ],
    });
    panelId = panel.id;
    questionId = panel.questions[0].id;
    const memberIds: string[] = [];
    for (const p of PANELISTS) {
      const m = await ok("POST", "/api/v1/roster", { name: p.name, email: `${p.name.toLowerCase().replace(/[^a-z]+/g, ".")}@example.com`, group: "sales" });
      memberIds.push(m.id);
    }
    const invitations = await ok("POST", `/api/v1/panels/${panelId}/invitations`, { rosterMemberIds: memberIds });
    await ok("POST", `/api/v1/panels/${panelId}/rounds/1/open`, {});
    for (let i = 0; i < PANELISTS.length; i++) {
      const inv = invitations.find((x: { rosterMemberId: string }) => x.rosterMemberId === memberIds[i]);
      await ok("POST", "/api/v1/panelist/answers", { questionId, value: PANELISTS[i].answer, rationale: "Order book and channel stock." }, inv.token);
    }
    await ok("POST", `/api/v1/panels/${panelId}/rounds/1/close`);
    await ok("POST", `/api/v1/panels/${panelId}/shares`, { email: reviewer.email, role: "reviewer" });

    browser = await launchChromium();
    orgCtx = await browser.newContext({ viewport: { width: 1280, height: 900 }, acceptDownloads: true });
    org = await signInPage(orgCtx, organiser, "/panels");
  });

  afterAll(async () => {
    await browser?.close();
    // Leave an empty database for the other app test files (the first-run page expects one).
    await clearDatabase();
  });

  it("refuses a CSV with a broken cell, naming its row and column", async () => {
    await org.goto(`${baseURL}/panels/${panelId}/questions/${questionId}`);
    const broken = NIST_CSV.replace("\n5,64", "\n5,sixty-four");
    expect(broken).not.toBe(NIST_CSV);
    await org.getByLabel("CSV text").fill(broken);
    await org.getByRole("combobox", { name: /^Value column/ }).selectOption("y");
    await org.getByRole("button", { name: "Preview", exact: true }).click();
    // The header is row 1, so the fifth data row is row 6.
    await expect.poll(() => org.locator('[data-field="csv"]').textContent()).toContain("row 6, column 'y'");
    await expectAccessible(org);
  });

  it("reads pasted values as an analogous product's history, scaled by the stated factor, and asks for the note", async () => {
    await org.getByLabel("Pasted values, oldest first").check();
    await org.getByLabel(/^Values/).fill(NIST_Y.join(", "));
    await org.getByLabel(/analogous product's launch history/).check();
    await org.getByLabel(/^Scale factor/).fill("2.5");
    await org.getByRole("button", { name: "Preview", exact: true }).click();
    // The note is required with a factor (lib/validation: analogue.note must not be empty).
    await expect.poll(() => org.locator('[data-field="analogue.note"]').textContent()).toContain("must not be empty");
    await expectAccessible(org);
    await org.getByLabel(/^Note/).fill("Wren-1 launch months; Wren-2 is sold through 2.5 times as many dealers");
    await org.getByRole("button", { name: "Preview", exact: true }).click();
    await expect.poll(() => org.locator("[data-baseline-preview]").count(), { timeout: 30_000 }).toBe(1);
    expect(await stat(org, "preview-observations")).toBe(12);
    // Each value × 2.5 (the stated factor), by hand.
    const shown = await org.locator('[data-preview-row] [data-stat="preview-value"]').evaluateAll((els) => els.map((e) => Number(e.getAttribute("data-value"))));
    expect(shown).toEqual(NIST_Y.map((v) => v * 2.5));
    await expectAccessible(org);
    // Nothing was stored by a preview.
    expect((await api("GET", `/api/v1/panels/${panelId}/questions/${questionId}/baseline`, { token })).status).toBe(404);
    await org.getByLabel(/analogous product's launch history/).uncheck();
    await org.getByLabel("CSV with a header row").check();
  });

  it("previews what was read, then attaches the baseline with the naive method; figure and bounds equal R's forecast::naive", async () => {
    await org.getByLabel("CSV text").fill(NIST_CSV);
    await org.getByRole("combobox", { name: /^Value column/ }).selectOption("y");
    await org.getByRole("combobox", { name: /^Method/ }).selectOption("naive");
    await org.getByLabel(/^Horizon/).fill("1");
    await org.getByRole("button", { name: "Preview", exact: true }).click();
    await expect.poll(() => org.locator("[data-baseline-preview]").count(), { timeout: 30_000 }).toBe(1);
    expect(await stat(org, "preview-observations")).toBe(12);
    expect(await org.locator('[data-chart="baseline"]').first().getAttribute("data-points")).toBe("12");

    await org.getByRole("button", { name: "Attach baseline" }).click();
    await expect.poll(() => org.locator("[data-baseline-method]").count()).toBe(1);
    expect(await org.locator("[data-baseline-method]").getAttribute("data-baseline-method")).toBe("naive");
    near(await stat(org, "baseline-mean"), expected.mean, 1e-9, "baseline point = R naive mean");
    near(await stat(org, "baseline-80-lower"), expected.lower80, 1e-9, "80% lower = R");
    near(await stat(org, "baseline-80-upper"), expected.upper80, 1e-9, "80% upper = R");
    await expectAccessible(org);
    near(await stat(org, "baseline-95-lower"), expected.lower95, 1e-9, "95% lower = R");
    near(await stat(org, "baseline-95-upper"), expected.upper95, 1e-9, "95% upper = R");
    // History 12 points and a forecast fan of one step.
    const chart = org.locator('[data-chart="baseline"]').last();
    expect(await chart.getAttribute("data-points")).toBe("12");
    expect(await chart.getAttribute("data-steps")).toBe("1");
    await org.screenshot({ path: path.join(shots, "question-baseline.png"), fullPage: true });
  });

  it("with equal weights the blended figure is 0.5 × panel + 0.5 × baseline", async () => {
    await org.getByRole("radio", { name: /Equal weights/ }).check();
    await org.getByRole("button", { name: "Save weight rule" }).click();
    await expect.poll(() => org.locator('[data-weight-rule="equal"]').count()).toBe(1);
    near(await stat(org, "panel-raw"), expected.median, 1e-12, "raw panel figure = R median");
    // No past outcomes yet: every bias factor is 1, so the corrected figure is the raw one.
    near(await stat(org, "panel-corrected"), expected.median, 1e-12, "corrected = raw without a track record");
    // Blattberg & Hoch (1990) 50/50: blend = 0.5·panel + 0.5·baseline (hand computation from the formula).
    const blend = 0.5 * expected.median + 0.5 * expected.mean;
    near(await stat(org, "blend-figure"), blend, 1e-9, "blend = 0.5 panel + 0.5 baseline");
    expect(await stat(org, "blend-panel-weight")).toBe(0.5);
    // The departure of the answer 90, against R's (x − mean)/sd.
    const row = org.locator("tr[data-departure]", { has: org.locator('[data-stat="value"][data-value="90"]') });
    near(await stat(row, "z"), expected.z90, 1e-9, "z of 90 = R (x − mean)/sd");
    await expectAccessible(org);
  });

  it("an outcome value outside the question's bounds is refused before any confirmation, naming the number and the bounds", async () => {
    await org.getByLabel(/^Outcome value/).fill("-100");
    await org.getByRole("button", { name: "Record the outcome", exact: true }).click();
    const error = org.locator('[data-field="outcomeValue"]');
    await error.waitFor({ state: "visible" });
    expect(await error.textContent()).toContain("-100 is outside the question's bounds 0 to 1000");
    expect(await org.locator("[data-confirm]").count()).toBe(0);
    await expectAccessible(org);
    expect((await api("GET", `/api/v1/panels/${panelId}/questions/${questionId}/outcome`, { token })).status).toBe(404);
  });

  it("shows the number being recorded, with its unit, and saves only after it is confirmed", async () => {
    await org.getByLabel(/^Outcome value/).fill(String(ACTUAL));
    await org.getByLabel("Where the value comes from").fill("Quillmoor shipping ledger");
    await org.getByRole("button", { name: "Record the outcome", exact: true }).click();
    const confirm = org.locator(`[data-confirm="${ACTUAL}"]`);
    await confirm.waitFor({ state: "visible" });
    // The server read the field and states the value it will store, in the question's unit.
    expect(await confirm.textContent()).toContain(`Record ${ACTUAL} hundred units as the outcome of`);
    await expectAccessible(org);
    // Nothing is saved before the confirmation.
    expect((await api("GET", `/api/v1/panels/${panelId}/questions/${questionId}/outcome`, { token })).status).toBe(404);
    expect(await org.locator('[data-outcome="yes"]').count()).toBe(0);
    await confirm.getByRole("button", { name: `Yes, record ${ACTUAL} hundred units` }).click();
    await org.locator('[data-outcome="yes"]').waitFor({ state: "visible" });
    const stored = await api("GET", `/api/v1/panels/${panelId}/questions/${questionId}/outcome`, { token });
    expect(stored.status).toBe(200);
    expect(stored.body.outcomeValue).toBe(ACTUAL);
  });

  it("records the outcome; every figure is scored and the track records and accuracy history follow", async () => {
    expect(await stat(org, "outcome-value")).toBe(ACTUAL);
    // Error = outcome − forecast (Hyndman & Koehler 2006 sign convention), by hand.
    const blend = 0.5 * expected.median + 0.5 * expected.mean;
    near(await stat(org.locator('[data-score="blend"]'), "error"), ACTUAL - blend, 1e-9, "blend error");
    near(await stat(org.locator('[data-score="baseline"]'), "error"), ACTUAL - expected.mean, 1e-9, "baseline error");
    near(await stat(org.locator('[data-score="raw panel"]'), "error"), ACTUAL - expected.median, 1e-9, "raw panel error");
    await expectAccessible(org);

    await org.goto(`${baseURL}/roster`);
    await org.locator("#track-records-h").waitFor({ state: "visible" });
    const della = org.locator('tr[data-track-record="Della Marchbank"]');
    expect(await della.locator('[data-stat="count"]').textContent()).toBe("1");
    near(await stat(della, "mean-error"), ACTUAL - 90, 1e-12, "mean error = outcome − answer");
    near(await stat(della, "mean-log-ratio"), Math.log(ACTUAL / 90), 1e-12, "ln(outcome/answer)");
    // Shrunk bias factor exp(Z·m), Z = n/(n + 5) with n = 1 (credibility, constant 5 stated on the page).
    near(await stat(della, "bias-factor"), Math.exp((1 / 6) * Math.log(ACTUAL / 90)), 1e-12, "bias factor");
    await expectAccessible(org);
    await org.screenshot({ path: path.join(shots, "roster-track-records.png"), fullPage: true });

    await org.goto(`${baseURL}/accuracy`);
    await org.locator('[data-chart="tracking-signal"]').waitFor({ state: "visible" });
    const q = org.locator(`tr[data-history-question="${questionId}"]`);
    expect(await stat(q, "outcome-value")).toBe(ACTUAL);
    near(await stat(q, "blend"), blend, 1e-9, "blend in the history");
    // One question: MAE of the blend = |outcome − blend|.
    near(await stat(org, "blend-mae"), Math.abs(ACTUAL - blend), 1e-9, "MAE of the blend over one question");
    await expectAccessible(org);
    await org.screenshot({ path: path.join(shots, "accuracy.png"), fullPage: true });
  });

  it("corrects the outcome with a reason: the scores follow and the correction is in the audit log", async () => {
    await org.goto(`${baseURL}/panels/${panelId}/questions/${questionId}`);
    await org.getByLabel(/^Corrected outcome value/).fill(String(CORRECTED));
    await org.getByLabel("Reason").fill("The ledger missed two late pallets");
    await org.getByRole("button", { name: "Correct the outcome" }).click();
    // The correction, too, shows the old and the new number with the unit before it is saved.
    const confirm = org.locator(`[data-confirm="${CORRECTED}"]`);
    await confirm.waitFor({ state: "visible" });
    expect(await confirm.textContent()).toContain(`from ${ACTUAL} hundred units to ${CORRECTED} hundred units`);
    expect((await api("GET", `/api/v1/panels/${panelId}/questions/${questionId}/outcome`, { token })).body.outcomeValue).toBe(ACTUAL);
    await confirm.getByRole("button", { name: `Yes, correct it to ${CORRECTED} hundred units` }).click();
    await expect.poll(() => org.locator('[data-stat="outcome-value"]').first().getAttribute("data-value")).toBe(String(CORRECTED));
    const blend = 0.5 * expected.median + 0.5 * expected.mean;
    // The reported figures stay; only the scores move: error = corrected outcome − blend.
    near(await stat(org.locator('[data-score="blend"]'), "forecast"), blend, 1e-9, "blend as reported");
    near(await stat(org.locator('[data-score="blend"]'), "error"), CORRECTED - blend, 1e-9, "rescored blend error");
    await expect.poll(() => org.locator("section[aria-labelledby=outcome-form-h]").textContent()).toContain("The ledger missed two late pallets");
    await org.screenshot({ path: path.join(shots, "question-outcome.png"), fullPage: true });
    await expectAccessible(org);
    // On a 360-px phone the organiser's question page fits its width: no sideways scrolling.
    await org.setViewportSize({ width: 360, height: 800 });
    await expect
      .poll(() => org.evaluate(() => document.documentElement.scrollWidth), { message: "scrollWidth at 360 px" })
      .toBeLessThanOrEqual(360)
      .catch(async (err: Error) => {
        throw new Error(`${err.message}\nwider than 360 px: ${(await overflowing(org)).join(", ")}`);
      });
    await expectAccessible(org);
    await org.screenshot({ path: path.join(shots, "question-outcome-phone.png"), fullPage: true });
    await org.setViewportSize({ width: 1280, height: 900 });
  });

  it("the reviewer's report puts the blended figure first, shows the three legs and the departures, and the CSV export carries the same figures", async () => {
    const ctx = await browser.newContext({ viewport: { width: 1280, height: 900 }, acceptDownloads: true });
    const page = await signInPage(ctx, reviewer, "/reports");
    const errors: string[] = [];
    page.on("pageerror", (e) => errors.push(e.message));
    await page.goto(`${baseURL}/reports/${panelId}`);
    await expectAccessible(page);
    await page
      .locator(`[data-report-question="${questionId}"] a`)
      .click()
      .catch(async (err: Error) => {
        // Say what the page showed instead (a flaky run left only a timeout to go on).
        throw new Error(`${err.message}\npage ${page.url()}:\n${(await page.locator("body").innerText().catch(() => "?")).slice(0, 800)}`);
      });
    await page.waitForURL(new RegExp(`/reports/${panelId}/questions/${questionId}$`));
    await page.locator('[data-stat="blend-figure"]').waitFor({ state: "visible" });

    const blend = 0.5 * expected.median + 0.5 * expected.mean;
    // Order: the blended figure before the legs, the legs before the departures.
    const order = await page.evaluate(() => {
      const pos = (sel: string) => {
        const el = document.querySelector(sel);
        return el ? Array.from(document.querySelectorAll("*")).indexOf(el) : -1;
      };
      return { blend: pos('[data-stat="blend-figure"]'), judgment: pos('[data-leg="judgment"]'), statistics: pos('[data-leg="statistics"]'), track: pos('[data-leg="track-record"]'), departures: pos(".departure-table"), firstH2: document.querySelector("article h2")?.id };
    });
    expect(order.firstH2).toBe("blend-h");
    expect(order.blend).toBeGreaterThan(0);
    expect(order.blend).toBeLessThan(order.judgment);
    expect(order.judgment).toBeLessThan(order.statistics);
    expect(order.statistics).toBeLessThan(order.track);
    expect(order.track).toBeLessThan(order.departures);
    near(await stat(page, "blend-figure"), blend, 1e-9, "report blend");
    near(await stat(page, "leg-baseline-mean"), expected.mean, 1e-9, "statistics leg = R");
    near(await stat(page, "panel-raw"), expected.median, 1e-12, "judgment leg = R median");
    const row = page.locator("tr[data-departure]", { has: page.locator('[data-stat="value"][data-value="90"]') });
    near(await stat(row, "z"), expected.z90, 1e-9, "report z of 90 = R");
    await expectAccessible(page);
    // A reviewer sees no names: the departure rows carry pseudonyms.
    const html = await page.content();
    for (const p of PANELISTS) expect(html).not.toContain(p.name);
    expect(await page.locator(".caution").first().textContent()).toContain("Every forecast is uncertain");
    await page.screenshot({ path: path.join(shots, "report-desktop.png"), fullPage: true });
    expect(await page.getByRole("button", { name: "Print" }).count()).toBe(1);
    await page.emulateMedia({ media: "print" });
    expect(await page.locator(".site-header nav").isVisible()).toBe(false);
    expect(await page.getByRole("button", { name: "Print" }).isVisible()).toBe(false);
    await page.screenshot({ path: path.join(shots, "report-print.png"), fullPage: true });
    await page.emulateMedia({ media: "screen" });

    const [download] = await Promise.all([page.waitForEvent("download"), page.locator('[data-export="csv"]').click()]);
    const file = await download.path();
    const csv = readFileSync(file, "utf8");
    const rows = csv
      .trim()
      .split(/\r\n/)
      .map((l) => l.split(","));
    const value = (section: string, item: string, measure: string) => {
      const r = rows.find((x) => x[0] === section && x[1] === item && x[2] === measure);
      if (!r) throw new Error(`CSV has no ${section}/${item}/${measure}`);
      return Number(r[3]);
    };
    expect(rows[0]).toEqual(["section", "item", "measure", "value", "unit"]);
    // Rounded as the page shows them (R's signif, computed in fromR).
    expect(value("blend", "blended figure", "figure")).toBe(expected.csv.blend);
    expect(value("baseline", "naive", "forecast")).toBe(expected.csv.mean);
    expect(value("baseline", "naive", "80% lower")).toBe(expected.csv.lower80);
    expect(value("baseline", "naive", "95% upper")).toBe(expected.csv.upper95);
    const z = rows.filter((x) => x[0] === "departure" && x[2] === "z" && / round 1$/.test(x[1]) && !x[1].startsWith("panel")).map((x) => Number(x[3]));
    expect(z).toContain(expected.csv.z90);
    expect(value("outcome", "outcome", "value")).toBe(CORRECTED);

    const json = await api("GET", `/api/v1/panels/${panelId}/questions/${questionId}/report.json`, { token });
    expect(json.status).toBe(200);
    near(json.body.blend.figure, blend, 1e-9, "JSON blend");
    // The charts rendered without a script error.
    expect(await page.locator('[data-chart="ranges"] canvas').count()).toBe(1);
    expect(await page.locator('[data-chart="departure"] canvas').count()).toBe(1);
    // One closed round: the convergence chart draws its interquartile range as a bar and says that
    // convergence is judged from the second round on.
    const convergence = page.locator('[data-chart="convergence"]');
    expect(await convergence.getAttribute("data-rounds")).toBe("1");
    expect(await convergence.locator("canvas").count()).toBe(1);
    expect(await page.locator("figure", { has: convergence }).locator("figcaption").textContent()).toMatch(/second round/);
    await page.screenshot({ path: path.join(shots, "report-question-charts.png"), fullPage: true });
    expect(errors).toEqual([]);
    await ctx.close();
  });
});
