/**
 * Performance weights over HTTP (issue 18, part 1; docs/methods.md §21): calibration questions
 * with true values given before and after the rounds, four panelists' 5th / 50th / 95th
 * percentiles, and the report's scores per pseudonym, both pools of the target question, the
 * out-of-sample verdict, and the performance-weighted pool as the panel leg of the blend.
 *
 * Expected values: R run in the test, from the published formulas (Cooke 1991, as docs/methods.md
 * §21 states them) — calibration 1 − F_χ²(3)(2N·I(s, p)) with `pchisq`, information
 * Σ p_k ln(p_k/(x_k − x_{k−1})) + ln(U* − L*) on the intrinsic range with the 10% overshoot, and
 * each pool's percentiles by inverting the weighted piecewise-linear CDFs (`approxfun` +
 * `uniroot`). People, questions and answers are invented (Quillmoor Instruments).
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { api, apiTokenFor, baseURL, clearDatabase, createAccount, signIn } from "./api-client";
import { classicalScoresInR } from "../helpers/classical-model-r";
import { expectClose, runR, rVector } from "../stats/rscript";

let owner = "";
let cookie = "";
let panelId = "";
let plainPanelId = "";
let calibrationIds: string[] = [];
let targetId = "";
let singleId = "";
const pseudonyms: string[] = [];

// True values, distinctive so that a leak to a panelist view would be found by text search.
const TRUE = [4173.5, 212.25, 3.4125];
// Each panelist's (P5, P50, P95) on the three calibration questions, then (P10, P50, P90) on the target.
const ANSWERS: [number, number, number][][] = [
  [[3500, 4200, 5000], [180, 210, 250], [2.5, 3.5, 4.5], [15000, 20000, 26000]], // well calibrated, narrow
  [[5000, 5200, 5400], [250, 260, 270], [5, 5.5, 6], [30000, 32000, 34000]], // overconfident and off
  [[1000, 4000, 12000], [50, 200, 600], [0.5, 3, 15], [5000, 22000, 60000]], // calibrated, wide
  [[3000, 3900, 4400], [190, 220, 240], [2, 3, 3.6], [12000, 18000, 25000]], // moderate
];

async function ok<T = any>(method: string, path: string, credentials: { token?: string; cookie?: string }, body?: unknown): Promise<T> {
  const res = await api(method, path, { ...credentials, body });
  if (res.status >= 300) throw new Error(`${method} ${path} → ${res.status}: ${res.text}`);
  return res.body as T;
}

const three = (text: string, unit: string, upper: number, extra: Record<string, unknown> = {}) => ({
  text,
  unit,
  targetPeriod: "2025",
  lowerBound: 0,
  upperBound: upper,
  answerFormat: "three-point",
  aggregation: "shared",
  ...extra,
});

beforeAll(async () => {
  const user = createAccount("Mara Quill");
  owner = await apiTokenFor(user);
  cookie = await signIn(user);
  const panel = await ok("POST", "/api/v1/panels", { token: owner }, {
    title: "Wren-2 first-year volume, with calibration questions",
    questions: [
      three("Wren-1 units shipped in its first quarter", "units", 20000, { calibration: true, trueValue: TRUE[0] }),
      three("Mean field battery life of a Wren-1 (days)", "days", 1000, { calibration: true }),
      three("Wren-1 warranty returns in 2025 (percent of units)", "%", 100, { calibration: true }),
      three("Wren-2 units sold in the first 12 months", "units", 200000),
      { ...three("Wren-2 resellers signed in year one", "resellers", 1000), answerFormat: "single" },
    ],
  });
  panelId = panel.id;
  calibrationIds = panel.questions.slice(0, 3).map((q: { id: string }) => q.id);
  targetId = panel.questions[3].id;
  singleId = panel.questions[4].id;
  expect(panel.questions.map((q: { calibration: boolean }) => q.calibration)).toEqual([true, true, true, false, false]);
  expect(panel.questions[0].trueValue).toBe(TRUE[0]);
  const members: { id: string }[] = [];
  for (let i = 0; i < ANSWERS.length; i++) members.push(await ok("POST", "/api/v1/roster", { token: owner }, { name: `Assessor ${i + 1}`, email: `assessor${i + 1}.${Date.now()}@example.com` }));
  const issued = await ok<any[]>("POST", `/api/v1/panels/${panelId}/invitations`, { token: owner }, { rosterMemberIds: members.map((m) => m.id) });
  await ok("POST", `/api/v1/panels/${panelId}/rounds/1/open`, { token: owner }, {});
  for (let i = 0; i < ANSWERS.length; i++) {
    const token = issued.find((x) => x.rosterMemberId === members[i].id).token;
    const view = await api("GET", "/api/v1/panelist/panel", { token });
    expect(view.status).toBe(200);
    pseudonyms.push(view.body.pseudonym);
    // The panelist sees which questions ask for P5 / P95, never a true value.
    expect(view.body.questions.map((q: { calibration: boolean }) => q.calibration)).toEqual([true, true, true, false, false]);
    for (const t of TRUE) expect(view.text).not.toContain(String(t));
    if (i === 0) {
      // Asked for the 5th and 95th percentiles on a calibration question.
      const missing = await api("POST", "/api/v1/panelist/answers", { token, body: { questionId: calibrationIds[0], value: 4200, high: 5000 } });
      expect(missing.status).toBe(422);
      expect(missing.body.errors.find((e: { field: string }) => e.field === "low").message).toMatch(/5th percentile/);
    }
    const qs = [...calibrationIds, targetId];
    for (let j = 0; j < qs.length; j++) {
      const [low, value, high] = ANSWERS[i][j];
      await ok("POST", "/api/v1/panelist/answers", { token }, { questionId: qs[j], value, low, high, rationale: "invented" });
    }
    await ok("POST", "/api/v1/panelist/answers", { token }, { questionId: singleId, value: 40 + i, rationale: "invented" });
  }
  await ok("POST", `/api/v1/panels/${panelId}/rounds/1/close`, { token: owner });
  // The other true values are given after the round.
  for (const j of [1, 2]) {
    const r = await ok("PUT", `/api/v1/panels/${panelId}/questions/${calibrationIds[j]}/true-value`, { token: owner }, { trueValue: TRUE[j] });
    expect(r).toEqual({ questionId: calibrationIds[j], trueValue: TRUE[j] });
  }
  // Nor in the feedback after the round.
  const token0 = issued.find((x) => x.rosterMemberId === members[0].id).token;
  const feedback = await api("GET", "/api/v1/panelist/feedback", { token: token0 });
  expect(feedback.status).toBe(200);
  for (const t of TRUE) expect(feedback.text).not.toContain(String(t));

  const plain = await ok("POST", "/api/v1/panels", { token: owner }, {
    title: "Wren-2 without calibration questions",
    questions: [three("Wren-2 units sold in the first 12 months", "units", 200000)],
  });
  plainPanelId = plain.id;
});
afterAll(() => clearDatabase());

describe("calibration questions: what is accepted", () => {
  it("a calibration question must be three-point with a shared quantity; only it has a true value", async () => {
    const single = await api("POST", `/api/v1/panels/${plainPanelId}/questions`, {
      token: owner,
      body: { ...three("Units?", "units", 10), answerFormat: "single", calibration: true },
    });
    expect(single.status).toBe(422);
    expect(single.body.errors[0]).toMatchObject({ field: "calibration" });
    const stray = await api("POST", `/api/v1/panels/${plainPanelId}/questions`, { token: owner, body: { ...three("Units?", "units", 10), trueValue: 5 } });
    expect(stray.status).toBe(422);
    expect(stray.body.errors[0]).toMatchObject({ field: "trueValue" });
    const target = await api("PUT", `/api/v1/panels/${panelId}/questions/${targetId}/true-value`, { token: owner, body: { trueValue: 5 } });
    expect(target.status).toBe(422);
    expect(target.body.errors[0]).toMatchObject({ field: "trueValue" });
    const text = await api("PUT", `/api/v1/panels/${panelId}/questions/${calibrationIds[0]}/true-value`, { token: owner, body: { trueValue: "4173.5" } });
    expect(text.status).toBe(422);
  });

  it("a calibration question takes a true value, not a baseline or an outcome", async () => {
    const q = `/api/v1/panels/${panelId}/questions/${calibrationIds[0]}`;
    const baseline = await api("PUT", `${q}/baseline`, { token: owner, body: { values: [1, 2, 3, 4, 5, 6], method: "naive" } });
    expect(baseline.status).toBe(409);
    expect(baseline.body.type).toBe("/problems/calibration-question");
    const outcome = await api("POST", `${q}/outcome`, { token: owner, body: { outcomeValue: 4173.5 } });
    expect(outcome.status).toBe(409);
    expect(outcome.body.type).toBe("/problems/calibration-question");
  });

  it("the panel leg is equal or performance, checked by the blend-rule schema", async () => {
    const bad = await api("PUT", `/api/v1/panels/${panelId}/blend-rule`, { token: owner, body: { rule: "equal", panelLeg: "best" } });
    expect(bad.status).toBe(422);
    expect(bad.body.errors[0]).toMatchObject({ field: "panelLeg" });
  });
});

describe("scores, pools and the out-of-sample comparison", () => {
  // R: each panelist's bins, calibration (pchisq) and information (10% overshoot), all four scored.
  let rCal: number[] = [];
  let rInf: number[] = [];
  let rEqual: number[] = [];
  beforeAll(() => {
    const lines = runR(`${classicalScoresInR(ANSWERS, TRUE)}
      A <- list(${ANSWERS.map((a) => rVector(a[3])).join(", ")})
      v <- unlist(A); L <- min(v); U <- max(v); Ls <- L - 0.1 * (U - L); Us <- U + 0.1 * (U - L)
      Fs <- lapply(A, function(a) approxfun(c(Ls, a, Us), c(0, 0.1, 0.5, 0.9, 1), rule = 2, ties = "ordered"))
      F <- function(x) mean(sapply(Fs, function(f) f(x)))
      out(sapply(c(0.05, 0.5, 0.95), function(q) uniroot(function(x) F(x) - q, c(Ls, Us), tol = 1e-10)$root))
    `);
    [rCal, rInf, rEqual] = lines;
  });

  it("each panelist's calibration and information score under their pseudonym equal R's computation of the formulas", async () => {
    const res = await api("GET", `/api/v1/panels/${panelId}/questions/${targetId}/report.json`, { token: owner });
    expect(res.status, res.text).toBe(200);
    const pw = res.body.performanceWeights;
    expect(pw.calibrationQuestions).toBe(3);
    expect(pw.counted).toBe(3);
    expect(pw.waiting).toBeNull();
    const byPseudonym = new Map(pw.panelists.map((p: any) => [p.pseudonym, p]));
    pseudonyms.forEach((name, e) => {
      const p: any = byPseudonym.get(name);
      expect(p.scored).toBe(true);
      expectClose([p.calibration], [rCal[e]], 1e-10, `calibration of ${name}`);
      expectClose([p.information], [rInf[e]], 1e-10, `information of ${name}`);
      expect(p.combined).toBeCloseTo(rCal[e] * rInf[e], 10);
    });
    // Panelists are listed by pseudonym only: no names, invitation ids or e-mails.
    expect(Object.keys(pw.panelists[0]).sort()).toEqual(["answered", "binCounts", "calibration", "combined", "information", "pseudonym", "scored", "weight"]);
    expect(res.text).not.toContain("Assessor");
  });

  it("the weights are ∝ calibration × information over the panelists kept, and both pools of the target question equal R's", async () => {
    const res = await api("GET", `/api/v1/panels/${panelId}/performance-weights`, { token: owner });
    expect(res.status, res.text).toBe(200);
    const r = res.body;
    const weights = pseudonyms.map((name) => r.panelists.find((p: any) => p.pseudonym === name).weight as number);
    expect(weights.reduce((a, b) => a + b, 0)).toBeCloseTo(1, 12);
    const kept = weights.map((w) => w > 0);
    const cutoff = r.pools.performance.cutoff;
    // Kept exactly when the calibration score reaches the cut-off (R's scores).
    rCal.forEach((c, e) => expect(kept[e]).toBe(c >= cutoff * (1 - 1e-9)));
    const sum = rCal.reduce((a, c, e) => a + (kept[e] ? c * rInf[e] : 0), 0);
    weights.forEach((w, e) => expect(w).toBeCloseTo(kept[e] ? (rCal[e] * rInf[e]) / sum : 0, 10));
    // The overconfident panelist (every true value below their 5th percentile: bins 3, 0, 0, 0, by hand) carries almost none.
    expect(r.panelists.find((p: any) => p.pseudonym === pseudonyms[1]).binCounts).toEqual([3, 0, 0, 0]);
    expect(weights[1]).toBeLessThan(0.01);

    const target = r.targets.find((t: any) => t.questionId === targetId);
    expect(target.answers).toBe(4);
    expectClose([target.equal.p5, target.equal.p50, target.equal.p95], rEqual, 1e-8, "equal-weight pool vs R");
    const [rPerf] = runR(`
      A <- list(${ANSWERS.map((a) => rVector(a[3])).join(", ")}); w <- ${rVector(weights)}
      v <- unlist(A); L <- min(v); U <- max(v); Ls <- L - 0.1 * (U - L); Us <- U + 0.1 * (U - L)
      Fs <- lapply(A, function(a) approxfun(c(Ls, a, Us), c(0, 0.1, 0.5, 0.9, 1), rule = 2, ties = "ordered"))
      F <- function(x) sum(w * sapply(Fs, function(f) f(x))) / sum(w)
      out(sapply(c(0.05, 0.5, 0.95), function(q) uniroot(function(x) F(x) - q, c(Ls, Us), tol = 1e-10)$root))
    `);
    expectClose([target.performance.p5, target.performance.p50, target.performance.p95], rPerf, 1e-8, "performance-weighted pool vs R");
    const single = r.targets.find((t: any) => t.questionId === singleId);
    expect(single.equal).toBeNull();
    expect(single.note).toMatch(/three-point/);
  });

  it("the out-of-sample comparison puts every true value in one bin and says in words whether weighting helped", async () => {
    const r = (await api("GET", `/api/v1/panels/${panelId}/performance-weights`, { token: owner })).body;
    const o = r.outOfSample;
    expect(o.questions).toBe(3);
    for (const pool of [o.equal, o.performance]) {
      expect(pool.binCounts.reduce((a: number, b: number) => a + b, 0)).toBe(3);
      expect(pool.combined).toBeCloseTo(pool.calibration * pool.information, 12);
    }
    expect(o.weightingHelped).toBe(o.performance.combined > o.equal.combined);
    expect(r.verdict).toMatch(o.weightingHelped ? /weighting helped on this panel\./ : /weighting (did not help|made no difference) on this panel/);
    expect(r.verdict).toMatch(/only 3 calibration questions/);
  });

  it("the report page shows the section with the pseudonyms and the verdict", async () => {
    const page = await fetch(`${baseURL}/reports/${panelId}`, { headers: { cookie } });
    expect(page.status).toBe(200);
    const html = await page.text();
    expect(html).toContain("Performance weights (calibration questions)");
    for (const name of pseudonyms) expect(html).toContain(`data-calibration-panelist="${name}"`);
    expect(html).toMatch(/data-weighting-verdict="(helped|did-not-help)"/);
  });
});

describe("the performance-weighted pool as the panel leg", () => {
  it("is equal by default; once chosen, the target question's panel figure is the pool's median", async () => {
    const before = await api("GET", `/api/v1/panels/${panelId}/questions/${targetId}/triangulation`, { token: owner });
    expect(before.body.panel.rule).toBe("three-point pool");
    expect(before.body.panel.raw.figure).toBe(21000); // median of 20000, 32000, 22000, 18000 (type 7, by hand)
    const set = await ok("PUT", `/api/v1/panels/${panelId}/blend-rule`, { token: owner }, { rule: "equal", panelLeg: "performance" });
    expect(set).toEqual({ rule: "equal", panelWeight: null, panelLeg: "performance" });
    const after = await api("GET", `/api/v1/panels/${panelId}/questions/${targetId}/triangulation`, { token: owner });
    expect(after.status, after.text).toBe(200);
    expect(after.body.panel.rule).toBe("performance-weighted pool");
    const r = (await api("GET", `/api/v1/panels/${panelId}/performance-weights`, { token: owner })).body;
    const target = r.targets.find((t: any) => t.questionId === targetId);
    expect(after.body.panel.raw.figure).toBeCloseTo(target.performance.p50, 8);
    // The rule is kept when the weight rule alone is changed.
    const again = await ok("PUT", `/api/v1/panels/${panelId}/blend-rule`, { token: owner }, { rule: "organiser", panelWeight: 0.6 });
    expect(again.panelLeg).toBe("performance");
    await ok("PUT", `/api/v1/panels/${panelId}/blend-rule`, { token: owner }, { rule: "equal", panelLeg: "equal" });
  });
});

describe("a panel without calibration questions", () => {
  it("has no performance-weights section in the report JSON or on the page", async () => {
    const plain = await ok("GET", `/api/v1/panels/${plainPanelId}`, { token: owner });
    const res = await api("GET", `/api/v1/panels/${plainPanelId}/questions/${plain.questions[0].id}/report.json`, { token: owner });
    expect(res.status, res.text).toBe(200);
    expect(res.body.performanceWeights).toBeNull();
    const page = await fetch(`${baseURL}/reports/${plainPanelId}`, { headers: { cookie } });
    expect(await page.text()).not.toContain("Performance weights");
  });
});
