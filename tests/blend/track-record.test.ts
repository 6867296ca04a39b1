import { describe, expect, it } from "vitest";
import {
  BIAS_PRIOR_STRENGTH,
  MIN_OUTCOMES_FOR_THEIL,
  correctAnswer,
  correctThreePoint,
  correctedPanelFigure,
  intervalHitRate,
  meanLogRatio,
  shrunkBiasFactor,
  theilDecomposition,
  trackRecord,
  type AnswerOutcome,
} from "../../lib/blend";
import { referenceCsv } from "../stats/reference-data";
import { runR, rVector } from "../stats/rscript";

describe("theilDecomposition (Theil 1966) on the gretl 5-observation example, docs/methods.md §5b", () => {
  const { actual, forecast } = referenceCsv("gretl_forecast_eval_5obs.csv");

  it("reproduces gretl's printed UM 0.06394, UR 0.13557, UD 0.80049 and MSE 218.61 [SOURCE: gretl output]", () => {
    const t = theilDecomposition(actual, forecast);
    // Printed to 5 decimals (MSE to 2): tolerance half a unit in the last printed place.
    expect(Math.abs(t.um - 0.06394)).toBeLessThanOrEqual(0.000005);
    expect(Math.abs(t.ur - 0.13557)).toBeLessThanOrEqual(0.000005);
    expect(Math.abs(t.ud - 0.80049)).toBeLessThanOrEqual(0.000005);
    expect(Math.abs(t.mse - 218.61)).toBeLessThanOrEqual(0.005);
    expect(t.n).toBe(5);
  });

  it("matches the recomputed UM/UR/UD/US/UC of §5b [RECOMPUTED] and each split sums to one", () => {
    const t = theilDecomposition(actual, forecast);
    expect(t.um).toBeCloseTo(0.0639404433, 9);
    expect(t.ur).toBeCloseTo(0.1355709749, 9);
    expect(t.ud).toBeCloseTo(0.8004885818, 9);
    expect(t.us).toBeCloseTo(0.3709859841, 9);
    expect(t.uc).toBeCloseTo(0.5650735726, 9);
    expect(t.um + t.ur + t.ud).toBeCloseTo(1, 13);
    expect(t.um + t.us + t.uc).toBeCloseTo(1, 13);
  });

  it("agrees with R on another series (population SDs, cor()) and its proportions sum to one", () => {
    const a = [120, 95, 143, 110, 87, 132, 150];
    const p = [112, 101, 130, 118, 80, 140, 139];
    const [r] = runR(`a <- ${rVector(a)}; p <- ${rVector(p)}; n <- length(a)
sa <- sqrt(mean((a - mean(a))^2)); sp <- sqrt(mean((p - mean(p))^2)); rr <- cor(a, p); mse <- mean((a - p)^2)
out(c(mse, (mean(p) - mean(a))^2 / mse, (sp - rr * sa)^2 / mse, (1 - rr^2) * sa^2 / mse, (sp - sa)^2 / mse, 2 * (1 - rr) * sp * sa / mse, rr))`);
    const t = theilDecomposition(a, p);
    [t.mse, t.um, t.ur, t.ud, t.us, t.uc, t.r].forEach((v, i) => expect(Math.abs(v - r[i])).toBeLessThan(1e-12 * Math.max(1, Math.abs(r[i]))));
  });

  it("undefined cases are NaN: a perfect record, or a constant series (no correlation)", () => {
    const perfect = theilDecomposition([1, 2, 3], [1, 2, 3]);
    expect(perfect.mse).toBe(0);
    expect(perfect.um).toBeNaN();
    const flat = theilDecomposition([5, 5, 5], [4, 6, 5]);
    expect(flat.r).toBeNaN();
    expect(flat.ud).toBeNaN();
    expect(flat.um).toBe(0); // hand: both means are 5
    expect(() => theilDecomposition([1, 2], [1])).toThrow(/pair up/);
    expect(() => theilDecomposition([], [])).toThrow(RangeError);
    expect(() => theilDecomposition([1, NaN], [1, 2])).toThrow(/actual\[1\]/);
  });
});

