/**
 * A practice set over HTTP (issue 18; docs/methods.md §21–§22; THREATS.md): a panel of three
 * calibration questions with their true values given, two panelists. While the round is open no
 * true value reaches a panelist (feedback JSON, feedback page, panelist page and view, record
 * page). Once it is closed each panelist's feedback shows, behind their own link, the true values,
 * which fell inside their P5–P95, and their own calibration and information scores: equal to the
 * organiser's report figures for their pseudonym and to R run in the test on the published
 * formulas (Cooke 1991, as docs/methods.md §21 states them: calibration 1 − F_χ²(3)(2N·I(s, p))
 * with `pchisq`, information Σ p_k ln(p_k/(x_k − x_{k−1})) + ln(U* − L*) on the intrinsic range
 * with the 10% overshoot). The other panelist's answers, pseudonym and scores are absent. Panels
 * with a target question or a missing true value have no practice result. People, questions and
 * answers are invented (Quillmoor Instruments).
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { api, apiTokenFor, baseURL, clearDatabase, createAccount } from "./api-client";
import { classicalScoresInR } from "../helpers/classical-model-r";
import { expectClose, runR } from "../stats/rscript";

let owner = "";
let panelId = "";
let questionIds: string[] = [];
const tokens: string[] = [];
const pseudonyms: string[] = [];

// True values and answers, distinctive so that a leak is found by text search.
const TRUE = [1843.75, 61.375, 7.0625];
// (P5, P50, P95) per panelist per question.
const ANSWERS: [number, number, number][][] = [
  [[1500.125, 1800.125, 2300.125], [40.125, 55.125, 70.125], [5.1875, 6.625, 9.3125]], // every true value inside (by hand: 3 of 3)
  [[2101.375, 2250.5, 2400.875], [30.625, 35.5, 41.875], [6.4375, 7.25, 7.8125]], // below P5, above P95, inside (by hand: 1 of 3)
];
const HITS = [3, 1]; // by hand from the answers above

async function ok<T = any>(method: string, path: string, token: string, body?: unknown): Promise<T> {
  const res = await api(method, path, { token, body });
  if (res.status >= 300) throw new Error(`${method} ${path} → ${res.status}: ${res.text}`);
  return res.body as T;
}

const calibration = (text: string, unit: string, trueValue: number | undefined, extra: Record<string, unknown> = {}) => ({
  text,
  unit,
  targetPeriod: "2025",
  lowerBound: 0,
  upperBound: 100000,
  answerFormat: "three-point",
  aggregation: "shared",
  calibration: true,
  ...(trueValue === undefined ? {} : { trueValue }),
  ...extra,
});

async function invite(id: string, count: number): Promise<string[]> {
  const members: { id: string }[] = [];
  for (let i = 0; i < count; i++) members.push(await ok("POST", "/api/v1/roster", owner, { name: `Practice Assessor ${id.slice(-4)} ${i + 1}`, email: `practice${i + 1}.${id}@example.com` }));
  const issued = await ok<any[]>("POST", `/api/v1/panels/${id}/invitations`, owner, { rosterMemberIds: members.map((m) => m.id) });
  return members.map((m) => issued.find((x) => x.rosterMemberId === m.id).token);
}

async function answer(token: string, questionId: string, [low, value, high]: number[]) {
  await ok("POST", "/api/v1/panelist/answers", token, { questionId, low, value, high, rationale: "invented" });
}

/** Every text a panelist can reach through their link. */
async function panelistViews(token: string): Promise<string[]> {
  const texts: string[] = [];
  for (const path of ["/api/v1/panelist/panel", "/api/v1/panelist/feedback"]) {
    const res = await api("GET", path, { token });
    expect(res.status, res.text).toBe(200);
    texts.push(res.text);
  }
  for (const page of ["", "/feedback", "/record"]) {
    const res = await fetch(`${baseURL}/p/${token}${page}`);
    expect(res.status).toBe(200);
    texts.push(await res.text());
  }
  return texts;
}

