/**
 * Round statistics of a question (lib/panels/round-statistics.ts) against R: quantile(type = 7),
 * median, IQR, mean, sd, min, max on the same answers (run through Rscript).
 */
import { describe, expect, it } from "vitest";
import { computeQuestionStatistics, type FinalAnswer } from "../../lib/panels/round-statistics";
import { poolThreePoint } from "../../lib/stats/three-point";
import { expectClose, runR, rVector } from "../stats/rscript";

function rSummary(values: readonly number[]): number[] {
  const [line] = runR(`
    x <- ${rVector(values)}
    q <- quantile(x, c(0.25, 0.5, 0.75), type = 7, names = FALSE)
    out(c(length(x), mean(x), sd(x), sd(x) / mean(x), min(x), max(x), q[1], median(x), q[3], IQR(x), IQR(x) / abs(median(x))))
  `);
  return line;
}

const asArray = (s: Record<string, number | null> | null) =>
  s ? [s.n, s.mean, s.sd, s.cv, s.min, s.max, s.q1, s.median, s.q3, s.iqr, s.relativeIqr].map((v) => v ?? Number.NaN) : [];

const single = (vals: number[]): FinalAnswer[] => vals.map((v, i) => ({ pseudonym: `P${i}`, value: v, low: null, high: null }));

describe("computeQuestionStatistics", () => {
  it("single values: every figure equals R's", () => {
    const vals = [12000, 15500, 9800, 21000, 14250, 13000, 17600];
    const s = computeQuestionStatistics({ id: "q1", answerFormat: "single", aggregation: "shared" }, 1, single(vals));
    expect(s.n).toBe(7);
    expectClose(asArray(s.values), rSummary(vals), 1e-12, "single values vs R");
    expect(s.lows).toBeNull();
    expect(s.pooled).toBeNull();
    expect(s.sumOfParts).toBeNull();
  });

  it("three-point: median estimates (P50), lows and highs each equal R's; pooled is the opinion pool", () => {
    const ans: FinalAnswer[] = [
      { pseudonym: "A", value: 12000, low: 9000, high: 18000 },
      { pseudonym: "B", value: 14000, low: 10000, high: 16000 },
      { pseudonym: "C", value: 11000, low: 6000, high: 20000 },
      { pseudonym: "D", value: 15000, low: 12000, high: 19000 },
      { pseudonym: "E", value: 10500, low: 8000, high: 14000 },
    ];
    const s = computeQuestionStatistics({ id: "q", answerFormat: "three-point", aggregation: "shared" }, 2, ans);
    expectClose(asArray(s.values), rSummary(ans.map((a) => a.value)), 1e-12, "median estimates vs R");
    expectClose(asArray(s.lows), rSummary(ans.map((a) => a.low!)), 1e-12, "lows vs R");
    expectClose(asArray(s.highs), rSummary(ans.map((a) => a.high!)), 1e-12, "highs vs R");
    expect(s.pooled).toEqual(poolThreePoint(ans.map((a) => ({ low: a.low!, median: a.value, high: a.high! }))));
  });

  it("sum of parts: the total is R's sum() and each share its value over the total", () => {
    const vals = [4200, 3100, 2600, 1900];
    const s = computeQuestionStatistics({ id: "q", answerFormat: "single", aggregation: "sum-of-parts" }, 1, single(vals));
    const [[total]] = runR(`out(sum(${rVector(vals)}))`);
    expect(s.sumOfParts?.total).toBe(total);
    expect(s.sumOfParts?.parts.map((p) => p.value)).toEqual([4200, 3100, 2600, 1900]);
    expect(s.sumOfParts?.parts[0].share).toBeCloseTo(4200 / 11800, 15);
  });

  it("one answer: sd and CV are null (R's sd gives NA), IQR 0; no answers: all null", () => {
    const one = computeQuestionStatistics({ id: "q", answerFormat: "single", aggregation: "shared" }, 1, single([500]));
    expect(one.values?.sd).toBeNull();
    expect(one.values?.cv).toBeNull();
    expect(one.values?.iqr).toBe(0);
    const none = computeQuestionStatistics({ id: "q", answerFormat: "single", aggregation: "shared" }, 1, []);
    expect(none.n).toBe(0);
    expect(none.values).toBeNull();
  });
});
