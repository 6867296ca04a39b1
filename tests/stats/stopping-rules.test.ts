/**
 * Stopping rules (lib/stats/stopping-rules.ts). Expected values: REFERENCES.md §6 check values
 * for ratings 3,4,4,5,5,5,6,7 (CV 0.255676, type-7 IQR 1.25, median 5 — computed in R), R
 * via Rscript, and hand computations from Δ = |T_r − T_{r−1}| / |T_{r−1}|, named beside each.
 */
import { describe, expect, it } from "vitest";
import {
  STOPPING_RULE_DEFAULTS,
  evaluateStoppingRules,
  relativeChange,
  type QuestionRoundFigures,
  type StoppingRuleConfig,
} from "../../lib/stats/stopping-rules";
import { summarise } from "../../lib/stats/summary";
import { runR, rVector } from "./rscript";

const config: StoppingRuleConfig = { consensusMeasure: "cv", consensusThreshold: 0.5, stabilityThreshold: 0.15, roundLimit: 3 };

function figures(id: string, values: readonly number[], aggregation: "shared" | "sum-of-parts" = "shared"): QuestionRoundFigures {
  const s = summarise(values);
  return {
    questionId: id,
    aggregation,
    n: s.n,
    median: s.median,
    iqr: s.iqr,
    relativeIqr: s.relativeIqr,
    cv: s.cv,
    total: values.reduce((a, b) => a + b, 0),
  };
}

describe("relativeChange", () => {
  it("is |cur − prev| / |prev| (hand: 100 → 110 is 0.1; −50 → −40 is 0.2)", () => {
    expect(relativeChange(100, 110)).toBeCloseTo(0.1, 15);
    expect(relativeChange(-50, -40)).toBeCloseTo(0.2, 15);
  });
  it("is 0 from 0 to 0, ∞ from 0 to anything else, null when missing", () => {
    expect(relativeChange(0, 0)).toBe(0);
    expect(relativeChange(0, 3)).toBe(Infinity);
    expect(relativeChange(null, 3)).toBeNull();
  });
});

describe("consensus", () => {
  const ratings = [3, 4, 4, 5, 5, 5, 6, 7];
  it("CV of 3,4,4,5,5,5,6,7 is 0.255676 (REFERENCES.md §6) and meets CV ≤ 0.5", () => {
    const e = evaluateStoppingRules({ roundNumber: 1, current: [figures("q", ratings)], previous: null, config });
    expect(Math.abs(e.questions[0].consensus.value! - 0.255676)).toBeLessThan(1e-6); // printed to 6 decimals
    expect(e.questions[0].consensus.met).toBe(true);
    expect(e.questions[0].stability.applicable).toBe(false);
  });
  it("relative IQR of the same ratings is 1.25 / 5 = 0.25 (REFERENCES.md §6 type-7 IQR); not met at 0.2", () => {
    const e = evaluateStoppingRules({
      roundNumber: 1,
      current: [figures("q", ratings)],
      previous: null,
      config: { ...config, consensusMeasure: "relative-iqr", consensusThreshold: 0.2 },
    });
    expect(e.questions[0].consensus.value).toBeCloseTo(0.25, 14);
    expect(e.questions[0].consensus.met).toBe(false);
    expect(e.recommendation).toBe("another-round");
  });
  it("CV against R's sd/mean for wide answers: 0.8-ish spread fails CV ≤ 0.5", () => {
    const wide = [2000, 9000, 15000, 30000, 41000];
    const [[cv]] = runR(`x <- ${rVector(wide)}; out(sd(x) / mean(x))`);
    const e = evaluateStoppingRules({ roundNumber: 1, current: [figures("q", wide)], previous: null, config });
    expect(e.questions[0].consensus.value).toBeCloseTo(cv, 12);
    expect(cv).toBeGreaterThan(0.5);
    expect(e.questions[0].consensus.met).toBe(false);
  });
  it("does not apply to sum-of-parts questions", () => {
    const e = evaluateStoppingRules({ roundNumber: 1, current: [figures("q", [1, 2, 3], "sum-of-parts")], previous: null, config });
    expect(e.questions[0].consensus.applicable).toBe(false);
    expect(e.questions[0].consensus.met).toBe(false);
  });
});

