/**
 * The input policy stated once in lib/blend/index.ts, checked across every exported function:
 * NaN / ±Infinity and empty arrays throw RangeError (past outcomes may be empty), out-of-range
 * values throw RangeError, and undefined statistics come back as NaN.
 */
import { describe, expect, it } from "vitest";
import * as blendLib from "../../lib/blend";

const B = { mean: 100, sd: 10 };
const N = blendLib.normalDistribution(0, 1);

/** One call per exported function with a NaN planted in a numeric input. */
const NAN_CALLS: Record<string, () => unknown> = {
  batesGrangerWeights: () => blendLib.batesGrangerWeights(NaN, 1, 0),
  organiserWeights: () => blendLib.organiserWeights(NaN),
  inverseMseWeights: () => blendLib.inverseMseWeights([{ actual: NaN, panel: 1, baseline: 1 }]),
  optimalWeights: () => blendLib.optimalWeights([{ actual: 1, panel: 1, baseline: NaN }]),
  blendWeights: () => blendLib.blendWeights({ rule: "organiser", panelWeight: NaN }),
  normalDistribution: () => blendLib.normalDistribution(NaN, 1),
  threePointDistribution: () => blendLib.threePointDistribution({ low: 1, mid: NaN, high: 3 }),
  panelFromThreePoint: () => blendLib.panelFromThreePoint([{ low: 1, mid: 2, high: NaN }]),
  panelFromSpread: () => blendLib.panelFromSpread([1, NaN]),
  panelFromParts: () => blendLib.panelFromParts([{ low: NaN, mid: 2, high: 3 }]),
  panelErrorScale: () => blendLib.panelErrorScale([0.1, NaN]),
  panelFromTrackRecord: () => blendLib.panelFromTrackRecord(NaN, blendLib.panelErrorScale([]), 1),
  intervalWidthFactor: () => blendLib.intervalWidthFactor(NaN, 3),
  widenThreePoint: () => blendLib.widenThreePoint({ low: 1, mid: 2, high: 3 }, NaN),
  blendRangeScale: () => blendLib.blendRangeScale([1, NaN]),
  blendErrorCorrelation: () => blendLib.blendErrorCorrelation([{ actual: 1, panel: NaN, baseline: 1 }]),
  weightCredibility: () => blendLib.weightCredibility(NaN),
  baselineDistribution: () => blendLib.baselineDistribution({ mean: 1, sd: NaN }),
  distributionCdf: () => blendLib.distributionCdf(N, NaN),
  distributionDensity: () => blendLib.distributionDensity(N, NaN),
  componentQuantile: () => blendLib.componentQuantile(N, NaN),
  linearPool: () => blendLib.linearPool([{ weight: NaN, distribution: N }]),
  blendDistribution: () => blendLib.blendDistribution(N, N, NaN),
  distributionQuantile: () => blendLib.distributionQuantile(N, NaN),
  blend: () =>
    blendLib.blend({ panelFigure: NaN, baselineFigure: 1, panelDistribution: N, baselineDistribution: N, panelWeight: 0.5 }),
  departure: () => blendLib.departure(NaN, B),
  answerDepartures: () => blendLib.answerDepartures([1, NaN], B),
  departureAcrossRounds: () => blendLib.departureAcrossRounds([NaN], B),
  theilDecomposition: () => blendLib.theilDecomposition([1, 2], [1, NaN]),
  meanLogRatio: () => blendLib.meanLogRatio([NaN], [1]),
  shrunkBiasFactor: () => blendLib.shrunkBiasFactor(NaN, 3),
  intervalHitRate: () => blendLib.intervalHitRate([{ actual: 1, answer: 1, low: NaN, high: 2 }]),
  trackRecord: () => blendLib.trackRecord([{ actual: 1, answer: NaN }]),
  correctAnswer: () => blendLib.correctAnswer(NaN, 1),
  correctThreePoint: () => blendLib.correctThreePoint({ low: 1, mid: 2, high: 3 }, NaN),
  correctedPanelFigure: () => blendLib.correctedPanelFigure([{ answer: NaN, factor: 1 }], "sum-of-parts"),
  scoreFigure: () => blendLib.scoreFigure("x", NaN, 1),
  scoreOutcome: () => blendLib.scoreOutcome(1, { rawPanel: NaN, correctedPanel: 1, baseline: 1, blend: 1 }),
  trackingAlarm: () => blendLib.trackingAlarm([1], NaN),
  accuracyHistory: () =>
    blendLib.accuracyHistory([{ actual: 1, rawPanel: 1, correctedPanel: 1, baseline: 1, blend: NaN }]),
};