// An invented track record: a panelist who tends to answer low.
const RECORD: readonly AnswerOutcome[] = Object.freeze([
  Object.freeze({ actual: 100, answer: 80, low: 70, high: 95 }),
  Object.freeze({ actual: 130, answer: 120, low: 100, high: 140 }),
  Object.freeze({ actual: 110, answer: 95, low: 85, high: 110 }),
  Object.freeze({ actual: 75, answer: 60, low: 50, high: 70 }),
  Object.freeze({ actual: 160, answer: 150, low: 120, high: 175 }),
  Object.freeze({ actual: 48, answer: 52 }),
]);

/** The bias factor computed in the test by a plain loop from the formula exp(n/(n + n0)·mean ln(a/f)). */
function loopFactor(records: readonly AnswerOutcome[], n0: number): { mlr: number; factor: number } {
  let s = 0;
  for (const r of records) s += Math.log(r.actual / r.answer);
  const n = records.length;
  const mlr = s / n;
  return { mlr, factor: Math.exp((n / (n + n0)) * mlr) };
}

describe("track record and bias factor on an invented record", () => {
  it("bias factor = exp(n/(n + n0)·mean log ratio), n0 = 5, computed independently by a loop and by R", () => {
    expect(BIAS_PRIOR_STRENGTH).toBe(5);
    const t = trackRecord(RECORD);
    const hand = loopFactor(RECORD, 5);
    const a = RECORD.map((r) => r.actual);
    const f = RECORD.map((r) => r.answer);
    const [[rMlr, rFactor, rMe, rMape]] = runR(`a <- ${rVector(a)}; f <- ${rVector(f)}
m <- mean(log(a / f)); n <- length(a)
out(c(m, exp(n / (n + 5) * m), mean(a - f), mean(abs(100 * (a - f) / a))))`);
    expect(t.count).toBe(6);
    expect(t.meanLogRatio).toBeCloseTo(hand.mlr, 14);
    expect(t.meanLogRatio).toBeCloseTo(rMlr, 14);
    expect(t.bias.factor).toBeCloseTo(hand.factor, 14);
    expect(t.bias.factor).toBeCloseTo(rFactor, 14);
    expect(t.bias.credibility).toBeCloseTo(6 / 11, 15);
    expect(t.bias.raw).toBeCloseTo(Math.exp(hand.mlr), 14);
    expect(t.bias.factor).toBeGreaterThan(1); // answered low → corrections raise answers
    expect(t.bias.factor).toBeLessThan(t.bias.raw); // shrunk toward 1
    expect(t.meanError).toBeCloseTo(rMe, 12);
    expect(t.mape).toBeCloseTo(rMape, 12);
  });

  it("a different prior strength changes the shrinkage as the loop says", () => {
    const t = trackRecord(RECORD, { priorStrength: 2 });
    expect(t.bias.factor).toBeCloseTo(loopFactor(RECORD, 2).factor, 14);
    expect(shrunkBiasFactor(Math.log(1.2), 5).factor).toBeCloseTo(Math.sqrt(1.2), 14); // hand: Z = 1/2
  });

  it("interval hit rate counts actuals within [P10, P90] of three-point answers only (hand count: 3 of 5)", () => {
    // 100 ∉ [70, 95]; 130 ∈ [100, 140]; 110 ∈ [85, 110] (bound included); 75 ∉ [50, 70]; 160 ∈ [120, 175].
    const h = intervalHitRate(RECORD);
    expect(h).toEqual({ count: 5, hits: 3, rate: 0.6, nominal: 0.8 });
  });

  it(`Theil's decomposition only from ${MIN_OUTCOMES_FOR_THEIL} questions with an outcome on, with a note otherwise`, () => {
    const few = trackRecord(RECORD.slice(0, 4));
    expect(few.theil).toBeNull();
    expect(few.theilNote).toContain(`at least ${MIN_OUTCOMES_FOR_THEIL}`);
    const enough = trackRecord(RECORD);
    expect(enough.theil).not.toBeNull();
    expect(enough.theil!.um + enough.theil!.ur + enough.theil!.ud).toBeCloseTo(1, 13);
    expect(enough.theilNote).toBe("");
  });

  it("an empty record is expected, not an error: count 0, NaN measures, factor 1", () => {
    const t = trackRecord([]);
    expect(t.count).toBe(0);
    expect(t.meanError).toBeNaN();
    expect(t.mape).toBeNaN();
    expect(t.bias.factor).toBe(1);
    expect(t.bias.credibility).toBe(0);
    expect(t.intervalHitRate.rate).toBeNaN();
    expect(t.theil).toBeNull();
  });

  it("policy: non-positive or non-finite values, and malformed intervals, throw RangeError", () => {
    expect(() => trackRecord([{ actual: 0, answer: 5 }])).toThrow(/actual\[0\]/);
    expect(() => trackRecord([{ actual: 5, answer: -1 }])).toThrow(/answer\[0\]/);
    expect(() => trackRecord([{ actual: NaN, answer: 1 }])).toThrow(/records\[0\]\.actual/);
    expect(() => trackRecord([{ actual: 5, answer: 4, low: 3 }])).toThrow(/only one of low and high/);
    expect(() => trackRecord([{ actual: 5, answer: 4, low: 4.5, high: 6 }])).toThrow(/low ≤ answer ≤ high/);
    expect(() => meanLogRatio([1, 2], [1])).toThrow(/pair up/);
    expect(() => shrunkBiasFactor(0.1, 2.5)).toThrow(/whole number/);
    expect(() => shrunkBiasFactor(0.1, 3, 0)).toThrow(/priorStrength/);
  });
});