describe("stability", () => {
  it("compares median and IQR with the previous round (R: median and IQR of both rounds)", () => {
    const r1 = [10000, 12000, 14000, 15000, 20000];
    const r2 = [11000, 12500, 13500, 14500, 16000];
    const [[m1, i1, m2, i2]] = runR(`a <- ${rVector(r1)}; b <- ${rVector(r2)}; out(c(median(a), IQR(a), median(b), IQR(b)))`);
    const e = evaluateStoppingRules({ roundNumber: 2, current: [figures("q", r2)], previous: [figures("q", r1)], config });
    const s = e.questions[0].stability;
    expect(s.medianChange).toBeCloseTo(Math.abs(m2 - m1) / m1, 14);
    expect(s.iqrChange).toBeCloseTo(Math.abs(i2 - i1) / i1, 14);
    // hand: median 14000 → 13500 is 0.0357; IQR 3000 → 2000 is 0.333 > 0.15: not stable.
    expect(s.iqrChange).toBeCloseTo(1 / 3, 14);
    expect(s.met).toBe(false);
  });
  it("is met when both move by at most the threshold (hand: 100→110, IQR 40→36: both 0.1 ≤ 0.15)", () => {
    const prev: QuestionRoundFigures = { questionId: "q", aggregation: "shared", n: 5, median: 100, iqr: 40, relativeIqr: 0.4, cv: 0.9, total: null };
    const cur: QuestionRoundFigures = { ...prev, median: 110, iqr: 36, relativeIqr: 36 / 110, cv: 0.9 };
    const e = evaluateStoppingRules({ roundNumber: 2, current: [cur], previous: [prev], config });
    expect(e.questions[0].stability.met).toBe(true);
    expect(e.questions[0].consensus.met).toBe(false);
    expect(e.questions[0].settled).toBe(true);
    expect(e.recommendation).toBe("stop");
    const strict = evaluateStoppingRules({ roundNumber: 2, current: [cur], previous: [prev], config: { ...config, stabilityThreshold: 0.05 } });
    expect(strict.questions[0].stability.met).toBe(false);
    expect(strict.recommendation).toBe("another-round");
  });
  it("judges a sum-of-parts question on its total (hand: 100 → 112 is 0.12)", () => {
    const prev: QuestionRoundFigures = { questionId: "q", aggregation: "sum-of-parts", n: 3, median: 30, iqr: 10, relativeIqr: 1 / 3, cv: 0.5, total: 100 };
    const cur = { ...prev, total: 112 };
    const e = evaluateStoppingRules({ roundNumber: 2, current: [cur], previous: [prev], config });
    expect(e.questions[0].stability.totalChange).toBeCloseTo(0.12, 14);
    expect(e.questions[0].stability.met).toBe(true);
  });
});

describe("round limit and recommendation", () => {
  it("recommends stopping at the round limit even without consensus", () => {
    const wide = figures("q", [1, 50, 100]);
    const e = evaluateStoppingRules({ roundNumber: 3, current: [wide], previous: [figures("q", [1, 80, 300])], config });
    expect(e.roundLimit).toEqual({ limit: 3, roundNumber: 3, met: true });
    expect(e.recommendation).toBe("stop");
    expect(e.reasons[0]).toMatch(/round limit of 3/);
  });
  it("needs every question settled", () => {
    const tight = figures("a", [3, 4, 4, 5, 5, 5, 6, 7]);
    const wide = figures("b", [1, 50, 100]);
    const e = evaluateStoppingRules({ roundNumber: 1, current: [tight, wide], previous: null, config });
    expect(e.questions.map((q) => q.settled)).toEqual([true, false]);
    expect(e.recommendation).toBe("another-round");
  });
});

describe("defaults", () => {
  it("are CV ≤ 0.5, 15% stability and 3 rounds, with sources and verified flags as REFERENCES.md §6", () => {
    expect(STOPPING_RULE_DEFAULTS.consensusThreshold.cv.value).toBe(0.5);
    expect(STOPPING_RULE_DEFAULTS.consensusThreshold.cv.verified).toBe(false);
    expect(STOPPING_RULE_DEFAULTS.stabilityThreshold.value).toBe(0.15);
    expect(STOPPING_RULE_DEFAULTS.stabilityThreshold.source).toMatch(/Scheibe, M., Skutsch, M. and Schofer, J. \(1975\)/);
    expect(STOPPING_RULE_DEFAULTS.stabilityThreshold.verified).toBe(false);
    expect(STOPPING_RULE_DEFAULTS.roundLimit.value).toBe(3);
    expect(STOPPING_RULE_DEFAULTS.roundLimit.verified).toBe(true);
    expect(STOPPING_RULE_DEFAULTS.consensusMeasure.source).toMatch(/English.*Kernan.*1976/);
  });
});
