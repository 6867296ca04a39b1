/**
 * The month-to-year case in the browser (issue 12, item 1): a question about the first 12
 * months after launch, whose baseline was attached over the API as one month's value (the old
 * behaviour). The organiser's question page warns that the baseline lies outside the question's
 * plausible range and an order of magnitude from the panel; the organiser then chooses "the
 * total over the next n periods", n = 12, each history row one month, previews (the total and
 * its range shown before attaching) and attaches. The baseline is then inside the question's
 * range, the warnings are gone, and the blended figure lies between the legs.
 *
 * History: R's AirPassengers, January 1949 to December 1950 (public; R datasets). Method
 * seasonal naive, so the figures are hand computations: step 12 = December 1950 = 140; the
 * 12-month total = the sum of 1950's values = 1,676 (Hyndman & Athanasopoulos, FPP3 §5.2).
 * Panelists and answers are invented (Quillmoor Instruments' Kestrel-1 launch).
 * Waits are on page state only.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, Page } from "playwright-core";
import { api, apiTokenFor, baseURL, clearDatabase, createAccount, type TestUser } from "./api-client";
import { expectAccessible, launchChromium, signInPage, stat as statOn } from "./browser";

const AIR24 = [112, 118, 132, 129, 121, 135, 148, 148, 136, 119, 104, 118, 115, 126, 141, 135, 125, 149, 170, 170, 158, 133, 114, 140];
const ANSWERS = [1600, 1750, 1800, 1900, 2100];

let browser: Browser;
let org: Page;
let organiser: TestUser;
let token = "";
let panelId = "";
let questionId = "";

async function ok(method: string, url: string, body?: unknown, bearer = token): Promise<any> {
  const res = await api(method, url, { token: bearer, body });
  if (res.status >= 300) throw new Error(`${method} ${url}: ${res.status} ${res.text}`);
  return res.body;
}

const stat = (name: string) => statOn(org, name);

describe("month-to-year baseline in the browser", () => {
  beforeAll(async () => {
    organiser = createAccount("Ysolde Brackwater");
    token = await apiTokenFor(organiser);
    const panel = await ok("POST", "/api/v1/panels", {
      title: "Kestrel-1 launch year (Quillmoor Instruments)",
      questions: [{ text: "How many Kestrel-1 units in the first 12 months after launch?", unit: "thousand units", targetPeriod: "first 12 months after launch", lowerBound: 500, upperBound: 5000, answerFormat: "single", aggregation: "shared" }],
    });
    panelId = panel.id;
    questionId = panel.questions[0].id;
    const ids: string[] = [];
    for (let i = 0; i < ANSWERS.length; i++) ids.push((await ok("POST", "/api/v1/roster", { name: `Kestrel analyst ${i + 1}`, email: `kestrel${i + 1}@example.com` })).id);
    const invitations = await ok("POST", `/api/v1/panels/${panelId}/invitations`, { rosterMemberIds: ids });
    await ok("POST", `/api/v1/panels/${panelId}/rounds/1/open`, {});
    for (let i = 0; i < ANSWERS.length; i++) {
      const inv = invitations.find((x: { rosterMemberId: string }) => x.rosterMemberId === ids[i]);
      await ok("POST", "/api/v1/panelist/answers", { questionId, value: ANSWERS[i], rationale: "Dealer pre-orders." }, inv.token);
    }
    await ok("POST", `/api/v1/panels/${panelId}/rounds/1/close`);
    await ok("PUT", `/api/v1/panels/${panelId}/questions/${questionId}/baseline`, { values: AIR24, season: 12, method: "seasonal-naive", horizon: 12, period: "month" });

    browser = await launchChromium();
    org = await signInPage(await browser.newContext({ viewport: { width: 1280, height: 900 } }), organiser);
  });

  afterAll(async () => {
    await browser?.close();
    await clearDatabase();
  });

  it("one month's value for a year's question: the page warns and says what the baseline answers", async () => {
    await org.goto(`${baseURL}/panels/${panelId}/questions/${questionId}`);
    await expect.poll(() => org.locator("[data-warning]").count()).toBe(2);
    expect(await org.locator("[data-warning]").first().textContent()).toMatch(/outside the question's plausible range, 500 to 5,000/);
    expect(await org.locator("[data-baseline-answers]").textContent()).toBe("value in month 12 after the history");
    expect(await stat("baseline-mean")).toBe(140); // December 1950
    await expectAccessible(org);
  });

  it("the total of the next 12 months: previewed with its range, attached, inside the range, the blend between the legs", async () => {
    await org.getByText("Change the history or the method").click();
    await org.getByLabel("Pasted values, oldest first").check();
    await org.getByLabel(/^Values/).fill(AIR24.join(", "));
    await org.getByLabel(/^Season length/).fill("12");
    await org.getByRole("combobox", { name: /^Method/ }).selectOption("seasonal-naive");
    await org.getByRole("combobox", { name: /^What the question asks for/ }).selectOption("total");
    await org.getByLabel(/^Horizon/).fill("12");
    await org.getByRole("combobox", { name: /^Each history row is one/ }).selectOption("month");
    await org.getByRole("button", { name: "Preview", exact: true }).click();
    await expect.poll(() => org.locator("[data-preview-target]").textContent()).toBe("total of the next 12 months");
    expect(await stat("preview-target-mean")).toBe(1676); // sum of 1950's values
    expect(await stat("preview-target-lower80")).toBeLessThan(1676);
    expect(await stat("preview-target-upper80")).toBeGreaterThan(1676);
    await expectAccessible(org);

    await org.getByRole("button", { name: "Attach baseline" }).click();
    await expect.poll(() => org.locator("[data-baseline-answers]").textContent()).toBe("total of the next 12 months");
    await expect.poll(() => org.locator("[data-warning]").count()).toBe(0);
    const baseline = await stat("baseline-mean");
    expect(baseline).toBe(1676);
    expect(baseline).toBeGreaterThanOrEqual(500); // the question's plausible range
    expect(baseline).toBeLessThanOrEqual(5000);
    const panel = await stat("panel-corrected");
    expect(panel).toBe(1800); // median of the answers; no track records yet
    const blend = await stat("blend-figure");
    expect(blend).toBeGreaterThan(Math.min(panel, baseline));
    expect(blend).toBeLessThan(Math.max(panel, baseline));
    await expectAccessible(org);
  });

  it("a total over months 4..14 (first period a, last period b): the preview says so in words", async () => {
    await org.goto(`${baseURL}/panels/${panelId}/questions/${questionId}`);
    await org.getByText("Change the history or the method").click();
    await org.getByLabel("Pasted values, oldest first").check();
    await org.getByLabel(/^Values/).fill(AIR24.join(", "));
    await org.getByLabel(/^Season length/).fill("12");
    await org.getByRole("combobox", { name: /^Method/ }).selectOption("seasonal-naive");
    await org.getByRole("combobox", { name: /^What the question asks for/ }).selectOption("total");
    await org.getByLabel(/^First period a/).fill("4");
    await org.getByLabel(/^Horizon/).fill("14");
    await org.getByRole("combobox", { name: /^Each history row is one/ }).selectOption("month");
    await org.getByRole("button", { name: "Preview", exact: true }).click();
    await expect.poll(() => org.locator("[data-preview-target]").textContent()).toBe("total of months 4 to 14 after the history");
    // Seasonal naive: April 1950 … February 1950's values, 1,676 − 141 (March) = 1,535 (hand sum).
    expect(await stat("preview-target-mean")).toBe(1535);
  });
});