describe("corrected answers and the corrected panel figure", () => {
  const parts = Object.freeze([
    { answer: 100, factor: 1.1 },
    { answer: 200, factor: 0.9 },
    { answer: 50, factor: 1.25 },
  ]);

  it("sum of parts: corrected total = sum of corrected parts (hand: 110 + 180 + 62.5 = 352.5; raw 350)", () => {
    const r = correctedPanelFigure(parts, "sum-of-parts");
    expect(r.raw).toBe(350);
    expect(r.corrected).toBeCloseTo(352.5, 12);
    expect(r.correctedAnswers[0]).toBeCloseTo(110, 12);
    expect(r.correctedAnswers[1]).toBeCloseTo(180, 12);
    expect(r.correctedAnswers[2]).toBe(62.5);
  });

  it("shared quantity: median of raw (100) and of corrected answers (hand: median of 110, 180, 62.5 = 110)", () => {
    const r = correctedPanelFigure(parts, "shared-quantity");
    expect(r.raw).toBe(100);
    expect(r.corrected).toBeCloseTo(110, 12);
  });

  it("correctAnswer multiplies; bad factors and modes throw", () => {
    expect(correctAnswer(80, 1.25)).toBe(100);
    expect(correctThreePoint({ low: 40, mid: 80, high: 120 }, 1.25)).toEqual({ low: 50, mid: 100, high: 150 });
    expect(() => correctThreePoint({ low: 40, mid: NaN, high: 120 }, 1.25)).toThrow(/mid/);
    expect(() => correctAnswer(80, 0)).toThrow(/factor/);
    expect(() => correctedPanelFigure([], "sum-of-parts")).toThrow(RangeError);
    expect(() => correctedPanelFigure(parts, "mean" as never)).toThrow(/mode/);
    expect(() => correctedPanelFigure([{ answer: 1, factor: NaN }], "sum-of-parts")).toThrow(/answers\[0\]\.factor/);
  });
});