describe("policy: NaN anywhere throws RangeError", () => {
  it("covers every exported function that takes a number", () => {
    const fns = Object.entries(blendLib)
      .filter(([, v]) => typeof v === "function")
      .map(([k]) => k)
      .filter((k) => k !== "equalWeights" && k !== "distributionMean" && k !== "distributionVariance" && k !== "distributionSummary");
    expect(Object.keys(NAN_CALLS).sort()).toEqual(fns.sort());
  });
  for (const [name, call] of Object.entries(NAN_CALLS)) {
    it(name, () => expect(call).toThrow(RangeError));
  }
});

describe("policy: empty arrays", () => {
  it("throw RangeError for answers, values, parts and series", () => {
    expect(() => blendLib.panelFromThreePoint([])).toThrow(RangeError);
    expect(() => blendLib.panelFromSpread([])).toThrow(RangeError);
    expect(() => blendLib.panelFromParts([])).toThrow(RangeError);
    expect(() => blendLib.linearPool([])).toThrow(RangeError);
    expect(() => blendLib.answerDepartures([], B)).toThrow(RangeError);
    expect(() => blendLib.departureAcrossRounds([], B)).toThrow(RangeError);
    expect(() => blendLib.theilDecomposition([], [])).toThrow(RangeError);
    expect(() => blendLib.meanLogRatio([], [])).toThrow(RangeError);
    expect(() => blendLib.correctedPanelFigure([], "shared-quantity")).toThrow(RangeError);
    expect(() => blendLib.trackingAlarm([])).toThrow(RangeError);
    expect(() => blendLib.accuracyHistory([])).toThrow(RangeError);
  });

  it("past outcomes may be empty: equal weights, factor 1, count 0", () => {
    expect(blendLib.inverseMseWeights([]).applied).toBe("equal");
    expect(blendLib.optimalWeights([]).applied).toBe("equal");
    expect(blendLib.trackRecord([]).bias.factor).toBe(1);
    expect(blendLib.intervalHitRate([]).count).toBe(0);
  });
});

describe("policy: out-of-range values throw, undefined statistics are NaN", () => {
  it("out of range", () => {
    expect(() => blendLib.organiserWeights(1.01)).toThrow(RangeError);
    expect(() => blendLib.distributionQuantile(N, -0.1)).toThrow(RangeError);
    expect(() => blendLib.normalDistribution(0, -1)).toThrow(RangeError);
    expect(() => blendLib.baselineDistribution({ mean: 1, sd: 0 })).toThrow(RangeError);
    expect(() => blendLib.threePointDistribution({ low: 3, mid: 2, high: 4 })).toThrow(RangeError);
    expect(() => blendLib.meanLogRatio([1], [0])).toThrow(RangeError);
    expect(() => blendLib.correctAnswer(1, -1)).toThrow(RangeError);
    expect(() => blendLib.departure(1, { mean: 1, lower80: 2, upper80: 1 })).toThrow(RangeError);
  });

  it("undefined statistics", () => {
    expect(blendLib.departure(1, { mean: 0, sd: 1 }).percent).toBeNaN();
    expect(blendLib.scoreFigure("x", 0, 1).absolutePercentError).toBeNaN();
    expect(blendLib.theilDecomposition([1, 2], [1, 2]).um).toBeNaN();
    expect(blendLib.batesGrangerWeights(1, 1, 1).w1).toBeNaN();
  });
});
