/**
 * Triangulation of a question composed from lib/blend (lib/triangulation/triangulation.ts
 * `computeTriangulation`), the derivation of track records and blend-weight history from stored
 * recorded outcomes (lib/triangulation/track-records.ts), outcome scores (lib/triangulation/outcome.ts) and
 * the CSV export's cell neutralisation (lib/triangulation/report.ts). Pure: no database.
 *
 * Expected values come from R (Rscript, computed in the test from the same inputs: median,
 * quantile type 7, qnorm/pnorm, uniroot on the mixture CDF written out from its definition) or
 * from hand computations written out beside them with the formula they follow.
 */
import { describe, expect, it } from "vitest";
import { trackRecord, type BiasFactor } from "../../lib/blend";
import { computeTriangulation, type TriangulationInput } from "../../lib/triangulation/triangulation";
import { historyOf, recordsByMember, type RecordedOutcome, type OutcomeFigures } from "../../lib/triangulation/track-records";
import { checkWithinBounds, scoreFigures } from "../../lib/triangulation/outcome";
import { InvalidInputError } from "../../lib/errors";
import { csvCell, reportCsv } from "../../lib/triangulation/report";
import { expectClose, runR, rVector } from "../stats/rscript";

const answers = (values: readonly number[], prefix = "i") =>
  values.map((value, k) => ({ invitationId: `${prefix}${k}`, pseudonym: `Panelist ${String.fromCharCode(65 + k)}`, value, low: null, high: null }));

/** Baseline of the shared-quantity case: mean 140, 80% [125, 155], 95% [117, 163] (invented). */
const BASELINE = { mean: 140, lower80: 125, upper80: 155, lower95: 117, upper95: 163 };
const ROUND1 = [100, 130, 170, 180, 260];
const ROUND2 = [120, 135, 150, 160, 210];

function sharedInput(overrides: Partial<TriangulationInput> = {}): TriangulationInput {
  return {
    aggregation: "shared",
    answerFormat: "single",
    rounds: [
      { round: 1, answers: answers(ROUND1) },
      { round: 2, answers: answers(ROUND2) },
    ],
    factors: {},
    baseline: BASELINE,
    weight: { rule: "equal" },
    ...overrides,
  };
}

/** Log errors ln(actual / corrected panel figure) of four invented questions with an outcome. */
const LOG_ERRORS = [0.1, -0.2, 0.15, -0.05];

/**
 * R prelude: the panel leg from the track record (Gelman et al. 2013 §2.6: s² = (3·0.25² + Σe²)/(3 + n),
 * P10/P90 = figure·exp(∓qt(0.9, 3 + n)·s)) as the two-piece normal through them; and the blend
 * N(w·p + (1 − w)·b, σ_c²) with σ_c² = w²σp² + (1 − w)²σb² + 2w(1 − w)ρσpσb (Bates & Granger 1969,
 * docs/methods.md §5a), σp = (P90 − P10)/(2·qnorm(0.9)), ρ the prior 0.5 without history.
 */
const R_LEGS = `
leg <- function(fig, e) { s <- sqrt((3 * 0.25^2 + sum(e^2)) / (3 + length(e))); t <- qt(0.9, 3 + length(e)); c(fig * exp(-t * s), fig, fig * exp(t * s)) }
Q2 <- function(p, l) if (p < 0.5) l[2] + (l[2] - l[1]) / qnorm(0.9) * qnorm(p) else l[2] + (l[3] - l[2]) / qnorm(0.9) * qnorm(p)
qblend <- function(p, w, l, mb, sdb, rho = 0.5) { sp <- (l[3] - l[1]) / (2 * qnorm(0.9)); sc <- sqrt(w^2 * sp^2 + (1 - w)^2 * sdb^2 + 2 * w * (1 - w) * rho * sp * sdb); qnorm(p, w * l[2] + (1 - w) * mb, sc) }
`;