beforeAll(async () => {
  owner = await apiTokenFor(createAccount("Hester Lowmoor"));
  const panel = await ok("POST", "/api/v1/panels", owner, {
    title: "Practice: Quillmoor figures known in advance",
    questions: [
      calibration("Wren-1 units shipped in 2024", "units", TRUE[0]),
      calibration("Quillmoor service engineers at the end of 2024", "engineers", TRUE[1]),
      calibration("Wren-1 mean repair time in 2024 (days)", "days", TRUE[2]),
    ],
  });
  panelId = panel.id;
  questionIds = panel.questions.map((q: { id: string }) => q.id);
  tokens.push(...(await invite(panelId, 2)));
  await ok("POST", `/api/v1/panels/${panelId}/rounds/1/open`, owner, {});
  for (let i = 0; i < 2; i++) {
    pseudonyms.push((await ok("GET", "/api/v1/panelist/panel", tokens[i])).pseudonym);
    for (let j = 0; j < 3; j++) await answer(tokens[i], questionIds[j], ANSWERS[i][j]);
  }
  expect(new Set(pseudonyms).size).toBe(2);
});
afterAll(() => clearDatabase());

describe("a practice set", () => {
  it("while its round is open, no true value reaches a panelist", async () => {
    for (const token of tokens) {
      const feedback = await ok("GET", "/api/v1/panelist/feedback", token);
      expect(feedback.practice).toBeNull();
      for (const text of await panelistViews(token)) {
        for (const t of TRUE) expect(text).not.toContain(String(t));
        expect(text).not.toContain('data-section="practice"');
      }
    }
  });

  describe("once its round is closed", () => {
    let rCal: number[] = [];
    let rInf: number[] = [];
    let report: any;
    beforeAll(async () => {
      await ok("POST", `/api/v1/panels/${panelId}/rounds/1/close`, owner);
      report = await ok("GET", `/api/v1/panels/${panelId}/performance-weights`, owner);
      // R: each panelist's bins, calibration (pchisq, 3 degrees of freedom) and information (10% overshoot).
      [rCal, rInf] = runR(classicalScoresInR(ANSWERS, TRUE));
    });

    it("each panelist sees the true values, which fell inside their P5–P95, and their own scores: the organiser's figures for their pseudonym and R's", async () => {
      for (let i = 0; i < 2; i++) {
        const { practice } = await ok("GET", "/api/v1/panelist/feedback", tokens[i]);
        expect(practice).not.toBeNull();
        expect(practice.questions.map((q: any) => q.trueValue)).toEqual(TRUE);
        expect(practice.questions.map((q: any) => q.myAnswer)).toEqual(ANSWERS[i].map(([low, value, high]) => ({ low, value, high })));
        // Inside [P5, P95], by hand from the answers.
        expect(practice.questions.map((q: any) => q.inside)).toEqual(i === 0 ? [true, true, true] : [false, false, true]);
        expect(practice.hits).toEqual({ count: 3, hits: HITS[i], rate: HITS[i] / 3, nominal: 0.9 });
        expect(practice.sentence).toContain(`${HITS[i]} of 3 true values fell inside your 90% ranges`);
        // Bins by hand: panelist 1 all between P50 and P95; panelist 2 one below P5, one between P5 and P50, one above P95.
        expect(practice.binCounts).toEqual(i === 0 ? [0, 0, 3, 0] : [1, 1, 0, 1]);

        const theirs = report.panelists.find((p: any) => p.pseudonym === pseudonyms[i]);
        expect(practice.scored).toBe(true);
        expect(practice.calibration).toBe(theirs.calibration);
        expect(practice.information).toBe(theirs.information);
        expect(practice.binCounts).toEqual(theirs.binCounts);
        expectClose([practice.calibration], [rCal[i]], 1e-10, `calibration of panelist ${i + 1} vs R`);
        expectClose([practice.information], [rInf[i]], 1e-10, `information of panelist ${i + 1} vs R`);
        expect(practice.sentence).toContain(`calibration score is ${rCal[i].toPrecision(2)}`);

        // The page shows the same figures and the true values.
        const html = await (await fetch(`${baseURL}/p/${tokens[i]}/feedback`)).text();
        expect(html).toContain('data-section="practice"');
        expect(html).toContain(`data-stat="practice-calibration" data-value="${practice.calibration}"`);
        expect(html).toContain(`data-stat="practice-information" data-value="${practice.information}"`);
        for (const t of TRUE) expect(html).toContain(`data-stat="practice-true-value" data-value="${t}"`);
      }
    });

    it("the other panelist's answers, pseudonym and scores are absent", async () => {
      for (let i = 0; i < 2; i++) {
        const other = 1 - i;
        const feedback = await api("GET", "/api/v1/panelist/feedback", { token: tokens[i] });
        const practice = JSON.stringify(feedback.body.practice);
        // The practice section holds none of the other's figures (their P50s are in the group's anonymous feedback, as on every panel).
        for (const a of ANSWERS[other]) for (const v of a) expect(practice).not.toContain(String(v));
        const page = await (await fetch(`${baseURL}/p/${tokens[i]}/feedback`)).text();
        for (const text of [feedback.text, page]) {
          // Their 5th and 95th percentiles, their pseudonym and their scores appear nowhere.
          for (const a of ANSWERS[other]) for (const v of [a[0], a[2]]) expect(text).not.toContain(String(v));
          expect(text).not.toContain(pseudonyms[other]);
          expect(text).not.toContain(String(rCal[other]).slice(0, 10));
          expect(text).not.toContain(String(rInf[other]).slice(0, 10));
          expect(text).not.toContain("Practice Assessor");
        }
      }
    });

    it("when a further round is started the result is withdrawn until that round closes too", async () => {
      const p = await ok("POST", "/api/v1/panels", owner, { title: "Practice run twice", questions: [calibration("Wren-1 units shipped in 2024", "units", TRUE[0])] });
      const [token] = await invite(p.id, 1);
      await ok("POST", `/api/v1/panels/${p.id}/rounds/1/open`, owner, {});
      await answer(token, p.questions[0].id, ANSWERS[0][0]);
      await ok("POST", `/api/v1/panels/${p.id}/rounds/1/close`, owner);
      expect((await ok("GET", "/api/v1/panelist/feedback", token)).practice.questions[0].trueValue).toBe(TRUE[0]);
      for (const body of [{}, null]) {
        // A draft round 2, then the same round opened: answers can still change, so no true value.
        if (body) await ok("POST", `/api/v1/panels/${p.id}/rounds`, owner, body);
        else await ok("POST", `/api/v1/panels/${p.id}/rounds/2/open`, owner, {});
        expect((await ok("GET", "/api/v1/panelist/feedback", token)).practice).toBeNull();
        for (const text of await panelistViews(token)) expect(text).not.toContain('data-section="practice"');
        const page = await (await fetch(`${baseURL}/p/${token}/feedback`)).text();
        expect(page).not.toContain(`data-value="${TRUE[0]}"`);
      }
      await ok("POST", `/api/v1/panels/${p.id}/rounds/2/close`, owner);
      expect((await ok("GET", "/api/v1/panelist/feedback", token)).practice.questions[0].trueValue).toBe(TRUE[0]);
    });

    it("a panel with a question that is not a calibration question, or a true value missing, has no practice result", async () => {
      const mixed = await ok("POST", "/api/v1/panels", owner, {
        title: "Wren-2 volume with one calibration question",
        questions: [calibration("Wren-1 units shipped in 2024", "units", TRUE[0]), { ...calibration("Wren-2 units in year one", "units", undefined), calibration: false }],
      });
      const missing = await ok("POST", "/api/v1/panels", owner, {
        title: "Practice with a true value not given",
        questions: [calibration("Wren-1 units shipped in 2024", "units", TRUE[0]), calibration("Wren-1 repair time (days)", "days", undefined)],
      });
      for (const p of [mixed, missing]) {
        const [token] = await invite(p.id, 1);
        await ok("POST", `/api/v1/panels/${p.id}/rounds/1/open`, owner, {});
        await answer(token, p.questions[0].id, ANSWERS[0][0]);
        await answer(token, p.questions[1].id, [100, 200, 300]);
        await ok("POST", `/api/v1/panels/${p.id}/rounds/1/close`, owner);
        const feedback = await ok("GET", "/api/v1/panelist/feedback", token);
        expect(feedback.round).toBe(1);
        expect(feedback.practice).toBeNull();
        const html = await (await fetch(`${baseURL}/p/${token}/feedback`)).text();
        expect(html).not.toContain('data-section="practice"');
        expect(html).not.toContain(`data-value="${TRUE[0]}"`);
      }
    });
  });
});
