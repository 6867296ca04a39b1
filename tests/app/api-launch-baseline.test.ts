/**
 * A launch baseline over HTTP (docs/methods.md §19): a product with no history borrows the course of
 * analogous launches (Bass diffusion) and takes its market potential from the panel's answers to
 * another question of the same panel.
 *
 * Analogues: the year-on-year increases of M3 series N0115 (M3 competition, Makridakis & Hibon
 * 2000; open data) and a series R simulated from a Bass curve (p 0.02, q 0.45, m 5,000, normal
 * noise sd 20, set.seed(11); printed by R, see tests/forecast/bass.test.ts). Each analogue's p and q
 * are checked against R's `nls` (algorithm "port") run in this test. The market question's
 * answers and the people are invented; with no track records the corrected panel figure is the
 * answers' median, 40,000 (hand computation).
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { api, apiTokenFor, clearDatabase, createAccount } from "./api-client";
import { rEval, rVector } from "../helpers/r";

const N0115 = [13.0, 32.06, 89.72, 128.1, 110.7, 154.94, 195.16, 183.56, 181.32, 187.54, 266.64, 199.48, 498.84, 1179.28, 640.4, 421.56, 506.78, 722.78, 543.46];
const SIM = [112.66, 187.3, 240.45, 346.45, 505.67, 551.9, 636.76, 598.49, 506.26, 380.91, 278.38, 198.67, 107.3, 85.25];
const MARKET = [30000, 35000, 40000, 48000, 60000];
const FIRST_YEAR = [5000, 6000, 7000, 8000, 9000];
let owner = "";
let panelId = "";
let marketId = "";
let questionId = "";
let otherPanelQuestion = "";
let beforeClose: { status: number; body: any } = { status: 0, body: null };
const q = () => `/api/v1/panels/${panelId}/questions/${questionId}`;

async function ok<T = any>(method: string, path: string, token: string, body?: unknown): Promise<T> {
  const res = await api(method, path, { token, body });
  if (res.status >= 300) throw new Error(`${method} ${path} → ${res.status}: ${res.text}`);
  return res.body as T;
}

const launch = (market: unknown) => ({
  launch: { analogues: [{ name: "Kestrel-1", values: N0115 }, { name: "Kestrel-2", values: SIM }], market, note: "same buyers, same dealer channel" },
  quantity: "total",
  horizon: 8,
  period: "quarter",
});

beforeAll(async () => {
  owner = await apiTokenFor(createAccount("Ilse Varga"));
  const panel = await ok("POST", "/api/v1/panels", owner, {
    title: "Kestrel-3 launch",
    questions: [
      { text: "How many Kestrel-3 units will ever be sold (market potential)?", unit: "units", targetPeriod: "product lifetime", lowerBound: 1000, upperBound: 1000000, answerFormat: "single", aggregation: "shared" },
      { text: "How many Kestrel-3 units in the first 8 quarters after launch?", unit: "units", targetPeriod: "first 8 quarters", lowerBound: 100, upperBound: 500000, answerFormat: "single", aggregation: "shared" },
    ],
  });
  panelId = panel.id;
  marketId = panel.questions[0].id;
  questionId = panel.questions[1].id;
  const other = await ok("POST", "/api/v1/panels", owner, { title: "Another panel", questions: [{ text: "Something else?", unit: "units", targetPeriod: "2027", lowerBound: 0, upperBound: 10, answerFormat: "single", aggregation: "shared" }] });
  otherPanelQuestion = other.questions[0].id;
  const members: { id: string }[] = [];
  for (let i = 0; i < MARKET.length; i++) members.push(await ok("POST", "/api/v1/roster", owner, { name: `Planner ${i + 1}`, email: `planner${i + 1}.${Date.now()}@example.com` }));
  const issued = await ok<any[]>("POST", `/api/v1/panels/${panelId}/invitations`, owner, { rosterMemberIds: members.map((m) => m.id) });
  await ok("POST", `/api/v1/panels/${panelId}/rounds/1/open`, owner, {});
  for (let i = 0; i < MARKET.length; i++) {
    const token = issued.find((x) => x.rosterMemberId === members[i].id).token;
    await ok("POST", "/api/v1/panelist/answers", token, { questionId: marketId, value: MARKET[i], rationale: "invented" });
    await ok("POST", "/api/v1/panelist/answers", token, { questionId, value: FIRST_YEAR[i], rationale: "invented" });
  }
  const res = await api("POST", `${q()}/baseline/preview`, { token: owner, body: launch({ questionId: marketId }) });
  beforeClose = { status: res.status, body: res.body };
  await ok("POST", `/api/v1/panels/${panelId}/rounds/1/close`, owner);
});
afterAll(() => clearDatabase());

describe("launch baseline", () => {
  it("takes the market potential from the panel's answers to another question, and answers the first 8 quarters", async () => {
    const b = await ok("PUT", `${q()}/baseline`, owner, launch({ questionId: marketId }));
    expect(b.source).toBe("launch");
    expect(b.result.method).toBe("bass");
    expect(b.target).toMatchObject({ quantity: "total", step: 8, label: "total of the first 8 quarters after launch" });
    expect(b.target.lower80).toBeLessThan(b.target.mean);
    expect(b.target.mean).toBeLessThan(b.target.upper80);
    expect(b.target.lower95).toBeLessThanOrEqual(b.target.lower80);
    const market = b.result.launch.market;
    expect(market.median).toBe(40000); // median of the answers, hand computation
    const t = await ok("GET", `/api/v1/panels/${panelId}/questions/${marketId}/triangulation`, owner);
    const i80 = t.panel.corrected.intervals.find((i: any) => i.level === 80);
    expect([market.low, market.high]).toEqual([i80.lower, i80.upper]);
    expect(market.how).toMatch(/market potential|Kestrel-3 units will ever be sold/);
    const r = rEval(`Fb <- function(t, p, q) (1 - exp(-(p + q) * t)) / (1 + (q / p) * exp(-(p + q) * t))
      for (y in list(${rVector(N0115)}, ${rVector(SIM)})) { t <- seq_along(y)
        f <- nls(y ~ m * (Fb(t, p, q) - Fb(t - 1, p, q)), start = list(p = 0.03, q = 0.38, m = 1.1 * sum(y)),
          algorithm = "port", lower = c(1e-9, 0, 1), control = list(maxiter = 1000, eval.max = 5000))
        out("pq", coef(f)[1:2]) }`, { withForecast: false });
    // both analogues print "pq": rEval keeps the last, the simulated series'
    const fit = b.result.launch.analogues[1];
    expect(Math.abs(fit.p - r.pq[0]) / r.pq[0]).toBeLessThan(1e-4);
    expect(Math.abs(fit.q - r.pq[1]) / r.pq[1]).toBeLessThan(1e-4);
    const tri = await ok("GET", `${q()}/triangulation`, owner);
    expect(tri.baseline.mean).toBe(b.target.mean);
    expect(tri.blend.figure).toBeGreaterThan(Math.min(tri.baseline.mean, tri.panel.corrected.figure));
    expect(tri.blend.figure).toBeLessThan(Math.max(tri.baseline.mean, tri.panel.corrected.figure));
  });

  it("takes a given low / median / high, and the report says where the market potential came from", async () => {
    const b = await ok("PUT", `${q()}/baseline`, owner, launch({ low: 20000, median: 40000, high: 80000 }));
    expect(b.result.launch.market).toMatchObject({ median: 40000, low: 20000, high: 80000 });
    // σ = ln(80000/20000)/(2·1.2815516) = 0.5408655 (hand computation)
    expect(b.result.launch.market.sigmaLog).toBeCloseTo(0.5408655, 6);
    const report = await ok("GET", `${q()}/report.json`, owner);
    expect(report.legs.baseline.target.label).toBe("total of the first 8 quarters after launch");
  });

  it("refuses what it cannot use with 422 naming the field, and never a 5xx", async () => {
    expect(beforeClose.status).toBe(422);
    expect(beforeClose.body.errors[0]).toMatchObject({ field: "launch.market.questionId" });
    expect(beforeClose.body.errors[0].message).toMatch(/no closed round/);
    const cases: [unknown, string, RegExp][] = [
      [launch({ questionId }), "launch.market.questionId", /from itself/],
      [launch({ questionId: otherPanelQuestion }), "launch.market.questionId", /no question with this id in this panel/],
      [launch({ low: 50000, median: 40000, high: 80000 }), "launch.market.median", /low < median < high/],
      [{ ...launch({ low: 1, median: 2, high: 3 }), launch: { analogues: [{ name: "short", values: [1, 2, 3] }], market: { low: 1, median: 2, high: 3 }, note: "n" } }, "launch.analogues.0.values", /at least 5 periods/],
      [{ ...launch({ low: 1, median: 2, high: 3 }), values: [1, 2, 3] }, "csv", /exactly one of csv, values or launch/],
      [{ ...launch({ low: 1, median: 2, high: 3 }), launch: { analogues: [{ name: "zeros", values: [0, 0, 0, 0, 0] }], market: { low: 1, median: 2, high: 3 }, note: "n" } }, "launch.analogues", /analogue 'zeros'.*add up to zero/],
    ];
    for (const [body, field, message] of cases) {
      const res = await api("POST", `${q()}/baseline/preview`, { token: owner, body });
      expect(res.status, JSON.stringify(body).slice(0, 80)).toBe(422);
      const e = res.body.errors.find((x: any) => x.field === field);
      expect(e, `${field} in ${res.text}`).toBeDefined();
      expect(e.message).toMatch(message);
    }
  });
});