describe("computeTriangulation: shared quantity, single values, equal weights", () => {
  const t = computeTriangulation(sharedInput({ panelLogErrors: LOG_ERRORS }));
  // R: the panel leg is the track-record two-piece normal at the round-2 median (R_LEGS), the
  // baseline N(140, 15/qnorm(0.9)) (sd implied by its 80% interval); the blend's quantiles solve
  // 0.5·Fp(x) + 0.5·Fb(x) = p by uniroot.
  const [[med, p10, p90, p025, p975], [sdb, b10, b90, b025, b975, b50], zs, pct, acrossZ, out80, out95] = runR(`${R_LEGS}
    x <- ${rVector(ROUND2)}
    med <- median(x); l <- leg(med, ${rVector(LOG_ERRORS)})
    out(c(med, l[1], l[3], Q2(0.025, l), Q2(0.975, l)))
    sdb <- (155 - 125) / (2 * qnorm(0.9))
    out(c(sdb, sapply(c(0.1, 0.9, 0.025, 0.975, 0.5), function(p) qblend(p, 0.5, l, 140, sdb))))
    all <- c(${rVector(ROUND1)}, x)
    z <- (all - 140) / sdb
    out(z)
    out(100 * pnorm(z))
    out((c(median(${rVector(ROUND1)}), med) - 140) / sdb)
    out(as.numeric(abs(z) > qnorm(0.9))); out(as.numeric(abs(z) > qnorm(0.975)))
  `);

  it("panel range from the track record, not from the answers' spread: R's qt on the pooled log-error scale", () => {
    expect(t.panel!.raw.figure).toBe(med);
    expect(t.panel!.rule).toBe("track record");
    expect(t.panel!.errorScale!.n).toBe(4);
    expectClose(t.panel!.raw.intervals.flatMap((i) => [i.lower, i.upper]), [p10, p90, p025, p975], 1e-12, "panel range");
    // No track record: factor 1, corrected = raw.
    expect(t.panel!.corrected.figure).toBe(med);
    expect(t.panel!.answers.every((a) => a.factor === 1 && a.nOutcomes === 0)).toBe(true);
    expect(t.notes.join(" ")).toMatch(/not from the spread of the answers/);
  });

  it("the panel's range does not shrink when the answers converge (Delphi rounds narrow the spread by design)", () => {
    const tight = computeTriangulation(sharedInput({ panelLogErrors: LOG_ERRORS, rounds: [{ round: 3, answers: answers([149, 150, 150, 150, 151]) }] }));
    expect(tight.panel!.raw.intervals).toEqual(t.panel!.raw.intervals);
  });

  it("blend figure 0.5·150 + 0.5·140 = 145 (docs/methods.md §15c, equal weights) is the median of its distribution, inside its ranges (R qnorm)", () => {
    expect(t.weights!.panel).toBe(0.5);
    expect(t.blend!.figure).toBe(145);
    expectClose([b50], [145], 1e-12, "R's median of the blend");
    expectClose(t.blend!.intervals.flatMap((i) => [i.lower, i.upper]), [b10, b90, b025, b975], 1e-9, "blend range");
    expectClose([t.baseline!.sd], [sdb], 1e-12, "baseline sd");
    for (const iv of t.blend!.intervals) expect(iv.lower <= t.blend!.figure && t.blend!.figure <= iv.upper).toBe(true);
  });

  it("says how each range was made: the panel's from the track record with the stated prior (docs/methods.md §15a: 0.25 worth 3), the blend's from one normal", () => {
    // §15a's prior: scale s0 = 0.25 worth ν0 = 3 questions; 4 questions with an outcome → 3 + 4 = 7 degrees of freedom.
    expect(t.panel!.rangeHow).toMatch(/from the track record, not from the spread of the answers/);
    expect(t.panel!.rangeHow).toContain("4 recorded outcomes pooled with a prior scale of 0.25 worth 3 questions");
    expect(t.panel!.rangeHow).toContain("on 7 degrees of freedom");
    // The blend: one normal with the Bates–Granger sd, the number the range is read from, and the prior ρ = 0.5 (§15e).
    expect(t.blendRangeHow).toContain(`= ${t.blend!.distribution.sd.toPrecision(4)} `);
    expect(t.blendRangeHow).toContain("the stated prior 0.5");
    expect(t.blendRangeHow).toMatch(/not the mixture/);
  });

  it("departures of every answer in every round: z, percentile and flags from one normal (R pnorm/qnorm)", () => {
    const d = t.departures!;
    expect(d.answers.map((a) => [a.round, a.value])).toEqual([...ROUND1.map((v) => [1, v]), ...ROUND2.map((v) => [2, v])]);
    expectClose(d.answers.map((a) => a.z), zs, 1e-12, "z");
    expectClose(d.answers.map((a) => a.percentile), pct, 1e-12, "percentile");
    expect(d.answers.map((a) => a.outside80)).toEqual(out80.map((x) => x === 1));
    expect(d.answers.map((a) => a.outside95)).toEqual(out95.map((x) => x === 1));
    // Percent: 100·(v − 140)/140 for 210 → 50.
    expect(d.answers.at(-1)!.percent).toBeCloseTo(50, 12);
  });

  it("the panel's departure across rounds: median 170 then 150, moving toward the baseline", () => {
    const rounds = t.departures!.panel.rounds;
    expect(rounds.map((r) => [r.round, r.value, r.difference])).toEqual([[1, 170, 30], [2, 150, 10]]);
    expectClose(rounds.map((r) => r.z), acrossZ, 1e-12, "z across rounds");
    expect(rounds[1].closer).toBe(true);
    expectClose([t.departures!.panel.totalZChange], [acrossZ[1] - acrossZ[0]], 1e-12);
  });

  it("an organiser weight of 0.3 gives 0.3·150 + 0.7·140 = 143, and R's qnorm for its 80% range", () => {
    const o = computeTriangulation(sharedInput({ panelLogErrors: LOG_ERRORS, weight: { rule: "organiser", panelWeight: 0.3 } }));
    const [q] = runR(`${R_LEGS} out(sapply(c(0.1, 0.9), function(p) qblend(p, 0.3, leg(150, ${rVector(LOG_ERRORS)}), 140, (155 - 125) / (2 * qnorm(0.9)))))`);
    expect(o.blend!.figure).toBeCloseTo(143, 12);
    expectClose([o.blend!.intervals[0].lower, o.blend!.intervals[0].upper], q, 1e-9, "blend 80% range");
    expect(o.weights!.applied).toBe("organiser");
  });

  it("without a baseline there is a panel figure but no blend and no departures", () => {
    const o = computeTriangulation(sharedInput({ baseline: null }));
    expect(o.panel!.raw.figure).toBe(150);
    expect(o.blend).toBeNull();
    expect(o.departures).toBeNull();
    expect(o.notes.join(" ")).toMatch(/No baseline/);
  });
});

