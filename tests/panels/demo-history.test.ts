/**
 * The demo's history against the services that read it (lib/triangulation/track-records.ts,
 * report.ts): the demo is loaded into a fresh SQLite file through the domain services, then
 * the track records, the accuracy history and the Wren-2 report are read back and checked
 * against loops written here over the demo's invented answers (lib/cli/demo-history.ts) and
 * against R (mean of log ratios, shrinkage exp(n/(n + 5)·m)).
 */
import { rmSync } from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
// Nothing that imports lib/db may be imported statically: lib/db opens the file named by
// DATABASE_URL when it is first imported, and that must be this test's own file.
type DemoHistory = typeof import("../../lib/cli/demo-history");
let HABITS: DemoHistory["HABITS"];
let PAST_PANELS: DemoHistory["PAST_PANELS"];
let WREN1_TTM: DemoHistory["WREN1_TTM"];
let WREN2_SCALE: DemoHistory["WREN2_SCALE"];
let pastAnswer: DemoHistory["pastAnswer"];
import { expectClose, runR, rVector } from "../stats/rscript";
import { migratedSqliteDatabase } from "../helpers/migrated-sqlite";

let services: {
  listTrackRecords: typeof import("../../lib/triangulation/track-records").listTrackRecords;
  getAccuracyHistory: typeof import("../../lib/triangulation/track-records").getAccuracyHistory;
  getQuestionReport: typeof import("../../lib/triangulation/report").getQuestionReport;
};
let organiser: import("../../lib/accounts/actor").Actor;
let reviewer: import("../../lib/accounts/actor").Actor;
let wren2: { panelId: string; questionId: string };
let disconnect: () => Promise<void>;
let file: string;

beforeAll(async () => {
  file = migratedSqliteDatabase();
  const { db } = await import("../../lib/db");
  // Refuse to go on unless the client opened this test's file.
  expect((await db.$queryRawUnsafe<{ file: string }[]>("PRAGMA database_list")).map((d) => d.file)).toContain(file);
  ({ HABITS, PAST_PANELS, WREN1_TTM, WREN2_SCALE, pastAnswer } = await import("../../lib/cli/demo-history"));
  disconnect = () => db.$disconnect();
  const { loadDemo } = await import("../../lib/cli/demo");
  const out: string[] = [];
  expect(await loadDemo({ ifEmpty: true }, { out: (t) => out.push(t), err: (t) => out.push(t), stdin: () => "" })).toBe(0);
  const { actorFromUserId } = await import("../../lib/accounts/actor");
  organiser = (await actorFromUserId((await db.user.findUniqueOrThrow({ where: { email: "organiser@quillmoor.example" } })).id))!;
  reviewer = (await actorFromUserId((await db.user.findUniqueOrThrow({ where: { email: "reviewer@quillmoor.example" } })).id))!;
  const panel = await db.panel.findFirstOrThrow({ where: { title: "Year-one unit sales of the Wren-2" }, include: { questions: { orderBy: { position: "asc" } } } });
  wren2 = { panelId: panel.id, questionId: panel.questions[0].id };
  services = {
    ...(await import("../../lib/triangulation/track-records")),
    ...(await import("../../lib/triangulation/report")),
  };
}, 120_000);

afterAll(async () => {
  await disconnect?.();
  rmSync(path.dirname(file), { recursive: true, force: true });
});

/** Every roster member's (outcome, answer, low, high) over the demo's questions with an outcome, from the invented tables. */
function expectedRecords(): Map<number, [number, number, number | null, number | null][]> {
  const m = new Map<number, [number, number, number | null, number | null][]>();
  let k = 0;
  for (const p of PAST_PANELS) {
    for (const q of p.questions) {
      for (const i of p.invited) {
        const a = pastAnswer(i, k, q);
        m.set(i, [...(m.get(i) ?? []), [q.outcomeValue, a.value, a.low ?? null, a.high ?? null]]);
      }
      k++;
    }
  }
  return m;
}

const ROSTER_ORDER = ["Priya Lindqvist", "Owen Castellan", "Beatriz Nakamura", "Tobias Renwick", "Hana Moravec", "Felix Achterberg", "Greta Solheim", "Rafael Underhill"];

