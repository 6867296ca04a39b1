/**
 * The sentence a report leads with (lib/triangulation/report-summary.ts). The reports are written by
 * hand (invented Wren-2 figures); each expected sentence is written out by hand from the rule in
 * the module comment, its percentages computed here by hand: (72 − 80) / 80 = −10%;
 * (8,200 − 7,676.98) / 7,676.98 = 6.8% → 7%.
 */
import { describe, expect, it } from "vitest";
import { reportSummary } from "../../lib/triangulation/report-summary";

type Input = Parameters<typeof reportSummary>[0];

const question = { id: "q", text: "Wren-2 units sold in year one?", unit: "units", targetPeriod: "year one", aggregation: "shared" as const, answerFormat: "single" as const, calibration: false };
const iv = (lower: number, upper: number) => [
  { level: 80, lower, upper },
  { level: 95, lower: lower - 5, upper: upper + 5 },
];
const point = (round: number, n: number, q1: number, q3: number) => ({ round, n, median: (q1 + q3) / 2, q1, q3, iqr: q3 - q1, relativeIqr: null, cv: null, total: null });

function input(over: Partial<Omit<Input, "blend">> & { panel?: { figure: number; lower: number; upper: number } | null; baseline?: number | null; blend?: { figure: number; lower: number; upper: number } | null }): Input {
  const { panel = null, baseline = null, blend = null, ...rest } = over;
  return {
    question,
    blend: blend ? ({ figure: blend.figure, intervals: iv(blend.lower, blend.upper) } as unknown as Input["blend"]) : null,
    legs: {
      panel: panel ? ({ corrected: { figure: panel.figure, intervals: iv(panel.lower, panel.upper) } } as unknown as Input["legs"]["panel"]) : null,
      baseline: baseline === null ? null : ({ target: { mean: baseline } } as unknown as Input["legs"]["baseline"]),
      trackRecord: { panelistsWithRecord: 0, meanFactor: null, panelists: [] },
    },
    outcome: null,
    convergence: { rounds: [], verdict: null, recommendation: null, reasons: [] },
    ...rest,
  };
}

describe("reportSummary", () => {
  it("figure, range, outcome and the gap between the panel and the baseline", () => {
    const s = reportSummary(
      input({ blend: { figure: 76, lower: 70, upper: 82 }, panel: { figure: 72, lower: 60, upper: 86 }, baseline: 80, outcome: { outcomeValue: 78 } as Input["outcome"] }),
    );
    expect(s).toBe(
      "The blended figure for year one is 76 units, with an 80% range of 70 to 82; the recorded outcome is 78 units; the main disagreement is between the panel's corrected figure (72) and the baseline's forecast (80): 10% apart, the panel below the baseline.",
    );
  });

  it("rounds as the page does", () => {
    const s = reportSummary(input({ blend: { figure: 7938.49, lower: 7400.2, upper: 8470.9 }, panel: { figure: 8200, lower: 7000, upper: 9400 }, baseline: 7676.980381156674 }));
    expect(s).toBe(
      "The blended figure for year one is 7,938 units, with an 80% range of 7,400 to 8,471; the main disagreement is between the panel's corrected figure (8,200) and the baseline's forecast (7,677): 7% apart, the panel above the baseline.",
    );
  });

  it("without a baseline: the panel's figure and the spread of its answers", () => {
    const s = reportSummary(input({ panel: { figure: 70, lower: 58, upper: 84 }, convergence: { rounds: [point(1, 5, 64, 72)], verdict: null, recommendation: null, reasons: [] } }));
    expect(s).toBe(
      "There is no blended figure yet (no baseline is attached); the panel's figure for year one is 70 units, with an 80% range of 58 to 84; the main disagreement is within the panel: the middle half of round 1's 5 answers runs from 64 to 72.",
    );
  });

  it("before any answers: says there is no figure, and nothing more", () => {
    expect(reportSummary(input({}))).toBe("There is no figure for year one yet: no closed round has answers.");
  });
});