/** A question with its outcome and one answer per invitation (figures as stored with the outcome). */
function withOutcome(
  actual: number,
  panelists: readonly { inv: string; member: string; value: number; low?: number; high?: number }[],
  extra: Partial<OutcomeFigures> = {},
  partOutcomes: RecordedOutcome["partOutcomes"] = [],
): RecordedOutcome {
  return {
    questionId: `q${actual}`,
    panelId: "p",
    panelTitle: "past panel",
    text: "past question",
    unit: "units",
    recordedAt: new Date(0),
    outcomeValue: actual,
    partOutcomes,
    figures: {
      round: 1,
      aggregation: "shared",
      answerFormat: panelists.some((p) => p.low !== undefined) ? "three-point" : "single",
      rawPanel: 0,
      correctedPanel: 0,
      baseline: null,
      blend: null,
      panelWeight: null,
      weightRule: null,
      baselineTraining: [],
      baselineSeason: 1,
      ...extra,
      panelists: panelists.map((p) => ({ invitationId: p.inv, rosterMemberId: p.member, pseudonym: p.inv, value: p.value, low: p.low ?? null, high: p.high ?? null, factor: 1 })),
    },
  };
}

describe("bias correction from track records derived from recorded outcomes", () => {
  // Invented history: "opt" answered high three times, "pes" low twice, "cal" never had an outcome.
  const history = [
    withOutcome(100, [{ inv: "x1", member: "opt", value: 125, low: 100, high: 150 }, { inv: "x2", member: "pes", value: 80, low: 70, high: 95 }]),
    withOutcome(200, [{ inv: "y1", member: "opt", value: 240, low: 210, high: 300 }, { inv: "y2", member: "pes", value: 175, low: 150, high: 210 }]),
    withOutcome(150, [{ inv: "z1", member: "opt", value: 180, low: 120, high: 200 }]),
  ];
  const byMember = recordsByMember(history);
  const factor = (m: string): BiasFactor => trackRecord(byMember.get(m)!.records).bias;

  it("each member's track record equals a loop over their answers with an outcome", () => {
    for (const [member, rows] of [
      ["opt", [[100, 125, 100, 150], [200, 240, 210, 300], [150, 180, 120, 200]]],
      ["pes", [[100, 80, 70, 95], [200, 175, 150, 210]]],
    ] as const) {
      let sumErr = 0;
      let sumLog = 0;
      let sumApe = 0;
      let hits = 0;
      for (const [a, x, lo, hi] of rows) {
        sumErr += a - x;
        sumLog += Math.log(a / x);
        sumApe += Math.abs((100 * (a - x)) / a);
        if (a >= lo && a <= hi) hits++;
      }
      const n = rows.length;
      const rec = trackRecord(byMember.get(member)!.records);
      expect(rec.count).toBe(n);
      expect(rec.meanError).toBeCloseTo(sumErr / n, 12);
      expect(rec.meanLogRatio).toBeCloseTo(sumLog / n, 12);
      expect(rec.mape).toBeCloseTo(sumApe / n, 10);
      expect(rec.intervalHitRate.hits).toBe(hits);
      // Shrinkage toward 1: exp(n/(n + 5) · mean log ratio) (lib/blend BIAS_PRIOR_STRENGTH = 5).
      expect(rec.bias.factor).toBeCloseTo(Math.exp((n / (n + 5)) * (sumLog / n)), 12);
    }
    // opt's intervals: 100 in [100,150] yes, 200 in [210,300] no, 150 in [120,200] yes → 2 of 3.
    expect(trackRecord(byMember.get("opt")!.records).intervalHitRate.hits).toBe(2);
  });

  it("the corrected panel figure is R's median of answer × factor; raw stays beside it", () => {
    const current = [
      { invitationId: "c-opt", pseudonym: "Panelist O", value: 130, low: null, high: null },
      { invitationId: "c-pes", pseudonym: "Panelist P", value: 90, low: null, high: null },
      { invitationId: "c-cal", pseudonym: "Panelist C", value: 105, low: null, high: null },
    ];
    const fo = factor("opt").factor;
    const fp = factor("pes").factor;
    const t = computeTriangulation(
      sharedInput({ rounds: [{ round: 1, answers: current }], factors: { "c-opt": factor("opt"), "c-pes": factor("pes") } }),
    );
    const [[rawMed, corrMed, co, cp]] = runR(`
      fo <- exp(3/8 * mean(log(c(100, 200, 150) / c(125, 240, 180))))
      fp <- exp(2/7 * mean(log(c(100, 200) / c(80, 175))))
      x <- c(130, 90, 105); f <- c(fo, fp, 1)
      out(c(median(x), median(x * f), fo, fp))
    `);
    expectClose([fo, fp], [co, cp], 1e-12, "bias factors vs R");
    expect(t.panel!.raw.figure).toBe(rawMed);
    expectClose([t.panel!.corrected.figure], [corrMed], 1e-12, "corrected median");
    expect(t.panel!.answers.map((a) => a.correctedValue)).toEqual([130 * fo, 90 * fp, 105]);
    expect(t.blend!.figure).toBeCloseTo(0.5 * corrMed + 0.5 * 140, 9);
  });

  it("sum of parts sums the corrected parts; single-value parts still get a range, from the prior (R qt)", () => {
    const parts = [
      { invitationId: "c-opt", pseudonym: "Panelist O", value: 400, low: null, high: null },
      { invitationId: "c-pes", pseudonym: "Panelist P", value: 300, low: null, high: null },
    ];
    const t = computeTriangulation({
      aggregation: "sum-of-parts",
      answerFormat: "single",
      rounds: [{ round: 1, answers: parts }],
      factors: { "c-opt": factor("opt"), "c-pes": factor("pes") },
      baseline: { mean: 650, lower80: 600, upper80: 700 },
      weight: { rule: "equal" },
    });
    expect(t.panel!.raw.figure).toBe(700);
    expect(t.panel!.corrected.figure).toBeCloseTo(400 * factor("opt").factor + 300 * factor("pes").factor, 12);
    expect(t.panel!.rule).toBe("track record");
    const [[lo, hi]] = runR("out(700 * exp(c(-1, 1) * qt(0.9, 3) * 0.25))");
    expectClose([t.panel!.raw.intervals[0].lower, t.panel!.raw.intervals[0].upper], [lo, hi], 1e-12, "prior-only range of the total");
    expect(t.cautions.join(" ")).toMatch(/rests mostly on a default prior/);
    expect(t.departures!.answers).toEqual([]);
  });

  it("issue 12: single-value parts no longer give '11,621; 80% range 11,570 to 11,570' — the figure is inside both ranges (R qnorm)", () => {
    const parts = [
      { invitationId: "a", pseudonym: "A", value: 5000, low: null, high: null },
      { invitationId: "b", pseudonym: "B", value: 6570, low: null, high: null },
    ];
    const b = { mean: 12452, lower80: 12100, upper80: 12804 };
    const t = computeTriangulation({ aggregation: "sum-of-parts", answerFormat: "single", rounds: [{ round: 1, answers: parts }], factors: {}, baseline: b, weight: { rule: "equal" } });
    const [q] = runR(`${R_LEGS} l <- leg(11570, numeric(0)); sdb <- (12804 - 12100) / (2 * qnorm(0.9))
      out(sapply(c(0.5, 0.1, 0.9, 0.025, 0.975), function(p) qblend(p, 0.5, l, 12452, sdb)))`);
    expectClose([t.blend!.figure, ...t.blend!.intervals.flatMap((i) => [i.lower, i.upper])], q, 1e-9, "blend median and range");
    expect(t.blend!.intervals[0].upper - t.blend!.intervals[0].lower).toBeGreaterThan(0);
    for (const iv of t.blend!.intervals) expect(iv.lower < t.blend!.figure && t.blend!.figure < iv.upper).toBe(true);
  });

  it("a part not answered in the final round is carried forward from the panelist's latest round (hand: 110 + 200 = 310)", () => {
    const t = computeTriangulation({
      aggregation: "sum-of-parts",
      answerFormat: "single",
      rounds: [
        { round: 1, answers: [{ invitationId: "a", pseudonym: "A", value: 100, low: null, high: null }, { invitationId: "b", pseudonym: "B", value: 200, low: null, high: null }] },
        { round: 2, answers: [{ invitationId: "a", pseudonym: "A", value: 110, low: null, high: null }] },
      ],
      factors: {},
      baseline: null,
      weight: { rule: "equal" },
    });
    expect(t.panel!.raw.figure).toBe(310);
    expect(t.panel!.answers.map((a) => [a.pseudonym, a.fromRound])).toEqual([["A", 2], ["B", 1]]);
    expect(t.cautions.join(" ")).toMatch(/1 of the 2 parts come from an earlier round/);
  });

  it("a sum-of-parts answer counts against its own part's actual, and only when recorded; answers ≤ 0 are skipped", () => {
    const parts = withOutcome(
      1000,
      [{ inv: "s1", member: "opt", value: 500 }, { inv: "s2", member: "pes", value: 300 }, { inv: "s3", member: "zero", value: 0 }],
      { aggregation: "sum-of-parts" },
      [{ invitationId: "s1", actual: 450 }, { invitationId: "s3", actual: 20 }],
    );
    const m = recordsByMember([parts]);
    expect(m.get("opt")!.records).toEqual([{ actual: 450, answer: 500 }]);
    expect(m.get("pes")!.records).toEqual([]);
    expect(m.get("zero")!.skipped).toBe(1);
  });
});