// First: a later test records an outcome, which moves track records and so the corrected
// figures; the launch baseline keeps the market potential as it was when attached.
describe("the demo's launch baseline (docs/methods.md §19)", () => {
  it("answers the first four quarters from the two analogues, with the market potential from the panel", async () => {
    const { db } = await import("../../lib/db");
    const { FENWICK1_QUARTERS } = await import("../../lib/cli/demo-launch");
    const { getBaseline } = await import("../../lib/triangulation/baselines");
    const panel = await db.panel.findFirstOrThrow({ where: { title: "The Wren-2's course by quarter" }, include: { questions: { orderBy: { position: "asc" } } } });
    const b = await getBaseline(organiser, panel.id, panel.questions[1].id);
    expect(b.source).toBe("launch");
    expect(b.target.label).toBe("total of the first 4 quarters after launch");
    expect(b.target.lower80!).toBeLessThan(b.target.mean!);
    expect(b.target.mean!).toBeLessThan(b.target.upper80!);
    // the market potential is the market question's corrected panel figure; the raw one is the
    // median of 30,000, 38,000, 42,000, 45,000, 55,000 = 42,000 (hand)
    const { getTriangulation } = await import("../../lib/triangulation/triangulation");
    const t = await getTriangulation(organiser, panel.id, panel.questions[0].id);
    expect(t.panel!.raw.figure).toBe(42000);
    expect(b.result.launch!.market.median).toBe(t.panel!.corrected.figure);
    expect(b.result.launch!.market.how).toMatch(/lifetime market/);
    // the Fenwick-1 fit against R's nls (stats, algorithm "port") run here
    const [[p, q, m]] = runR(`Fb <- function(t, p, q) (1 - exp(-(p + q) * t)) / (1 + (q / p) * exp(-(p + q) * t))
      y <- ${rVector(FENWICK1_QUARTERS)}; t <- seq_along(y)
      f <- nls(y ~ m * (Fb(t, p, q) - Fb(t - 1, p, q)), start = list(p = 0.03, q = 0.38, m = 1.1 * sum(y)),
        algorithm = "port", lower = c(1e-9, 0, 1), control = list(maxiter = 1000, eval.max = 5000))
      cat(coef(f), "\\n")`);
    const fit = b.result.launch!.analogues[0];
    expectClose([fit.p, fit.q, fit.m], [p, q, m], 1e-4, "Fenwick-1 p, q, m");
  });
});

describe("demo history", () => {
  it("track records equal a loop over the invented answers; bias factors equal R's exp(n/(n+5)·mean log ratio)", async () => {
    const records = await services.listTrackRecords(organiser);
    const expected = expectedRecords();
    const names = [...expected.keys()].sort((a, b) => a - b);
    const rCode = names
      .map((i) => {
        const rows = expected.get(i)!;
        return `a <- ${rVector(rows.map((r) => r[0]))}; x <- ${rVector(rows.map((r) => r[1]))}; m <- mean(log(a / x)); n <- length(a); out(c(n, m, exp(n / (n + 5) * m), mean(abs(100 * (a - x) / a))))`;
      })
      .join("\n");
    const r = runR(rCode);
    names.forEach((i, j) => {
      const rec = records.find((x) => x.name === ROSTER_ORDER[i])!.record;
      const rows = expected.get(i)!;
      const hits = rows.filter(([a, , lo, hi]) => lo !== null && hi !== null && a >= lo && a <= hi).length;
      const threePoint = rows.filter(([, , lo]) => lo !== null).length;
      expect(rec.count).toBe(r[j][0]);
      expectClose([rec.meanLogRatio!, rec.bias.factor!, rec.mape!], [r[j][1], r[j][2], r[j][3]], 1e-12, ROSTER_ORDER[i]);
      expect(rec.intervalHitRate.hits).toBe(hits);
      expect(rec.intervalHitRate.count).toBe(threePoint);
    });
    // The habits show through: the optimist is corrected down, the pessimist up.
    const factor = (n: string) => records.find((x) => x.name === n)!.record.bias.factor!;
    expect(HABITS[0]).toBeGreaterThan(1);
    expect(factor("Priya Lindqvist")).toBeLessThan(0.9);
    expect(factor("Owen Castellan")).toBeGreaterThan(1.1);
    expect(Math.abs(factor("Beatriz Nakamura") - 1)).toBeLessThan(0.03);
    expect(records.find((x) => x.name === "Priya Lindqvist")!.record.theil).not.toBeNull();
  });

  it("the accuracy history has the eight recorded outcomes in time order", async () => {
    const h = await services.getAccuracyHistory(organiser);
    expect(h.questions).toHaveLength(8);
    expect(h.questions.map((q) => q.outcomeValue)).toEqual(PAST_PANELS.flatMap((p) => p.questions.map((q) => q.outcomeValue)));
    expect(h.history!.n).toBe(8);
  });

  it("the Wren-2 report: inverse-MSE weights from 8 questions, corrected answers, the scaled analogous baseline", async () => {
    const r = await services.getQuestionReport(reviewer, wren2.panelId, wren2.questionId);
    expect(r.blend!.ruleApplied).toBe("inverse-mse");
    expect(r.blend!.outcomesBehindWeight).toBe(8);
    expect(r.blend!.panelWeight).toBeGreaterThan(0);
    expect(r.blend!.panelWeight).toBeLessThan(1);
    expect(r.legs.baseline!.analogue!.scaleFactor).toBe(WREN2_SCALE);
    expect(r.legs.trackRecord.panelistsWithRecord).toBe(7);
    // A reviewer never sees per-person correction figures (THREATS.md): only the panel's aggregate.
    expect(r.biasCorrection).toEqual([]);
    expect(r.legs.trackRecord.panelists).toEqual([]);
    expect(r.legs.trackRecord.meanFactor).not.toBe(1);
    expect(r.legs.panel!.corrected.figure).not.toBe(r.legs.panel!.raw.figure);
    // The report page's table (computed apart, on the worker pool) shows exactly this report's blend.
    const { getPanelReportRows } = await import("../../lib/triangulation/panel-reports");
    const [row] = await getPanelReportRows(reviewer, wren2.panelId, [wren2.questionId]);
    expect(row).toEqual({ questionId: wren2.questionId, blend: { figure: r.blend!.figure, intervals: r.blend!.intervals }, outcome: r.outcome?.outcomeValue ?? null, hasBaseline: true });
    const { db } = await import("../../lib/db");
    const stored = await db.baseline.findUniqueOrThrow({ where: { questionId: wren2.questionId } });
    const preview = JSON.parse(stored.preview) as { rows: { value: number; scaled: number }[] };
    expect(preview.rows.map((x) => x.value)).toEqual(WREN1_TTM);
    preview.rows.forEach((x) => expect(x.scaled).toBeCloseTo(x.value * WREN2_SCALE, 9));
  });
});

