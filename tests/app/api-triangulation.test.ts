/**
 * Triangulation over HTTP (issue 4): a baseline attached from CSV (its forecast checked against
 * R's forecast::naive on the same series), CSV errors naming row and column, the blend and the
 * departures, recording a question's outcome and correcting it (audited), the report as JSON and
 * CSV for a reviewer, the track records and the accuracy history derived from the outcome.
 *
 * The series is the NIST/SEMATECH e-Handbook §6.4.3.1 12-point series
 * (tests/reference-data/nist_handbook_6431_ses12.csv); people and answers are invented.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { api, apiTokenFor, baseURL, clearDatabase, createAccount, signIn, type TestUser } from "./api-client";
import { expectClose, runR, rVector } from "../stats/rscript";
import { referenceCsv } from "../stats/reference-data";

let owner = "";
let reviewer: TestUser;
let reviewerCookie = "";
let panelId = "";
let questionId = "";
const ANSWERS = [68, 72, 75, 80, 90];
let series: number[] = [];
let csv = "";

async function ok<T = any>(method: string, path: string, token: string, body?: unknown): Promise<T> {
  const res = await api(method, path, { token, body });
  if (res.status >= 300) throw new Error(`${method} ${path} → ${res.status}: ${res.text}`);
  return res.body as T;
}

const q = () => `/api/v1/panels/${panelId}/questions/${questionId}`;

beforeAll(async () => {
  const cols = referenceCsv("nist_handbook_6431_ses12.csv");
  series = [...(cols.y ?? cols.value ?? Object.values(cols).at(-1)!)];
  csv = ["period,value", ...series.map((v, i) => `${i + 1},${v}`)].join("\n");
  owner = await apiTokenFor(createAccount("Ines Harrow"));
  reviewer = createAccount("Jon Pell", "reviewer");
  reviewerCookie = await signIn(reviewer);
  const panel = await ok("POST", "/api/v1/panels", owner, {
    title: "Plover-3 gauge volumes",
    questions: [
      // Starts with "=": the CSV export must neutralise it.
      { text: "=1+2: how many Plover-3 gauges in month 15?", unit: "units", targetPeriod: "month 15", lowerBound: 0, upperBound: 1000, answerFormat: "single", aggregation: "shared" },
    ],
  });
  panelId = panel.id;
  questionId = panel.questions[0].id;
  await ok("POST", `/api/v1/panels/${panelId}/shares`, owner, { email: reviewer.email, role: "reviewer" });
  const members: { id: string }[] = [];
  for (let i = 0; i < ANSWERS.length; i++) members.push(await ok("POST", "/api/v1/roster", owner, { name: `Expert ${i + 1}`, email: `expert${i + 1}.${Date.now()}@example.com` }));
  const issued = await ok<any[]>("POST", `/api/v1/panels/${panelId}/invitations`, owner, { rosterMemberIds: members.map((m) => m.id) });
  await ok("POST", `/api/v1/panels/${panelId}/rounds/1/open`, owner, {});
  for (let i = 0; i < ANSWERS.length; i++) {
    const token = issued.find((x) => x.rosterMemberId === members[i].id).token;
    await ok("POST", "/api/v1/panelist/answers", token, { questionId, value: ANSWERS[i], rationale: "invented" });
  }
  await ok("POST", `/api/v1/panels/${panelId}/rounds/1/close`, owner);
});
afterAll(() => clearDatabase());

describe("baseline on a question", () => {
  let rNaive: number[] = [];
  beforeAll(() => {
    [rNaive] = runR(`
      suppressMessages(library(forecast))
      f <- naive(${rVector(series)}, h = 3, level = c(80, 95))
      out(c(f$mean[3], f$lower[3, 1], f$upper[3, 1], f$lower[3, 2], f$upper[3, 2]))
    `);
  });

  it("attaches a CSV baseline with method naive; the target-period forecast and bounds equal R's naive()", async () => {
    const res = await api("PUT", `${q()}/baseline`, { token: owner, body: { csv, method: "naive", horizon: 3 } });
    expect(res.status, res.text).toBe(200);
    const b = res.body;
    expect(b.result.method).toBe("naive");
    expect(b.stored).toBe(true);
    expect(b.preview.rows).toHaveLength(12);
    expect(b.preview.rows[0]).toMatchObject({ row: 2, value: series[0] });
    expect(b.preview.ignoredColumns).toEqual([]);
    expect(b.preview.explanatoryColumns).toEqual(["period"]);
    expectClose([b.target.mean, b.target.lower80, b.target.upper80, b.target.lower95, b.target.upper95], rNaive, 1e-9, "naive vs R");
    const again = await api("GET", `${q()}/baseline`, { cookie: reviewerCookie });
    expect(again.status).toBe(200);
    expect(again.body.target).toEqual(b.target);
  });

  it("a CSV error is 422 naming the row and the column", async () => {
    const bad = csv.replace(`\n4,${series[3]}`, `\n4,6x8`);
    const res = await api("POST", `${q()}/baseline/preview`, { token: owner, body: { csv: bad, method: "naive" } });
    expect(res.status).toBe(422);
    expect(res.contentType).toContain("application/problem+json");
    expect(res.body.errors[0]).toMatchObject({ field: "csv", row: 5, column: "value" });
    expect(res.body.errors[0].message).toMatch(/row 5, column 'value'/);
  });

  it("a formula-like cell is never evaluated: refused in the value column, ignored in a label column", async () => {
    const inValue = await api("POST", `${q()}/baseline/preview`, { token: owner, body: { csv: "value\n70\n=1+1\n72", method: "naive" } });
    expect(inValue.status).toBe(422);
    expect(inValue.body.errors[0]).toMatchObject({ row: 3, column: "value" });
    const label = ["note,value", ...series.map((v, i) => `${i === 0 ? "=cmd|' /C calc'!A0" : "x"},${v}`)].join("\n");
    const inLabel = await api("POST", `${q()}/baseline/preview`, { token: owner, body: { csv: label, method: "naive", horizon: 3 } });
    expect(inLabel.status, inLabel.text).toBe(200);
    expect(inLabel.body.preview.ignoredColumns).toEqual(["note"]);
    expect(inLabel.body.stored).toBe(false);
  });

  it("names the option that is wrong: a missing value column, a season too long for the series", async () => {
    const col = await api("POST", `${q()}/baseline/preview`, { token: owner, body: { csv, valueColumn: "units" } });
    expect(col.status).toBe(422);
    expect(col.body.errors[0].field).toBe("valueColumn");
    const season = await api("POST", `${q()}/baseline/preview`, { token: owner, body: { csv, method: "seasonal-naive", season: 12 } });
    expect(season.status).toBe(422);
    expect(season.body.errors[0].field).toBe("season");
  });
});

describe("triangulation, outcome and the report", () => {
  let sd = 0;
  let rz: number[] = [];
  let rp: number[] = [];
  beforeAll(() => {
    // sd implied by naive's 80% interval at step 3; z and percentile of each answer and of the median 75.
    const [[s], z, p] = runR(`
      suppressMessages(library(forecast))
      f <- naive(${rVector(series)}, h = 3, level = c(80, 95))
      s <- (f$upper[3, 1] - f$lower[3, 1]) / (2 * qnorm(0.9))
      v <- c(${ANSWERS.join(", ")}, 75)
      out(s); out((v - f$mean[3]) / s); out(100 * pnorm((v - f$mean[3]) / s))
    `);
    sd = s;
    rz = z;
    rp = p;
  });

  it("blends the median 75 with the naive forecast 70 at equal weights: 72.5; departures equal R's", async () => {
    const res = await api("GET", `${q()}/triangulation`, { cookie: reviewerCookie });
    expect(res.status, res.text).toBe(200);
    const t = res.body;
    expect(t.panel.raw.figure).toBe(75);
    expect(t.panel.corrected.figure).toBe(75); // nobody has a track record yet
    // Pseudonyms only: an invitation id would match a pseudonym to a name without the audited reveal.
    expect(t.panel.answers.every((a: any) => !("invitationId" in a) && /^Panelist /.test(a.pseudonym))).toBe(true);
    expect(res.text).not.toMatch(/invitationId/);
    expect(t.weights.applied).toBe("equal");
    expect(t.blend.figure).toBeCloseTo(72.5, 12);
    expectClose([t.baseline.sd], [sd], 1e-9, "baseline sd");
    // Answers come by pseudonym; put them in the order of ANSWERS (ascending values) to compare.
    const byValue = [...t.departures.answers].sort((a: any, b: any) => a.value - b.value);
    expect(byValue.map((a: any) => a.value)).toEqual(ANSWERS);
    expectClose(byValue.map((a: any) => a.z), rz.slice(0, 5), 1e-9, "z");
    expectClose(byValue.map((a: any) => a.percentile), rp.slice(0, 5), 1e-9, "percentile");
    expectClose([t.departures.panel.rounds[0].z], [rz[5]], 1e-9, "panel z");
  });

  it("an organiser weight on the question changes the blend: 0.8·75 + 0.2·70 = 74", async () => {
    const set = await api("PUT", `${q()}/blend-rule`, { token: owner, body: { rule: "organiser", panelWeight: 0.8 } });
    expect(set.status, set.text).toBe(200);
    expect(set.body).toEqual({ rule: "organiser", panelWeight: 0.8, from: "question" });
    expect((await ok("GET", `${q()}/triangulation`, owner)).blend.figure).toBeCloseTo(74, 12);
    const missing = await api("PUT", `${q()}/blend-rule`, { token: owner, body: { rule: "organiser" } });
    expect(missing.status).toBe(422);
    expect(missing.body.errors[0].field).toBe("panelWeight");
    await ok("PUT", `${q()}/blend-rule`, owner, { rule: "panel" });
  });

  it("records the outcome once (scores: error = outcome − figure), refuses a second time, and corrects with an audited reason", async () => {
    const denied = await api("POST", `${q()}/outcome`, { cookie: reviewerCookie, body: { outcomeValue: 77 } });
    expect(denied.status).toBe(403);
    // The question's bounds are 0 to 1000: −100 is refused with the number named, and nothing is stored.
    const outside = await api("POST", `${q()}/outcome`, { token: owner, body: { outcomeValue: -100 } });
    expect(outside.status).toBe(422);
    expect(outside.body.errors[0]).toEqual({ field: "outcomeValue", message: "-100 is outside the question's bounds 0 to 1000" });
    const res = await api("POST", `${q()}/outcome`, { token: owner, body: { outcomeValue: 77, note: "sales ledger" } });
    expect(res.status, res.text).toBe(201);
    expect(res.body).toMatchObject({ outcomeValue: 77, note: "sales ledger", scores: { outcomeValue: 77, rawPanel: { forecast: 75, outcomeValue: 77 } } });
    expect(Number.isNaN(Date.parse(res.body.recordedAt))).toBe(false);
    expect(res.body.scores.rawPanel.error).toBe(2);
    expect(res.body.scores.baseline.error).toBeCloseTo(7, 9);
    expect(res.body.scores.blend.error).toBeCloseTo(4.5, 9);
    expect(res.body.scores.panelists.map((s: any) => s.error).sort((a: number, b: number) => a - b)).toEqual(ANSWERS.map((v) => 77 - v).sort((a, b) => a - b));
    const twice = await api("POST", `${q()}/outcome`, { token: owner, body: { outcomeValue: 76 } });
    expect(twice.status).toBe(409);
    expect(twice.body.type).toBe("/problems/outcome-recorded");
    const fix = await api("PATCH", `${q()}/outcome`, { token: owner, body: { outcomeValue: 78, reason: "a late return was booked twice" } });
    expect(fix.status, fix.text).toBe(200);
    expect(fix.body.scores.rawPanel.error).toBe(3);
    expect(fix.body.correctedAt).not.toBeNull();
    const audit = await ok<any[]>("GET", `/api/v1/panels/${panelId}/audit`, owner);
    const corrected = audit.find((e) => e.action === "outcome.corrected");
    expect(corrected.detail).toEqual({ questionId, from: 77, to: 78, reason: "a late return was booked twice" });
    const frozen = await api("PUT", `${q()}/baseline`, { token: owner, body: { csv, method: "drift", horizon: 3 } });
    expect(frozen.status).toBe(409);
  });

  it("the reviewer's report JSON: blend first, three legs, pseudonyms only, the outcome", async () => {
    const res = await api("GET", `${q()}/report.json`, { cookie: reviewerCookie });
    expect(res.status, res.text).toBe(200);
    const r = res.body;
    expect(Object.keys(r).indexOf("blend")).toBeLessThan(Object.keys(r).indexOf("legs"));
    expect(r.viewer).toEqual({ role: "reviewer", namesShown: false });
    expect(r.blend.figure).toBeCloseTo(72.5, 12);
    expect(r.blend.intervals.map((i: any) => i.level)).toEqual([80, 95]);
    expect(r.legs.panel.raw.figure).toBe(75);
    expect(r.legs.baseline).toMatchObject({ method: "naive", horizon: 3, observations: 12 });
    // While names are hidden, nothing per person from a track record (THREATS.md), only the panel's aggregate.
    expect(r.legs.trackRecord.panelists).toEqual([]);
    expect(r.biasCorrection).toEqual([]);
    expect(r.convergence.rounds.map((c: any) => c.median)).toEqual([75]);
    expect(r.departures.answers).toHaveLength(5);
    expect(r.outcome.outcomeValue).toBe(78);
    expect(r.cautions.join(" ")).toMatch(/do not make it|does not make/);
    expect(r.inputs.join(" ")).toMatch(/12 observations/);
    // The sentence the report leads with. By hand: naive forecast = the last observation, 70
    // (NIST series); panel median 75 (no track record yet: the question's own outcome is left out);
    // blend 0.5 × 75 + 0.5 × 70 = 72.5; (75 − 70) / 70 = 7.1% → "7% apart".
    expect(r.summary).toMatch(
      /^The blended figure for month 15 is 72\.5 units, with an 80% range of [\d.,]+ to [\d.,]+; the recorded outcome is 78 units; the main disagreement is between the panel's corrected figure \(75\) and the baseline's forecast \(70\): 7% apart, the panel above the baseline\.$/,
    );
  });

  it("names appear in the report only for the organiser, after revealing them (audited)", async () => {
    expect((await ok("GET", `${q()}/report.json`, owner)).viewer.namesShown).toBe(false);
    await ok("POST", `/api/v1/panels/${panelId}/reveal`, owner, { reason: "check the outcome" });
    const r = await ok("GET", `${q()}/report.json`, owner);
    expect(r.viewer.namesShown).toBe(true);
    expect(r.biasCorrection.map((b: any) => b.name).sort()).toEqual(["Expert 1", "Expert 2", "Expert 3", "Expert 4", "Expert 5"]);
    expect((await api("GET", `${q()}/report.json`, { cookie: reviewerCookie })).body.viewer.namesShown).toBe(false);
  });

  it("the report CSV: text/csv, formula-like cells neutralised", async () => {
    const res = await api("GET", `${q()}/report.csv`, { cookie: reviewerCookie });
    expect(res.status).toBe(200);
    expect(res.contentType).toContain("text/csv");
    const lines = res.text.trim().split("\r\n");
    expect(lines[0]).toBe("section,item,measure,value,unit");
    expect(res.text).toContain(`question,'=1+2: how many Plover-3 gauges in month 15?,unit,units,`);
    expect(lines.some((l) => l.startsWith("blend,blended figure,figure,72.5,units"))).toBe(true);
    const cells = lines.flatMap((l) => l.split(","));
    expect(cells.filter((c) => /^[=+@]/.test(c) || (/^-/.test(c) && !/^-\d+(\.\d+)?(e-?\d+)?$/.test(c)))).toEqual([]);
  });

  it("CSV numbers are rounded as the report shows them, the file is named after the titles, and the panel has one CSV of every question", async () => {
    const text = (await api("GET", `${q()}/report.csv`, { cookie: reviewerCookie })).text;
    const cell = (prefix: string) => text.split("\r\n").find((l) => l.startsWith(prefix))?.slice(prefix.length).split(",")[0];
    // Expected: R's forecast::naive on the same series, then signif(x, 4) (4 significant digits, as the page shows them).
    const [r] = runR(`
      suppressMessages(library(forecast))
      f <- naive(${rVector(series)}, h = 3, level = c(80, 95))
      out(signif(c(f$lower[3, 1], f$upper[3, 1], f$lower[3, 2], f$upper[3, 2]), 4))
    `);
    expect([cell("baseline,naive,80% lower,"), cell("baseline,naive,80% upper,"), cell("baseline,naive,95% lower,"), cell("baseline,naive,95% upper,")].map(Number)).toEqual(r);
    // No cell carries more digits than the page shows (the example was 7676.980381156674).
    const numbers = text.split(/[\r\n,]+/).filter((c) => /^-?\d+\.\d+$/.test(c));
    expect(numbers.length).toBeGreaterThan(5);
    for (const c of numbers) expect(c.replace(/^-?0\.0*/, "").replace(/^-/, "").replace(".", "").length, c).toBeLessThanOrEqual(4);
    // The outcome exactly as recorded.
    expect(text).toContain("\r\noutcome,outcome,value,78,units\r\n");

    const raw = await fetch(`${baseURL}${q()}/report.csv`, { headers: { cookie: reviewerCookie } });
    expect(raw.headers.get("content-disposition")).toBe('attachment; filename="plover-3-gauge-volumes-1-2-how-many-plover-3-gauges-in-month-15.csv"');

    const panelCsv = await fetch(`${baseURL}/api/v1/panels/${panelId}/report.csv`, { headers: { cookie: reviewerCookie } });
    expect(panelCsv.status).toBe(200);
    expect(panelCsv.headers.get("content-disposition")).toBe('attachment; filename="plover-3-gauge-volumes-report.csv"');
    const lines = (await panelCsv.text()).trimEnd().split("\r\n");
    expect(lines[0]).toBe("question,section,item,measure,value,unit");
    // One question: its report's rows, each after the question's number.
    expect(lines.slice(1).map((l) => l.replace(/^1,/, ""))).toEqual(text.trimEnd().split("\r\n").slice(1).map((l) => (l.includes("generated at") ? expect.any(String) : l)));
  });

  it("track records and the accuracy history derive from the stored outcome", async () => {
    const records = await ok<any[]>("GET", "/api/v1/track-records", owner);
    expect(records).toHaveLength(5);
    const byName = Object.fromEntries(records.map((r) => [r.name, r.record]));
    ANSWERS.forEach((v, i) => {
      const rec = byName[`Expert ${i + 1}`];
      expect(rec.count).toBe(1);
      // One question: mean log ratio ln(78/v); factor exp(1/(1 + 5) · ln(78/v)) (BIAS_PRIOR_STRENGTH 5).
      expect(rec.meanLogRatio).toBeCloseTo(Math.log(78 / v), 12);
      expect(rec.bias.factor).toBeCloseTo(Math.exp(Math.log(78 / v) / 6), 12);
      expect(rec.theil).toBeNull();
    });
    const h = await ok("GET", "/api/v1/accuracy-history", owner);
    expect(h.questions).toHaveLength(1);
    expect(h.questions[0]).toMatchObject({ outcomeValue: 78, rawPanel: 75 });
    expect(h.questions[0].blend).toBeCloseTo(72.5, 12);
    expect(h.history.n).toBe(1);
    expect(h.history.rawPanel.trackingSignal).toEqual([1]); // TS = 3 / |3|
    expect((await api("GET", "/api/v1/track-records", { cookie: reviewerCookie })).status).toBe(403);
  });
});