describe("three-point answers: the panel range is the linear pool of two-piece normals", () => {
  it("80% and 95% bounds equal R's uniroot on the pooled CDF written from its definition", () => {
    const tp = [
      { low: 80, value: 100, high: 140 },
      { low: 90, value: 120, high: 150 },
      { low: 70, value: 95, high: 130 },
    ];
    const t = computeTriangulation({
      aggregation: "shared",
      answerFormat: "three-point",
      rounds: [{ round: 1, answers: tp.map((a, k) => ({ invitationId: `t${k}`, pseudonym: `P${k}`, ...a })) }],
      factors: {},
      baseline: null,
      weight: { rule: "equal" },
    });
    // Each answer: P(X ≤ x) = Φ((x − mid)/sLow) below mid, Φ((x − mid)/sHigh) above, s = distance / qnorm(0.9).
    const [q] = runR(`
      lo <- c(80, 90, 70); mi <- c(100, 120, 95); hi <- c(140, 150, 130); z <- qnorm(0.9)
      F1 <- function(x, l, m, h) if (x < m) pnorm((x - m) / ((m - l) / z)) else pnorm((x - m) / ((h - m) / z))
      F <- function(x) mean(sapply(1:3, function(i) F1(x, lo[i], mi[i], hi[i])))
      out(sapply(c(0.1, 0.9, 0.025, 0.975), function(p) uniroot(function(x) F(x) - p, c(0, 300), tol = 1e-12)$root))
    `);
    expect(t.panel!.rule).toBe("three-point pool");
    expect(t.panel!.rangeHow).toMatch(/linear pool \(Stone 1961\) of the three-point answers/);
    expect(t.blendRangeHow).toBeNull(); // no baseline, no blend
    expect(t.panel!.raw.figure).toBe(100); // median of 100, 120, 95
    expectClose(t.panel!.raw.intervals.flatMap((i) => [i.lower, i.upper]), q, 1e-9, "pooled range");
  });
});

