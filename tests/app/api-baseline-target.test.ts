/**
 * The month-to-year case over HTTP (issue 12, item 1): a question about the first 12 months
 * after launch, a history of 24 monthly values with season 12. Attached as "the value in period
 * 12" (the old behaviour) the baseline is one month's forecast, outside the question's plausible
 * range, and the API warns; as "the total over the next 12 periods" it answers the question:
 * inside the range, and the blend lies between the legs. A total over months a..b (a window
 * after the next period) is stored and shown in the same words.
 *
 * History: R's AirPassengers, January 1949 to December 1950 (public; R datasets), in thousands.
 * Method seasonal naive, so the expected figures are hand computations: its step-12 forecast is
 * December 1950's value, 140; its 12-month total is the sum of 1950's values, 1,676 (Hyndman &
 * Athanasopoulos, FPP3 §5.2, seasonal naive: ŷ_{T+h} = y_{T+h−m(k+1)}). The total's bounds are
 * checked against R in tests/triangulation/baseline-target.test.ts. Answers and people are invented.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { api, apiTokenFor, clearDatabase, createAccount } from "./api-client";

const AIR24 = [112, 118, 132, 129, 121, 135, 148, 148, 136, 119, 104, 118, 115, 126, 141, 135, 125, 149, 170, 170, 158, 133, 114, 140];
const ANSWERS = [1600, 1750, 1800, 1900, 2100];
let owner = "";
let panelId = "";
let questionId = "";
const q = () => `/api/v1/panels/${panelId}/questions/${questionId}`;

async function ok<T = any>(method: string, path: string, token: string, body?: unknown): Promise<T> {
  const res = await api(method, path, { token, body });
  if (res.status >= 300) throw new Error(`${method} ${path} → ${res.status}: ${res.text}`);
  return res.body as T;
}

beforeAll(async () => {
  owner = await apiTokenFor(createAccount("Maren Tolle"));
  const panel = await ok("POST", "/api/v1/panels", owner, {
    title: "Kestrel-1 launch year",
    questions: [{ text: "How many Kestrel-1 units in the first 12 months after launch?", unit: "thousand units", targetPeriod: "first 12 months after launch", lowerBound: 500, upperBound: 5000, answerFormat: "single", aggregation: "shared" }],
  });
  panelId = panel.id;
  questionId = panel.questions[0].id;
  const members: { id: string }[] = [];
  for (let i = 0; i < ANSWERS.length; i++) members.push(await ok("POST", "/api/v1/roster", owner, { name: `Analyst ${i + 1}`, email: `analyst${i + 1}.${Date.now()}@example.com` }));
  const issued = await ok<any[]>("POST", `/api/v1/panels/${panelId}/invitations`, owner, { rosterMemberIds: members.map((m) => m.id) });
  await ok("POST", `/api/v1/panels/${panelId}/rounds/1/open`, owner, {});
  for (let i = 0; i < ANSWERS.length; i++) {
    const token = issued.find((x) => x.rosterMemberId === members[i].id).token;
    await ok("POST", "/api/v1/panelist/answers", token, { questionId, value: ANSWERS[i], rationale: "invented" });
  }
  await ok("POST", `/api/v1/panels/${panelId}/rounds/1/close`, owner);
});
afterAll(() => clearDatabase());

const history = { values: AIR24, season: 12, method: "seasonal-naive", horizon: 12, period: "month" };

describe("month-to-year: what the baseline answers", () => {
  it("one month's value (the old behaviour) is outside the plausible range, and the triangulation API says so", async () => {
    const b = await ok("PUT", `${q()}/baseline`, owner, history);
    expect(b.target).toMatchObject({ quantity: "value", period: "month", mean: 140, label: "value in month 12 after the history" }); // December 1950
    const t = await ok("GET", `${q()}/triangulation`, owner);
    expect(t.warnings).toHaveLength(2);
    expect(t.warnings[0]).toMatch(/baseline's forecast \(140 thousand units, the value in month 12 after the history\) lies outside the question's plausible range, 500 to 5,000/);
    expect(t.warnings[1]).toMatch(/differ by a factor of 12\.9: an order of magnitude/); // 1800 / 140 = 12.857, shown to 3 digits (hand computation)
  });

  it("the preview shows the total and its range before attaching, and stores nothing", async () => {
    const p = await ok("POST", `${q()}/baseline/preview`, owner, { ...history, quantity: "total" });
    expect(p.stored).toBe(false);
    expect(p.target).toMatchObject({ quantity: "total", step: 12, label: "total of the next 12 months", mean: 1676 }); // sum of 1950
    expect(p.target.lower80).toBeLessThan(1676);
    expect(p.target.upper80).toBeGreaterThan(1676);
    expect((await ok("GET", `${q()}/baseline`, owner)).target.quantity).toBe("value");
  });

  it("the total of the next 12 months lies inside the question's range, and the blend between the legs", async () => {
    const b = await ok("PUT", `${q()}/baseline`, owner, { ...history, quantity: "total" });
    expect(b.target).toMatchObject({ quantity: "total", mean: 1676 });
    expect(b.target.mean).toBeGreaterThanOrEqual(500);
    expect(b.target.mean).toBeLessThanOrEqual(5000);
    const t = await ok("GET", `${q()}/triangulation`, owner);
    expect(t.warnings).toEqual([]);
    expect(t.baseline.mean).toBe(1676);
    expect(t.panel.corrected.figure).toBe(1800); // median of the answers; nobody has a track record
    expect(t.blend.figure).toBeCloseTo((1800 + 1676) / 2, 9); // equal weights (Bates & Granger 1969), hand computation
    const report = await ok("GET", `/api/v1/panels/${panelId}/questions/${questionId}/report.json`, owner);
    expect(report.legs.baseline.target.label).toBe("total of the next 12 months");
    expect(report.inputs.join(" ")).toMatch(/the baseline answers the total of the next 12 months .*; the question's target period: first 12 months after launch/);
  });

  it("the total of months 4..14 after the history (a window): stored, shown in words, in the report, and in the API document", async () => {
    const b = await ok("PUT", `${q()}/baseline`, owner, { ...history, horizon: 14, firstPeriod: 4, quantity: "total" });
    // Seasonal naive: months 4..14 after December 1950 repeat April 1950..February 1950+1:
    // 135 + 125 + 149 + 170 + 170 + 158 + 133 + 114 + 140 + 115 + 126 = 1,535 (hand sum).
    expect(b.target).toMatchObject({ quantity: "total", step: 14, firstPeriod: 4, label: "total of months 4 to 14 after the history", mean: 1535 });
    expect(b.result.total).toMatchObject({ from: 4, to: 14 });
    expect(b.target.lower80).toBeLessThan(1535);
    expect(b.target.upper80).toBeGreaterThan(1535);
    const again = await ok("GET", `${q()}/baseline`, owner);
    expect(again.target).toMatchObject({ firstPeriod: 4, step: 14, mean: 1535 });
    const report = await ok("GET", `/api/v1/panels/${panelId}/questions/${questionId}/report.json`, owner);
    expect(report.legs.baseline.target.label).toBe("total of months 4 to 14 after the history");
    expect(report.inputs.join(" ")).toMatch(/the baseline answers the total of months 4 to 14 after the history/);
    const doc = await ok("GET", "/api/v1/openapi.json", owner);
    expect(JSON.stringify(doc)).toMatch(/First period a of a total or average over periods a\.\.horizon/);
  });

  it("refuses a first period after the horizon, or with a value, with 422 naming firstPeriod", async () => {
    for (const body of [{ ...history, horizon: 3, firstPeriod: 4, quantity: "total" }, { ...history, firstPeriod: 2 }]) {
      const res = await api("PUT", `${q()}/baseline`, { token: owner, body });
      expect(res.status).toBe(422);
      expect(res.body.errors.map((e: any) => e.field)).toEqual(["firstPeriod"]);
    }
  });

  it("refuses a quantity or period it does not know with 422 naming the field", async () => {
    const res = await api("PUT", `${q()}/baseline`, { token: owner, body: { ...history, quantity: "sum", period: "fortnight" } });
    expect(res.status).toBe(422);
    expect(res.contentType).toContain("application/problem+json");
    expect(res.body.errors.map((e: any) => e.field).sort()).toEqual(["period", "quantity"]);
  });
});
