/**
 * One hostile value stored before the input rule (lib/blend/magnitude.ts) must not break every
 * derived record: an answer of 5e-324 (IEEE 754 binary64's smallest subnormal, 2^-1074, so
 * ln(100 / 5e-324) = Infinity) or figures of ±1e308 (whose sums overflow) are left out of track
 * records and the accuracy history and counted, and the other answers give the same record as
 * without them. Expected values: natural logs and means by hand (ln 1.1 = 0.0953101798043249,
 * ln 0.9 = −0.1053605156578263, Abramowitz & Stegun Table 4.2).
 */
import { describe, expect, it } from "vitest";
import { accuracyHistory, trackRecord } from "../../lib/blend";
import { historyOf, recordsByMember, type RecordedOutcome } from "../../lib/triangulation/track-records";

/** A stored outcome whose panel figures and one panelist's ("m") answer are all `figure`. */
function withOutcome(actual: number, figure: number): RecordedOutcome {
  return {
    questionId: `q${actual}`,
    panelId: "p",
    panelTitle: "t",
    text: "x",
    unit: "units",
    recordedAt: new Date(0),
    outcomeValue: actual,
    partOutcomes: [],
    figures: {
      round: 1,
      aggregation: "shared",
      answerFormat: "single",
      rawPanel: figure,
      correctedPanel: figure,
      baseline: figure,
      blend: figure,
      panelWeight: 0.5,
      weightRule: "equal",
      baselineTraining: [],
      baselineSeason: 1,
      panelists: [{ invitationId: `i${actual}`, rosterMemberId: "m", pseudonym: "P1", value: figure, low: null, high: null, factor: 1 }],
    },
  };
}

describe("track records skip and count unusable pairs", () => {
  it("an answer of 5e-324 is left out and counted; the others give the record by hand", () => {
    const rec = trackRecord([
      { actual: 100, answer: 5e-324 },
      { actual: 110, answer: 100 },
      { actual: 90, answer: 100 },
    ]);
    expect(rec.count).toBe(2);
    expect(rec.skipped).toBe(1);
    // (ln 1.1 + ln 0.9) / 2 = (0.0953101798043249 − 0.1053605156578263) / 2
    expect(rec.meanLogRatio).toBeCloseTo(-0.0050251679267507, 15);
    // mean of actual − answer: (10 − 10) / 2 = 0
    expect(rec.meanError).toBe(0);
    // bias factor exp(Z·m), Z = 2 / (2 + 5) (BIAS_PRIOR_STRENGTH = 5): exp(−0.0014357622647859) = 0.998565267...
    expect(rec.bias.factor).toBeCloseTo(0.9985652679, 9);
  });

  it("values of 1e308 and out-of-range three-point values are left out as well", () => {
    const rec = trackRecord([
      { actual: 1e308, answer: 1e308 },
      { actual: 50, answer: 40, low: 1e-300, high: 60 },
    ]);
    expect(rec.count).toBe(0);
    expect(rec.skipped).toBe(2);
    expect(rec.bias.factor).toBe(1);
  });

  it("through the stored outcomes: the member's skipped count includes it", () => {
    const records = recordsByMember([withOutcome(100, 5e-324), withOutcome(110, 100)]).get("m")!.records;
    const rec = trackRecord(records);
    expect([rec.count, rec.skipped]).toEqual([1, 1]);
    expect(rec.meanLogRatio).toBeCloseTo(0.0953101798043249, 15); // ln 1.1
  });
});

describe("the accuracy history leaves out questions whose figures would overflow", () => {

  it("a question with figures of −1e308 against an actual of 1e308 is counted, not used", () => {
    const h = historyOf([withOutcome(1e308, -1e308), withOutcome(110, 100), withOutcome(90, 100)]);
    expect(h.unusable).toBe(1);
    expect(h.entries).toHaveLength(2);
    const a = accuracyHistory(h.entries).rawPanel.accuracy;
    // ME = ((110 − 100) + (90 − 100)) / 2 = 0; MAE = 10; MAPE = (10/110 + 10/90)·100/2 = 10.1010101...
    expect(a.me).toBe(0);
    expect(a.mae).toBe(10);
    expect(a.mape).toBeCloseTo(10.1010101010101, 10);
  });

  it("an actual of 5e-324 is counted, not used", () => {
    const h = historyOf([withOutcome(5e-324, 100), withOutcome(110, 100)]);
    expect([h.unusable, h.entries.length]).toEqual([1, 1]);
  });
});