describe("three-point ranges rescaled by each panelist's interval hit rate", () => {
  it("a panelist whose ranges held 1 of 5 outcomes gets ranges × qnorm(0.9)/qnorm(0.75); the pool then matches R's uniroot", () => {
    const tp = [
      { low: 80, value: 100, high: 140 },
      { low: 90, value: 120, high: 150 },
    ];
    const t = computeTriangulation({
      aggregation: "shared",
      answerFormat: "three-point",
      rounds: [{ round: 1, answers: tp.map((a, k) => ({ invitationId: `t${k}`, pseudonym: `P${k}`, ...a })) }],
      factors: {},
      intervalHits: { t0: { hits: 1, count: 5 } },
      baseline: null,
      weight: { rule: "equal" },
    });
    // Hand: ĥ = (1 + 0.8·5)/(5 + 5) = 0.5, so t0's stated 80% range is read as a 50% range.
    const [q] = runR(`
      f <- qnorm(0.9) / qnorm(0.75); z <- qnorm(0.9)
      lo <- c(100 - f * 20, 90); mi <- c(100, 120); hi <- c(100 + f * 40, 150)
      F1 <- function(x, l, m, h) if (x < m) pnorm((x - m) / ((m - l) / z)) else pnorm((x - m) / ((h - m) / z))
      F <- function(x) mean(sapply(1:2, function(i) F1(x, lo[i], mi[i], hi[i])))
      out(c(f, sapply(c(0.1, 0.9, 0.025, 0.975), function(p) uniroot(function(x) F(x) - p, c(-200, 500), tol = 1e-12)$root)))
    `);
    expectClose([t.panel!.answers[0].rangeFactor], [q[0]], 1e-12, "range factor");
    expect(t.panel!.answers[1].rangeFactor).toBe(1);
    expectClose(t.panel!.raw.intervals.flatMap((i) => [i.lower, i.upper]), q.slice(1), 1e-9, "pooled range");
  });
});

