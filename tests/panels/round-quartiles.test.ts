/**
 * The previous round's quartiles for the rationale rule (lib/panels/round-quartiles.ts): read
 * from the stored statistics once per closed round, then served from the cache; sum-of-parts
 * questions have none. Quartiles by hand: Hyndman & Fan (1996) type 7 of 1…5 puts Q1 at
 * h = (n − 1)·0.25 + 1 = 2 → 2 and Q3 at h = 4 → 4.
 */
import { describe, expect, it } from "vitest";
import { closedRoundQuartiles } from "../../lib/panels/round-quartiles";
import { computeQuestionStatistics } from "../../lib/panels/round-statistics";

const answers = [1, 2, 3, 4, 5].map((value, i) => ({ pseudonym: `Panelist A${i}`, value, low: null, high: null }));
const rows = [
  { questionId: "shared", data: JSON.stringify(computeQuestionStatistics({ id: "shared", answerFormat: "single", aggregation: "shared" }, 1, answers)) },
  { questionId: "parts", data: JSON.stringify(computeQuestionStatistics({ id: "parts", answerFormat: "single", aggregation: "sum-of-parts" }, 1, answers)) },
];

describe("closedRoundQuartiles", () => {
  it("reads a closed round's statistics once and keeps only Q1 and Q3 of shared questions", async () => {
    let reads = 0;
    const tx = { roundStatistic: { findMany: async () => (reads++, rows) } } as never;
    const round = { id: `round-${process.pid}-${Date.now()}`, closedAt: new Date("2026-11-30T12:00:00Z") };
    const first = await closedRoundQuartiles(tx, round);
    const again = await closedRoundQuartiles(tx, round);
    expect([...first]).toEqual([["shared", { q1: 2, q3: 4 }]]); // type 7 by hand, see above
    expect(again).toBe(first);
    expect(reads).toBe(1);
  });
});