describe("recording the outcome of the demo's sum-of-parts question (services on the demo database)", () => {
  it("refuses while a round is open, names a bad part, then scores the total and feeds each part into its panelist's record", async () => {
    const { db } = await import("../../lib/db");
    const { recordOutcome, correctOutcome } = await import("../../lib/triangulation/outcome");
    const { closeRound } = await import("../../lib/panels/rounds");
    const { DomainError } = await import("../../lib/errors");
    const panel = await db.panel.findUniqueOrThrow({ where: { id: wren2.panelId }, include: { questions: { orderBy: { position: "asc" } } } });
    const partsQ = panel.questions[1].id;
    const status = (p: Promise<unknown>) => p.then(() => 0, (e: unknown) => (e instanceof DomainError ? e.status : -1));

    expect(await status(recordOutcome(organiser, wren2.panelId, partsQ, { outcomeValue: 15000, note: "", parts: [] }))).toBe(409); // round 3 is open
    await closeRound(organiser, wren2.panelId, 3);
    expect(await status(recordOutcome(reviewer, wren2.panelId, partsQ, { outcomeValue: 15000, note: "", parts: [] }))).toBe(403);

    // Final parts: each panelist's answer in the latest round they answered (round 3 for the two
    // who answered it, round 2 for the five others: parts are carried forward, not dropped).
    const all = await db.answer.findMany({
      where: { questionId: partsQ },
      include: { round: true, invitation: { include: { rosterMember: true } } },
      orderBy: [{ round: { number: "desc" } }, { version: "desc" }],
    });
    const byPseudonym = new Map<string, { value: number; member: string; round: number }>();
    for (const a of all) if (!byPseudonym.has(a.invitation.pseudonym)) byPseudonym.set(a.invitation.pseudonym, { value: a.value, member: a.invitation.rosterMember.name, round: a.round.number });
    expect(byPseudonym.size).toBe(7);
    expect([...byPseudonym.values()].filter((v) => v.round === 3)).toHaveLength(2);
    const [[p1, a1], [, a2]] = [...byPseudonym.entries()];
    const bad = await recordOutcome(organiser, wren2.panelId, partsQ, { outcomeValue: 15000, note: "", parts: [{ pseudonym: "Panelist NONE", outcomeValue: 1 }] }).catch((e) => e);
    expect(bad.status).toBe(422);
    expect(bad.errors[0].field).toBe("parts.0.pseudonym");

    const records = await services.listTrackRecords(organiser);
    const before = records.find((r) => r.name === a1.member)!.record.count;
    const before2 = records.find((r) => r.name === a2.member)!.record.count;
    const res = await recordOutcome(organiser, wren2.panelId, partsQ, { outcomeValue: 5200, note: "ledger", parts: [{ pseudonym: p1, outcomeValue: 2500 }] });
    // The panel figure of a sum of parts is the total of the final parts (hand: Σ of the values).
    const total = [...byPseudonym.values()].reduce((s, v) => s + v.value, 0);
    expect(res.figures.rawPanel).toBe(total);
    expect(res.scores.rawPanel.error).toBe(5200 - total);
    expect(res.parts).toEqual([{ pseudonym: p1, outcomeValue: 2500 }]);
    expect(res.figures.panelists).toHaveLength(7);
    const after = await services.listTrackRecords(organiser);
    expect(after.find((r) => r.name === a1.member)!.record.count).toBe(before! + 1);
    // A part whose actual was not given (the second panelist's) is not scored: no new record.
    expect(after.find((r) => r.name === a2.member)!.record.count).toBe(before2);

    const fixed = await correctOutcome(organiser, wren2.panelId, partsQ, { outcomeValue: 5300, reason: "one return booked late" });
    expect(fixed.scores.rawPanel.error).toBe(5300 - total);
    expect(fixed.parts).toEqual([{ pseudonym: p1, outcomeValue: 2500 }]);
    const audit = await db.auditEvent.findFirstOrThrow({ where: { panelId: wren2.panelId, action: "outcome.corrected" } });
    expect(JSON.parse(audit.detail)).toEqual({ questionId: partsQ, from: 5200, to: 5300, reason: "one return booked late" });
  });
});