describe("inverse-MSE weights from the organiser's past outcomes (relative errors)", () => {
  it("raw w_panel = MSE_b / (MSE_p + MSE_b) = 17/23 (Bates & Granger 1969, ρ = 0), shrunk toward 0.5 with Z = 4/29", () => {
    const h = historyOf([
      withOutcome(100, [], { correctedPanel: 110, rawPanel: 112, baseline: 90, blend: 100 }),
      withOutcome(200, [], { correctedPanel: 190, rawPanel: 185, baseline: 230, blend: 210 }),
      withOutcome(400, [], { correctedPanel: 420, rawPanel: 430, baseline: 360, blend: 390 }),
      withOutcome(300, [], { correctedPanel: 310, rawPanel: 310 }), // no baseline: left out
    ]);
    expect(h.withoutBaseline).toBe(1);
    // Relative errors (actual − figure)/actual: panel −0.1, 0.05, −0.05 → MSE 0.015/3;
    // baseline 0.1, −0.15, 0.1 → MSE 0.0425/3; weight 0.0425/(0.015 + 0.0425) = 17/23.
    const t = computeTriangulation(sharedInput({ weight: { rule: "inverse-mse", history: h.pairs } }));
    expect(t.weights!.applied).toBe("inverse-mse");
    expect(t.weights!.rawPanel).toBeCloseTo(17 / 23, 12);
    // Hand (docs/methods.md §15c): Z = τ²/(τ² + 1/(4(n + 1))) = 0.01/(0.01 + 1/16) = 4/29; w = Z·17/23 + (1 − Z)·0.5.
    const w = (4 / 29) * (17 / 23) + (25 / 29) * 0.5;
    expect(t.weights!.panel).toBeCloseTo(w, 12);
    expect(t.blend!.figure).toBeCloseTo(w * 150 + (1 - w) * 140, 9);
    expect(h.entries.map((e) => e.blend)).toEqual([100, 210, 390]);
  });

  it("with fewer than 3 questions with an outcome the rule falls back to equal weights and says why", () => {
    const h = historyOf([withOutcome(100, [], { correctedPanel: 110, baseline: 90, blend: 100 })]);
    const t = computeTriangulation(sharedInput({ weight: { rule: "inverse-mse", history: h.pairs } }));
    expect(t.weights!.applied).toBe("equal");
    expect(t.weights!.reason).toMatch(/only 1 recorded outcome/);
  });
});

