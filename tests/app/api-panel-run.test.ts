/**
 * A whole Delphi panel run by a script over HTTP with an organiser's personal API token, five
 * panelists answering with their invitation tokens (issue 3, "A script with an organiser's API
 * token can run a whole panel").
 *
 * Every statistic is checked against R (Rscript, outside this project): quantile(type = 7),
 * median, IQR, mean, sd, min, max and sum on the same answers; the stopping-rule numbers are
 * the relative changes of R's medians / IQRs / totals and R's sd / mean.
 * The scenario is invented (Quillmoor Instruments, Wren-2 sensor); people use example.com.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { expectClose, runR, rVector } from "../stats/rscript";
import { api, apiTokenFor, clearDatabase, createAccount, sql } from "./api-client";

/** Final answers per panelist (index) per round. Q1 single shared; Q2 three-point shared; Q3 sum of parts. */
const R1 = {
  q1: [2100, 2600, 3300, 4000, 7200],
  q2: [
    [1500, 2000, 3000],
    [2000, 2800, 3600],
    [2500, 3100, 4500],
    [1800, 3500, 5000],
    [4000, 6000, 9000],
  ],
  q3: [800, 1200, 650, 900, 1500],
};
const R2 = {
  q1: [2500, 2700, 3200, 3800, 5600],
  q2: [
    [2000, 2600, 3400],
    [2200, 2900, 3600],
    [2500, 3100, 4200],
    [2300, 3300, 4600],
    [3500, 4800, 7000],
  ],
  q3: [850, 1150, 700, 900, 1400],
};
const NAMES = ["Ilse Brannock", "Jonah Peverell", "Keiko Lindahl", "Lucas Ombre", "Marisol Teague"];

/** R's round statistics of a sample: n, mean, sd, cv, min, max, q1, median, q3, iqr, relative iqr. */
function rSummary(x: readonly number[]): number[] {
  return runR(`
    x <- ${rVector(x)}
    q <- quantile(x, c(0.25, 0.5, 0.75), type = 7, names = FALSE)
    out(c(length(x), mean(x), sd(x), sd(x) / mean(x), min(x), max(x), q[1], median(x), q[3], IQR(x), IQR(x) / abs(median(x))))
  `)[0];
}
const figures = (s: any) => [s.n, s.mean, s.sd, s.cv, s.min, s.max, s.q1, s.median, s.q3, s.iqr, s.relativeIqr];

let org = "";
let panelId = "";
let qIds: string[] = [];
let tokens: string[] = [];
let memberIds: string[] = [];
const emails = NAMES.map((n) => `${n.toLowerCase().replace(" ", ".")}@example.com`);

async function answer(i: number, body: Record<string, unknown>, headers: Record<string, string> = {}) {
  return api("POST", "/api/v1/panelist/answers", { token: tokens[i], body, headers });
}

async function answerRound(data: typeof R1) {
  for (let i = 0; i < 5; i++) {
    const rationale = `Panelist reasoning ${i + 1}: local channel data.`;
    expect((await answer(i, { questionId: qIds[0], value: data.q1[i], rationale })).status).toBe(201);
    const [low, value, high] = data.q2[i];
    expect((await answer(i, { questionId: qIds[1], low, value, high, rationale })).status).toBe(201);
    expect((await answer(i, { questionId: qIds[2], value: data.q3[i] })).status).toBe(201);
  }
}

beforeAll(async () => {
  org = await apiTokenFor(createAccount("Runa Castell"));
});
afterAll(() => clearDatabase());

