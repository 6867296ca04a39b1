/**
 * A launch baseline in the browser (docs/methods.md §19): the organiser of a product with no history
 * chooses "Analogous launches" on the question page, types two analogues' sales per quarter from
 * launch, takes the market potential from the panel's answers to the other question, previews
 * (the analogues' Bass fits and the forecast per quarter shown before attaching) and attaches.
 * The baseline then answers "total of the first 8 quarters after launch" with its range, and the
 * blend lies between the legs. A too-short analogue is refused with a message by its field.
 *
 * Analogues: the year-on-year increases of M3 series N0115 (M3 competition, Makridakis & Hibon
 * 2000; open data) and a series R simulated from a Bass curve (set.seed(11); see
 * tests/forecast/bass.test.ts, where both fits are checked against R's nls). Panelists and answers
 * are invented. Waits are on page state only.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, Page } from "playwright-core";
import { api, apiTokenFor, baseURL, clearDatabase, createAccount, type TestUser } from "./api-client";
import { expectAccessible, launchChromium, signInPage, stat as statOn } from "./browser";

const N0115 = [13.0, 32.06, 89.72, 128.1, 110.7, 154.94, 195.16, 183.56, 181.32, 187.54, 266.64, 199.48, 498.84, 1179.28, 640.4, 421.56, 506.78, 722.78, 543.46];
const SIM = [112.66, 187.3, 240.45, 346.45, 505.67, 551.9, 636.76, 598.49, 506.26, 380.91, 278.38, 198.67, 107.3, 85.25];
const MARKET = [30000, 35000, 40000, 48000, 60000];
const EIGHT_QUARTERS = [5000, 6000, 7000, 8000, 9000];

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

describe("launch baseline in the browser", () => {
  beforeAll(async () => {
    organiser = createAccount("Odile Farrant");
    token = await apiTokenFor(organiser);
    const panel = await ok("POST", "/api/v1/panels", {
      title: "Kestrel-3 launch course (Quillmoor Instruments)",
      questions: [
        { text: "How many Kestrel-3 units will ever be sold?", unit: "units", targetPeriod: "product lifetime", lowerBound: 1000, upperBound: 1000000, answerFormat: "single", aggregation: "shared" },
        { text: "How many Kestrel-3 units in the first 8 quarters?", unit: "units", targetPeriod: "first 8 quarters after launch", lowerBound: 100, upperBound: 500000, answerFormat: "single", aggregation: "shared" },
      ],
    });
    panelId = panel.id;
    const marketId = panel.questions[0].id;
    questionId = panel.questions[1].id;
    const ids: string[] = [];
    for (let i = 0; i < MARKET.length; i++) ids.push((await ok("POST", "/api/v1/roster", { name: `Kestrel planner ${i + 1}`, email: `kplanner${i + 1}@example.com` })).id);
    const invitations = await ok("POST", `/api/v1/panels/${panelId}/invitations`, { rosterMemberIds: ids });
    await ok("POST", `/api/v1/panels/${panelId}/rounds/1/open`, {});
    for (let i = 0; i < MARKET.length; i++) {
      const inv = invitations.find((x: { rosterMemberId: string }) => x.rosterMemberId === ids[i]);
      await ok("POST", "/api/v1/panelist/answers", { questionId: marketId, value: MARKET[i], rationale: "Dealer survey." }, inv.token);
      await ok("POST", "/api/v1/panelist/answers", { questionId, value: EIGHT_QUARTERS[i], rationale: "Dealer pre-orders." }, inv.token);
    }
    await ok("POST", `/api/v1/panels/${panelId}/rounds/1/close`);

    browser = await launchChromium();
    org = await signInPage(await browser.newContext({ viewport: { width: 1280, height: 900 } }), organiser);
  });

  afterAll(async () => {
    await browser?.close();
    await clearDatabase();
  });

  it("refuses a too-short analogue with a message beside the field", async () => {
    await org.goto(`${baseURL}/panels/${panelId}/questions/${questionId}`);
    await org.getByRole("radio", { name: /Analogous launches/ }).check();
    await org.getByLabel(/^Analogous products' adoptions/).fill("Kestrel-1: 10, 20, 30");
    await org.getByLabel(/^Why these analogues/).fill("same buyers");
    await org.getByRole("button", { name: "Preview", exact: true }).click();
    await expect.poll(() => org.locator('[data-field="launch.analogues"]').textContent()).toMatch(/at least 5 periods/);
    await expectAccessible(org);
  });

  it("previews the analogues' fits and the forecast, attaches, and the blend lies between the legs", async () => {
    await org.getByLabel(/^Analogous products' adoptions/).fill(`Kestrel-1: ${N0115.join(", ")}\nKestrel-2: ${SIM.join(", ")}`);
    await expect.poll(() => org.getByRole("radio", { name: /From the panel's answers/ }).isChecked()).toBe(true);
    await org.getByRole("combobox", { name: /^What the question asks for/ }).selectOption("total");
    await org.getByLabel(/^Horizon/).fill("8");
    await org.getByRole("combobox", { name: /^Each history row is one/ }).selectOption("quarter");
    await org.getByRole("button", { name: "Preview", exact: true }).click();
    await expect.poll(() => org.locator("[data-preview-target]").textContent()).toBe("total of the first 8 quarters after launch");
    expect(await org.locator("[data-launch-fits] tbody tr").count()).toBe(2);
    expect(await org.locator("[data-launch-steps] tbody tr").count()).toBe(8);
    const mean = await stat("preview-target-mean");
    expect(await stat("preview-target-lower80")).toBeLessThan(mean);
    expect(await stat("preview-target-upper80")).toBeGreaterThan(mean);
    await expectAccessible(org);

    await org.getByRole("button", { name: "Attach baseline" }).click();
    await expect.poll(() => org.locator("[data-baseline-answers]").textContent()).toBe("total of the first 8 quarters after launch");
    expect(await org.locator(".baseline-details [data-launch-fits] tbody tr").count()).toBe(2);
    const baseline = await stat("baseline-mean");
    const panel = await stat("panel-corrected");
    expect(panel).toBe(7000); // median of the answers; no track records yet (hand)
    const blend = await stat("blend-figure");
    expect(blend).toBeGreaterThan(Math.min(panel, baseline));
    expect(blend).toBeLessThan(Math.max(panel, baseline));
    await expectAccessible(org);
  });
});