describe("outcome scores", () => {
  it("errors are actual − figure; percent errors 100·error/actual (hand computation)", () => {
    const s = scoreFigures(1000, withOutcome(1000, [{ inv: "a", member: "m", value: 1250 }], { rawPanel: 900, correctedPanel: 950, baseline: 1100, blend: 1020 }).figures);
    expect([s.rawPanel.error, s.correctedPanel.error, s.baseline!.error, s.blend!.error]).toEqual([100, 50, -100, -20]);
    expect(s.rawPanel.absolutePercentError).toBeCloseTo(10, 12);
    expect(s.panelists[0]).toMatchObject({ label: "a", error: -250 });
    const noBaseline = scoreFigures(1000, withOutcome(1000, [], { rawPanel: 900, correctedPanel: 950 }).figures);
    expect(noBaseline.baseline).toBeNull();
    expect(noBaseline.blend).toBeNull();
  });

  it("a sum-of-parts answer is scored only against its own part's actual, never the total (hand: 450 − 500 = −50)", () => {
    const f = withOutcome(1000, [{ inv: "s1", member: "m1", value: 500 }, { inv: "s2", member: "m2", value: 300 }], { aggregation: "sum-of-parts", rawPanel: 800, correctedPanel: 800, baseline: 900, blend: 850 }).figures;
    const s = scoreFigures(1000, f, [{ invitationId: "s1", actual: 450 }]);
    expect(s.rawPanel.error).toBe(200); // the total against the total
    expect(s.panelists).toHaveLength(1); // s2 has no part actual: not scored
    expect(s.panelists[0]).toMatchObject({ label: "s1", error: -50 });
    expect(s.panelists[0].absolutePercentError).toBeCloseTo((100 * 50) / 450, 12);
    expect(scoreFigures(1000, f).panelists).toEqual([]);
  });

  it("an outcome outside the question's bounds is refused, naming the number (−100 for a 0–100,000 question)", () => {
    const q = { lowerBound: 0, upperBound: 100000 };
    expect(() => checkWithinBounds(q, -100)).toThrow(InvalidInputError);
    let caught: unknown = null;
    try {
      checkWithinBounds(q, -100, [{ pseudonym: "A", outcomeValue: 200000 }]);
    } catch (err) {
      caught = err;
    }
    {
      expect((caught as InvalidInputError).errors).toEqual([
        { field: "outcomeValue", message: "-100 is outside the question's bounds 0 to 100000" },
        { field: "parts.0.outcomeValue", message: "200000 is outside the question's bounds 0 to 100000" },
      ]);
    }
    expect(() => checkWithinBounds(q, 0)).not.toThrow();
    expect(() => checkWithinBounds(q, 100000)).not.toThrow();
  });

  it("on a sum-of-parts question the bounds are a part's: a total above them is accepted, each part is still held to them", () => {
    const q = { lowerBound: 0, upperBound: 50000, aggregation: "sum-of-parts" };
    expect(() => checkWithinBounds(q, 120000)).not.toThrow(); // seven parts of up to 50,000 each (hand)
    let caught: unknown = null;
    try {
      checkWithinBounds(q, -1);
    } catch (err) {
      caught = err;
    }
    expect((caught as InvalidInputError).errors).toEqual([{ field: "outcomeValue", message: "-1 is below the question's lower bound 0" }]);
    expect(() => checkWithinBounds(q, 120000, [{ pseudonym: "A", outcomeValue: 60000 }])).toThrow(InvalidInputError);
  });
});