describe("a panel run by script with an API token", () => {
  it("creates the panel with its questions, default rules and round 1 as a draft", async () => {
    const res = await api("POST", "/api/v1/panels", {
      token: org,
      body: {
        title: "Year-one unit sales of the Wren-2 (script)",
        questions: [
          { text: "Units sold in year one?", unit: "units", targetPeriod: "first 12 months", lowerBound: 100, upperBound: 100000, answerFormat: "single", aggregation: "shared" },
          { text: "Units sold in year one (range)?", unit: "units", targetPeriod: "first 12 months", lowerBound: 0, upperBound: 50000, answerFormat: "three-point", aggregation: "shared" },
          { text: "Units your territory sells?", unit: "units", targetPeriod: "first 12 months", lowerBound: 0, upperBound: 20000, answerFormat: "single", aggregation: "sum-of-parts" },
        ],
      },
    });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ status: "draft", role: "owner", consensusMeasure: "relative-iqr", consensusThreshold: 0.25, stabilityThreshold: 0.15, roundLimit: 3 });
    expect(res.body.rounds).toEqual([{ number: 1, status: "draft", deadline: null, openedAt: null, closedAt: null }]);
    panelId = res.body.id;
    qIds = res.body.questions.map((q: { id: string }) => q.id);
    expect(qIds).toHaveLength(3);
  });

  it("puts five people on the roster and invites them; each token is 256 bits of base64url", async () => {
    for (let i = 0; i < 5; i++) {
      const res = await api("POST", "/api/v1/roster", { token: org, body: { name: NAMES[i], email: emails[i], group: i < 2 ? "sales" : "engineering" } });
      expect(res.status).toBe(201);
      memberIds.push(res.body.id);
    }
    const dup = await api("POST", "/api/v1/roster", { token: org, body: { name: "Again", email: emails[0] } });
    expect(dup.status).toBe(409);
    // Problem types: lib/problem-types.ts (RFC 9457 §3.1.1), one per conflict kind.
    expect(dup.body.type).toBe("/problems/duplicate-roster-member");
    const inv = await api("POST", `/api/v1/panels/${panelId}/invitations`, { token: org, body: { rosterMemberIds: memberIds } });
    expect(inv.status).toBe(201);
    expect(inv.body).toHaveLength(5);
    tokens = memberIds.map((id) => inv.body.find((i: { rosterMemberId: string }) => i.rosterMemberId === id).token);
    for (const t of tokens) expect(t).toMatch(/^[A-Za-z0-9_-]{43}$/);
    expect(inv.body[0].link).toBe(`/p/${inv.body[0].token}`);
    const list = await api("GET", `/api/v1/panels/${panelId}/invitations`, { token: org });
    expect(list.body.map((i: { status: string }) => i.status)).toEqual(["active", "active", "active", "active", "active"]);
    expect(list.text).not.toContain("Panelist ");
    expect(list.text).not.toContain(tokens[0]);
    // Only the digest is stored.
    const rows = await sql<{ tokenHash: string }>(`SELECT "tokenHash" FROM "Invitation" WHERE "panelId" = ?`, [panelId]);
    expect(rows.map((r) => r.tokenHash).some((h) => tokens.includes(h))).toBe(false);
    expect(rows[0].tokenHash).toMatch(/^[0-9a-f]{64}$/);
  });

  it("refuses answers before round 1 opens (409, says so)", async () => {
    const res = await answer(0, { questionId: qIds[0], value: 2000 });
    expect(res.status).toBe(409);
    expect(res.contentType).toContain("application/problem+json");
    expect(res.body.detail).toMatch(/Round 1 has not opened yet/);
    expect(res.body.type).toBe("/problems/round-not-open");
  });

  it("opens round 1 and the panel starts running", async () => {
    const res = await api("POST", `/api/v1/panels/${panelId}/rounds/1/open`, { token: org, body: {} });
    expect(res.status).toBe(200);
    expect(res.body.status).toBe("open");
    expect((await api("GET", `/api/v1/panels/${panelId}`, { token: org })).body.status).toBe("running");
  });

  it("refuses malformed, out-of-bounds and disordered answers, naming the field, and stores nothing", async () => {
    const cases: [Record<string, unknown>, string, RegExp][] = [
      [{ questionId: qIds[0], value: "many" }, "value", /number/i],
      [{ questionId: qIds[0], value: 50 }, "value", /between 100 and 100000 units/],
      [{ questionId: qIds[0], value: 2000, low: 1000 }, "low", /single value/],
      [{ questionId: qIds[1], value: 3000, low: 3500, high: 4000 }, "low", /not be above the median estimate/],
      [{ questionId: qIds[1], value: 3000, low: 2000 }, "high", /needs a high value/],
      [{ questionId: qIds[1], value: 3000, low: 2000, high: 60000 }, "high", /between 0 and 50000/],
      [{ questionId: "no-such-question", value: 3000 }, "questionId", /no such question/],
    ];
    for (const [body, field, message] of cases) {
      const res = await answer(0, body);
      expect(res.status, JSON.stringify(body)).toBe(422);
      expect(res.contentType).toContain("application/problem+json");
      const err = res.body.errors.find((e: { field: string }) => e.field === field);
      expect(err, `${field} in ${res.text}`).toBeDefined();
      expect(err.message).toMatch(message);
    }
    const notJson = await answer(0, "{not json" as unknown as Record<string, unknown>);
    expect(notJson.status).toBe(400);
    const mine = await api("GET", "/api/v1/panelist/panel", { token: tokens[0] });
    expect(mine.body.questions.every((q: { answer: unknown }) => q.answer === null)).toBe(true);
  });

  it("keeps every change as a version and replays a retried request by its Idempotency-Key", async () => {
    const first = await answer(0, { questionId: qIds[0], value: 1900, rationale: "first thought" }, { "idempotency-key": "retry-1" });
    expect(first.status).toBe(201);
    expect(first.body).toMatchObject({ replayed: false, answer: { version: 1, value: 1900, roundNumber: 1 } });
    const retry = await answer(0, { questionId: qIds[0], value: 1900, rationale: "first thought" }, { "idempotency-key": "retry-1" });
    expect(retry.status).toBe(200);
    expect(retry.body).toEqual({ replayed: true, answer: first.body.answer });
    const misuse = await answer(0, { questionId: qIds[0], value: 1950 }, { "idempotency-key": "retry-1" });
    expect(misuse.status).toBe(409);
    expect(misuse.body.type).toBe("/problems/idempotency-key-reused");
    const second = await answer(0, { questionId: qIds[0], value: 2000 });
    expect(second.body.answer.version).toBe(2);
    const view = await api("GET", "/api/v1/panelist/panel", { token: tokens[0] });
    const q = view.body.questions.find((x: { id: string }) => x.id === qIds[0]);
    expect(q.versions.map((v: { value: number }) => v.value)).toEqual([1900, 2000]);
    expect(q.answer.version).toBe(2);
  });

  it("shows live progress under pseudonyms only", async () => {
    await answerRound(R1); // panelist 1 gives a third version (2100), the final one
    const res = await api("GET", `/api/v1/panels/${panelId}/progress`, { token: org });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ questionCount: 3, invited: 5, answeredAll: 5, answeredSome: 5 });
    const pseudonyms: string[] = res.body.panelists.map((p: { pseudonym: string }) => p.pseudonym);
    expect(new Set(pseudonyms).size).toBe(5);
    for (const p of pseudonyms) expect(p).toMatch(/^Panelist [A-HJ-NP-Z2-9]{3}$/);
    expect(pseudonyms).toEqual([...pseudonyms].sort()); // listed by pseudonym, not in the order of invitation
    for (const n of [...NAMES, ...emails, ...memberIds]) expect(res.text).not.toContain(n);
  });

  it("closes round 1; its statistics equal R's", async () => {
    const close = await api("POST", `/api/v1/panels/${panelId}/rounds/1/close`, { token: org });
    expect(close.status).toBe(200);
    expect(close.body.status).toBe("closed");
    const again = await api("POST", `/api/v1/panels/${panelId}/rounds/1/close`, { token: org });
    expect(again.status).toBe(409);
    expect(again.body.type).toBe("/problems/round-not-open");
    const res = await api("GET", `/api/v1/panels/${panelId}/rounds/1/statistics`, { token: org });
    expect(res.status).toBe(200);
    const [s1, s2, s3] = res.body.questions;
    expectClose(figures(s1.values), rSummary(R1.q1), 1e-12, "round 1 Q1 vs R");
    expectClose(figures(s2.values), rSummary(R1.q2.map((a) => a[1])), 1e-12, "round 1 Q2 median estimates (P50) vs R");
    expectClose(figures(s2.lows), rSummary(R1.q2.map((a) => a[0])), 1e-12, "round 1 Q2 lows vs R");
    expectClose(figures(s2.highs), rSummary(R1.q2.map((a) => a[2])), 1e-12, "round 1 Q2 highs vs R");
    expect(s2.pooled.p10).toBeLessThan(s2.pooled.p50);
    expect(s2.pooled.p50).toBeLessThan(s2.pooled.p90);
    const [[total]] = runR(`out(sum(${rVector(R1.q3)}))`);
    expect(s3.sumOfParts.total).toBe(total);
    expect(s3.sumOfParts.parts.map((p: { value: number }) => p.value)).toEqual([...R1.q3].sort((a, b) => b - a));
  });

  it("refuses a late answer with a clear message", async () => {
    const res = await answer(2, { questionId: qIds[0], value: 3000 });
    expect(res.status).toBe(409);
    // A plain date and time (lib/ui/format.ts formatDateTime), not an ISO timestamp.
    expect(res.body.detail).toMatch(/^Round 1 closed on \d{1,2} [A-Z][a-z]{2} \d{4}, \d{2}:\d{2} UTC; answers are no longer accepted/);
    expect(res.body.type).toBe("/problems/round-closed");
  });

  it("gives each panelist feedback matching R, with their own answer and nobody else's identity", async () => {
    const [q1, med, q3] = runR(`x <- ${rVector(R1.q1)}; out(quantile(x, c(0.25, 0.5, 0.75), type = 7, names = FALSE))`)[0];
    const b = await api("GET", "/api/v1/panelist/feedback", { token: tokens[1] });
    expect(b.status).toBe(200);
    expect(b.body.round).toBe(1);
    const f = b.body.questions[0];
    expect([f.q1, f.median, f.q3]).toEqual([q1, med, q3]);
    // The spread goes as histogram bins, not every value: counts and breaks from R's hist() with Sturges' bin count.
    const [counts, breaks] = runR(`x <- ${rVector(R1.q1)}; r <- hist(x, breaks = seq(min(x), max(x), length.out = nclass.Sturges(x) + 1), plot = FALSE); out(r$counts); out(r$breaks)`);
    expect(f.histogram.map((h: { count: number }) => h.count)).toEqual(counts);
    expectClose([f.histogram[0].lower, ...f.histogram.map((h: { upper: number }) => h.upper)], breaks, 1e-14, "feedback histogram breaks vs R");
    expect(f.myAnswer).toEqual({ value: 2600, low: null, high: null });
    expect(f.myPosition).toBe("within-iqr"); // 2600 equals Q1: not below it
    expect(f.explanationRequested).toBe(false);
    expect(f.rationales).toHaveLength(5);
    expect(f.rationaleCount).toBe(5);
    expect(f.rationales.map((r: { value: number }) => r.value)).toEqual([...R1.q1].sort((x, y) => x - y));
    const reveal = await api("POST", `/api/v1/panels/${panelId}/reveal`, { token: org, body: { reason: "test of feedback anonymity" } });
    const pseudonyms = reveal.body.map((r: { pseudonym: string }) => r.pseudonym);
    const invitations = (await api("GET", `/api/v1/panels/${panelId}/invitations`, { token: org })).body.map((i: { id: string }) => i.id);
    const panel = await api("GET", "/api/v1/panelist/panel", { token: tokens[1] });
    for (const text of [b.text, panel.text]) {
      for (const secret of [...NAMES, ...emails, ...memberIds, ...invitations, ...pseudonyms.filter((p: string) => p !== panel.body.pseudonym)]) {
        expect(text).not.toContain(secret);
      }
    }
    const e = await api("GET", "/api/v1/panelist/feedback", { token: tokens[4] });
    expect(e.body.questions[0].myPosition).toBe("above-iqr");
    expect(e.body.questions[0].explanationRequested).toBe(true);
  });

  it("round 2: those outside round 1's IQR must give a rationale", async () => {
    const next = await api("POST", `/api/v1/panels/${panelId}/rounds`, { token: org, body: { open: true } });
    expect(next.status).toBe(201);
    expect(next.body).toMatchObject({ number: 2, status: "open" });
    const view = await api("GET", "/api/v1/panelist/panel", { token: tokens[4] });
    expect(view.body.round.number).toBe(2);
    const byId = (id: string) => view.body.questions.find((q: { id: string }) => q.id === id);
    expect(byId(qIds[0]).rationaleRequired).toBe(true); // 7200 > Q3 = 4000
    expect(byId(qIds[0]).rationaleReason).toMatch(/above the group's upper quartile \(4000\)/);
    expect(byId(qIds[2]).rationaleRequired).toBe(false); // sum of parts: not applicable
    const middle = await api("GET", "/api/v1/panelist/panel", { token: tokens[2] });
    expect(middle.body.questions.some((q: { rationaleRequired: boolean }) => q.rationaleRequired)).toBe(false);
    const missing = await answer(4, { questionId: qIds[0], value: 5600 });
    expect(missing.status).toBe(422);
    expect(missing.body.errors[0].field).toBe("rationale");
    await answerRound(R2);
    expect((await api("POST", `/api/v1/panels/${panelId}/rounds/2/close`, { token: org })).status).toBe(200);
  });

  it("convergence: per-round figures and stopping-rule numbers equal those from R", async () => {
    const res = await api("GET", `/api/v1/panels/${panelId}/convergence`, { token: org });
    expect(res.status).toBe(200);
    const [a1, a2] = [rSummary(R1.q1), rSummary(R2.q1)];
    const q = res.body.questions[0];
    expect(q.rounds.map((r: { median: number }) => r.median)).toEqual([a1[7], a2[7]]);
    expect(q.rounds.map((r: { iqr: number }) => r.iqr)).toEqual([a1[9], a2[9]]);
    const ev = res.body.evaluation;
    expect(ev.roundNumber).toBe(2);
    const v1 = ev.questions[0];
    // Default consensus measure: relative IQR ≤ 0.25 (lib/stats/stopping-rules.ts, project convention).
    expect(v1.consensus.value).toBeCloseTo(a2[10], 12);
    expect(v1.consensus.met).toBe(a2[10] <= 0.25);
    expect(v1.stability.medianChange).toBeCloseTo(Math.abs(a2[7] - a1[7]) / a1[7], 12);
    expect(v1.stability.iqrChange).toBeCloseTo(Math.abs(a2[9] - a1[9]) / a1[9], 12);
    // Stability: share of panelists changing class between round 1's type-7 quartiles (after Scheibe, Skutsch & Schofer 1975), by R.
    const [[d1]] = runR(`a <- ${rVector(R1.q1)}; b <- ${rVector(R2.q1)}; q <- quantile(a, c(0.25, 0.5, 0.75), type = 7)
      sh <- function(x) tabulate(findInterval(x, q, left.open = TRUE) + 1, 4) / length(x)
      out(0.5 * sum(abs(sh(b) - sh(a))))`);
    expect(v1.stability.distributionChange).toBeCloseTo(d1, 12);
    expect(v1.stability.met).toBe(d1 <= 0.15);
    const [[t1, t2]] = runR(`out(c(sum(${rVector(R1.q3)}), sum(${rVector(R2.q3)})))`);
    const v3 = ev.questions[2];
    expect(v3.consensus.applicable).toBe(false);
    expect(v3.stability.totalChange).toBeCloseTo(Math.abs(t2 - t1) / t1, 12);
    // The tables give no CV or relative IQR where the verdict calls consensus not applicable.
    expect(res.body.questions[2].rounds.every((r: { cv: number | null; relativeIqr: number | null }) => r.cv === null && r.relativeIqr === null)).toBe(true);
    expect(ev.roundLimit).toEqual({ limit: 3, roundNumber: 2, met: false });
    // Stability alone settles a question; consensus never does on its own (Dajani et al. 1979; von der Gracht 2012).
    const settled = ev.questions.map((x: { stability: { met: boolean } }) => x.stability.met);
    expect(ev.questions.map((x: { settled: boolean }) => x.settled)).toEqual(settled);
    expect(ev.recommendation).toBe(settled.every(Boolean) ? "stop" : "another-round");
  });

  it("revealing identities is logged; revoking and re-issuing links work at once", async () => {
    const audit = await api("GET", `/api/v1/panels/${panelId}/audit`, { token: org });
    const actions = audit.body.map((e: { action: string }) => e.action);
    expect(actions).toContain("identities.revealed");
    expect(actions.filter((a: string) => a === "round.closed")).toHaveLength(2);
    const invs = (await api("GET", `/api/v1/panels/${panelId}/invitations`, { token: org })).body;
    const inv = invs.find((i: { rosterMemberId: string }) => i.rosterMemberId === memberIds[3]);
    expect((await api("DELETE", `/api/v1/panels/${panelId}/invitations/${inv.id}`, { token: org })).body.status).toBe("revoked");
    const revoked = await api("GET", "/api/v1/panelist/panel", { token: tokens[3] });
    expect(revoked.status).toBe(401);
    expect(revoked.body.detail).toMatch(/withdrawn/);
    const re = await api("POST", `/api/v1/panels/${panelId}/invitations/${inv.id}/reissue`, { token: org, body: {} });
    expect(re.status).toBe(201);
    expect(re.body.token).not.toBe(tokens[3]);
    expect((await api("GET", "/api/v1/panelist/panel", { token: tokens[3] })).status).toBe(401);
    expect((await api("GET", "/api/v1/panelist/panel", { token: re.body.token })).status).toBe(200);
    tokens[3] = re.body.token;
  });

  it("a passed deadline closes round 3 lazily, exactly once", async () => {
    const deadline = new Date(Date.now() + 3600_000).toISOString();
    const open = await api("POST", `/api/v1/panels/${panelId}/rounds`, { token: org, body: { open: true, deadline } });
    expect(open.body).toMatchObject({ number: 3, status: "open", deadline });
    expect((await answer(2, { questionId: qIds[2], value: 720 })).status).toBe(201);
    const past = new Date(Date.now() - 60_000);
    await sql(`UPDATE "Round" SET "deadline" = ? WHERE "panelId" = ? AND "number" = 3`, [past, panelId]);
    const [late, p1, p2, rounds] = await Promise.all([
      answer(1, { questionId: qIds[2], value: 1100 }),
      api("GET", "/api/v1/panelist/panel", { token: tokens[0] }),
      api("GET", `/api/v1/panels/${panelId}/progress`, { token: org }),
      api("GET", `/api/v1/panels/${panelId}/rounds`, { token: org }),
    ]);
    expect(late.status).toBe(409);
    expect(late.body.type).toBe("/problems/round-closed");
    expect(p1.body.acceptingAnswers).toBe(false);
    expect(p2.status).toBe(200);
    expect(rounds.body[2]).toMatchObject({ number: 3, status: "closed", closedAt: past.toISOString() });
    const audit = await api("GET", `/api/v1/panels/${panelId}/audit`, { token: org });
    const closings = audit.body.filter((e: { action: string; detail: { round: number } }) => e.action === "round.closed" && e.detail.round === 3);
    expect(closings).toHaveLength(1);
    expect(closings[0].detail.by).toBe("deadline");
    const stats = await api("GET", `/api/v1/panels/${panelId}/rounds/3/statistics`, { token: org });
    expect(stats.body.questions[2].n).toBe(1);
  });

  it("the round limit stops a fourth round; finishing the panel ends it", async () => {
    const fourth = await api("POST", `/api/v1/panels/${panelId}/rounds`, { token: org, body: {} });
    expect(fourth.status).toBe(409);
    expect(fourth.body.detail).toMatch(/round limit of 3/);
    expect(fourth.body.type).toBe("/problems/round-limit-reached");
    const fin = await api("POST", `/api/v1/panels/${panelId}/finish`, { token: org });
    expect(fin.body).toEqual({ id: panelId, status: "finished" });
    const after = await answer(0, { questionId: qIds[0], value: 3000 });
    expect(after.status).toBe(409);
    expect(after.body.type).toBe("/problems/panel-finished");
  });
});
