/**
 * Stopping rules (lib/stats/stopping-rules.ts). Expected values: docs/methods.md §6 check values
 * for ratings 3,4,4,5,5,5,6,7 (CV 0.255676, type-7 IQR 1.25, median 5 — computed in R), R
 * via Rscript, and hand computations from Δ = |T_r − T_{r−1}| / |T_{r−1}| and from the
 * distribution change ½·Σ|p_k − p'_k| over the previous round's quartile classes (after Scheibe,
 * Skutsch & Schofer 1975), named beside each. The order of the rules — stability decides,
 * consensus alone never stops — is Dajani, Sincoff & Talley (1979) and von der Gracht (2012).
 */
import { describe, expect, it } from "vitest";
import {
  STOPPING_RULE_DEFAULTS,
  consensusApplies,
  distributionChange,
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
    values,
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
  it("CV of 3,4,4,5,5,5,6,7 is 0.255676 (docs/methods.md §6) and meets CV ≤ 0.5, yet consensus alone does not stop (von der Gracht 2012)", () => {
    const e = evaluateStoppingRules({ roundNumber: 1, current: [figures("q", ratings)], previous: null, config });
    expect(Math.abs(e.questions[0].consensus.value! - 0.255676)).toBeLessThan(1e-6); // printed to 6 decimals
    expect(e.questions[0].consensus.met).toBe(true);
    expect(e.questions[0].stability.applicable).toBe(false);
    expect(e.questions[0].settled).toBe(false);
    expect(e.recommendation).toBe("another-round");
    expect(e.reasons.join(" ")).toMatch(/consensus alone does not stop/);
  });
  it("relative IQR of the same ratings is 1.25 / 5 = 0.25 (docs/methods.md §6 type-7 IQR); not met at 0.2", () => {
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
  it("does not apply to sum-of-parts questions (one function decides, for the verdict and the tables)", () => {
    const e = evaluateStoppingRules({ roundNumber: 1, current: [figures("q", [1, 2, 3], "sum-of-parts")], previous: null, config });
    expect(e.questions[0].consensus.applicable).toBe(false);
    expect(e.questions[0].consensus.met).toBe(false);
    expect(consensusApplies("sum-of-parts")).toBe(false);
    expect(consensusApplies("shared")).toBe(true);
  });
  it("issue 12: the defaults do not settle answers from 9,000 to 30,000 after round 1 (R: IQR/median type 7)", () => {
    const wide = [9000, 14000, 19500, 25000, 30000];
    const [[rel, cv]] = runR(`x <- ${rVector(wide)}; out(c(IQR(x) / median(x), sd(x) / mean(x)))`);
    const defaults: StoppingRuleConfig = {
      consensusMeasure: STOPPING_RULE_DEFAULTS.consensusMeasure.value,
      consensusThreshold: STOPPING_RULE_DEFAULTS.consensusThreshold["relative-iqr"].value,
      stabilityThreshold: STOPPING_RULE_DEFAULTS.stabilityThreshold.value,
      roundLimit: STOPPING_RULE_DEFAULTS.roundLimit.value,
    };
    const e = evaluateStoppingRules({ roundNumber: 1, current: [figures("q", wide)], previous: null, config: defaults });
    expect(e.questions[0].consensus.measure).toBe("relative-iqr");
    expect(e.questions[0].consensus.value).toBeCloseTo(rel, 12);
    expect(e.questions[0].consensus.met).toBe(false);
    expect(e.recommendation).toBe("another-round");
    // The old default, CV ≤ 0.5, would have called this spread agreement (R's sd/mean < 0.5).
    expect(cv).toBeLessThan(0.5);
  });
});

describe("stability: the change in the response distribution, not in the median (after Scheibe, Skutsch & Schofer 1975)", () => {
  it("distributionChange agrees with R: findInterval over the previous round's type-7 quartiles, ½·Σ|Δ share|", () => {
    const r1 = [10, 20, 30, 40, 50];
    const r2 = [22, 28, 30, 35, 60];
    const [[d]] = runR(`a <- ${rVector(r1)}; b <- ${rVector(r2)}; q <- quantile(a, c(0.25, 0.5, 0.75), type = 7)
      sh <- function(x) tabulate(findInterval(x, q, left.open = TRUE) + 1, 4) / length(x)
      out(0.5 * sum(abs(sh(b) - sh(a))))`);
    expect(distributionChange(r1, r2)).toBeCloseTo(d, 15);
    // Hand: classes ≤20, (20,30], (30,40], >40 hold 2,1,1,1 then 0,3,1,1 of 5 → ½(0.4 + 0.4) = 0.4.
    expect(distributionChange(r1, r2)).toBeCloseTo(0.4, 15);
    expect(distributionChange(r1, r1)).toBe(0);
    expect(distributionChange([], r1)).toBeNull();
  });
  it("same median and IQR, but one panelist in five changed class: 20% > 15%, not stable (hand)", () => {
    const r1 = [10, 20, 30, 40, 50];
    const r2 = [20, 20, 30, 40, 40];
    const e = evaluateStoppingRules({ roundNumber: 2, current: [figures("q", r2)], previous: [figures("q", r1)], config });
    const s = e.questions[0].stability;
    expect(s.medianChange).toBe(0);
    expect(s.iqrChange).toBe(0);
    expect(s.distributionChange).toBeCloseTo(0.2, 15);
    expect(s.met).toBe(false);
    expect(e.recommendation).toBe("another-round");
  });
  it("stable answers settle a question even without consensus: stop, and say the spread is the finding (Dajani et al. 1979)", () => {
    const r = [9000, 14000, 19500, 25000, 30000];
    const r2 = [9500, 14000, 19000, 25500, 29000];
    const e = evaluateStoppingRules({ roundNumber: 2, current: [figures("q", r2)], previous: [figures("q", r)], config: { ...config, consensusMeasure: "relative-iqr", consensusThreshold: 0.25 } });
    // Hand: classes ≤14000, (14000,19500], (19500,25000], >25000 hold 2,1,1,1 then 2,1,0,2 of 5 → ½(0.2 + 0.2) = 0.2.
    expect(e.questions[0].stability.distributionChange).toBeCloseTo(0.2, 15);
    expect(e.questions[0].settled).toBe(false);
    const r3 = [9500, 14000, 19000, 25000, 29000];
    const e3 = evaluateStoppingRules({ roundNumber: 2, current: [figures("q", r3)], previous: [figures("q", r)], config: { ...config, consensusMeasure: "relative-iqr", consensusThreshold: 0.25 } });
    expect(e3.questions[0].stability.distributionChange).toBe(0); // hand: every answer stays in its class
    expect(e3.questions[0].consensus.met).toBe(false);
    expect(e3.questions[0].settled).toBe(true);
    expect(e3.recommendation).toBe("stop");
    expect(e3.reasons.join(" ")).toMatch(/not reached consensus: report the spread of views/);
  });
  it("without the answers there is no distribution change, so stability is not met", () => {
    const prev: QuestionRoundFigures = { questionId: "q", aggregation: "shared", n: 5, median: 100, iqr: 40, relativeIqr: 0.4, cv: 0.9, total: null };
    const cur: QuestionRoundFigures = { ...prev, median: 110 };
    const e = evaluateStoppingRules({ roundNumber: 2, current: [cur], previous: [prev], config });
    expect(e.questions[0].stability.distributionChange).toBeNull();
    expect(e.questions[0].stability.met).toBe(false);
  });
  it("judges a sum-of-parts question on its total (hand: 100 → 112 is 0.12)", () => {
    const prev: QuestionRoundFigures = { questionId: "q", aggregation: "sum-of-parts", n: 3, median: 30, iqr: 10, relativeIqr: 1 / 3, cv: 0.5, total: 100 };
    const cur = { ...prev, total: 112 };
    const e = evaluateStoppingRules({ roundNumber: 2, current: [cur], previous: [prev], config });
    expect(e.questions[0].stability.totalChange).toBeCloseTo(0.12, 14);
    expect(e.questions[0].stability.distributionChange).toBeNull();
    expect(e.questions[0].stability.met).toBe(true);
    const strict = evaluateStoppingRules({ roundNumber: 2, current: [cur], previous: [prev], config: { ...config, stabilityThreshold: 0.05 } });
    expect(strict.questions[0].stability.met).toBe(false);
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
  it("needs every question stable", () => {
    const same = [3, 4, 4, 5, 5, 5, 6, 7];
    const e = evaluateStoppingRules({
      roundNumber: 2,
      current: [figures("a", same), figures("b", [1, 50, 100])],
      previous: [figures("a", same), figures("b", [1, 20, 30])],
      config,
    });
    // Hand: b's previous quartile classes ≤10.5, (10.5,20], (20,25], >25 hold 1,1,0,1 then 1,0,0,2 → ½(1/3 + 1/3) = 1/3.
    expect(e.questions[1].stability.distributionChange).toBeCloseTo(1 / 3, 15);
    expect(e.questions.map((q) => q.settled)).toEqual([true, false]);
    expect(e.recommendation).toBe("another-round");
  });
});

describe("defaults", () => {
  it("are relative IQR ≤ 0.25 (project convention), 15% stability and 3 rounds, with sources and verified flags as docs/methods.md §6", () => {
    expect(STOPPING_RULE_DEFAULTS.consensusMeasure.value).toBe("relative-iqr");
    expect(STOPPING_RULE_DEFAULTS.consensusThreshold["relative-iqr"].value).toBe(0.25);
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