describe("CSV export cells (formula injection)", () => {
  it("cells starting with = + - @ get a leading apostrophe; plain numbers stay numbers; quoting per RFC 4180", () => {
    expect(csvCell("=1+1")).toBe("'=1+1");
    expect(csvCell("+44 20")).toBe("'+44 20");
    expect(csvCell("-2+3")).toBe("'-2+3");
    expect(csvCell("@SUM(A1)")).toBe("'@SUM(A1)");
    expect(csvCell("\t=x")).toBe("\"'\t=x\"");
    expect(csvCell(-12.5)).toBe("-12.5");
    expect(csvCell("-12.5")).toBe("-12.5");
    expect(csvCell('=HYPERLINK("x","y")')).toBe('"\'=HYPERLINK(""x"",""y"")"');
    expect(csvCell("a,b")).toBe('"a,b"');
    expect(csvCell(NaN)).toBe("");
    expect(csvCell(null)).toBe("");
  });

  it("a whole report never has a cell that starts with a formula character", () => {
    const t = computeTriangulation(sharedInput());
    const csv = reportCsv({
      generatedAt: "",
      summary: "",
      panel: { id: "p", title: "=cmd|' /C calc'!A0", status: "running" },
      question: { id: "q", text: "=1+1", unit: "@units", targetPeriod: "+1", aggregation: "shared", answerFormat: "single", calibration: false },
      performanceWeights: null,
      viewer: { role: "owner", namesShown: false },
      blend: null,
      legs: { panel: null, baseline: null, trackRecord: { panelistsWithRecord: 0, meanFactor: null, panelists: [] } },
      convergence: { rounds: [], verdict: null, recommendation: null, reasons: [] },
      departures: null,
      biasCorrection: [],
      outcome: null,
      movement: null,
      distributions: { panelRaw: null, panelCorrected: null, baseline: null, blend: null },
      methodNotes: ["-note"],
      inputs: [],
      warnings: [],
      cautions: t.cautions,
    });
    const cells = csv.trim().split("\r\n").flatMap((line) => line.split(","));
    expect(cells).toContain("'=1+1");
    expect(cells).toContain("'@units");
    expect(cells.filter((c) => /^"?[=+\-@]/.test(c) && !/^-?\d/.test(c))).toEqual([]);
  });
});
