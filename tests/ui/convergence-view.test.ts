/**
 * The panel page's convergence view (lib/ui/convergence-view.tsx `ConvergenceView`) and the
 * report's round table (`RoundStatsTable`, app/reports/[id]/questions/[qid]) agree for a
 * sum-of-parts question: both say the spread between panelists is "not applicable" and neither
 * shows a coefficient of variation of the parts; the report's CSV (lib/triangulation/report.ts
 * `reportCsv`) says the same. Rendered to HTML with react-dom/server, no browser.
 *
 * Invented scenario: three Quillmoor regional managers each estimate their own region's Wren-2
 * sales (parts 2000, 3000, 7000; total 12 000). The CV of the parts, sample sd / mean, by hand:
 * mean 4000, deviations −2000, −1000, 3000, s² = (4 + 1 + 9)·10⁶ / 2 = 7·10⁶, s = 2645.7513,
 * CV = 0.6614378 — the number that must not appear as if it measured disagreement.
 */
import { createElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { describe, expect, it } from "vitest";
import ConvergenceView, { RoundStatsTable } from "../../lib/ui/convergence-view";
import { evaluateStoppingRules, STOPPING_RULE_DEFAULTS } from "../../lib/stats/stopping-rules";
import { reportCsv, type QuestionReport } from "../../lib/triangulation/report";
import type { ConvergencePoint } from "../../lib/panels/rounds";

const PARTS = [2000, 3000, 7000];
const CV = 0.6614378; // hand computation above
/** A round point as data stored before the rule could still carry it: the parts' spread and CV. */
const POINT: ConvergencePoint = { round: 1, n: 3, median: 3000, q1: 2500, q3: 5000, iqr: 2500, relativeIqr: 2500 / 3000, cv: CV, total: 12000 };
const Q = { questionId: "q1", text: "Wren-2 units sold next quarter, by region", unit: "units", aggregation: "sum-of-parts" as const };

const text = (html: string) => html.replace(/<[^>]+>/g, " ").replace(/\s+/g, " ");

describe("sum-of-parts convergence: the panel page and the report agree", () => {
  const evaluation = evaluateStoppingRules({
    roundNumber: 1,
    current: [{ questionId: "q1", aggregation: "sum-of-parts", n: 3, median: 3000, iqr: 2500, relativeIqr: 2500 / 3000, cv: CV, total: 12000, values: PARTS }],
    previous: null,
    config: {
      consensusMeasure: "cv",
      consensusThreshold: STOPPING_RULE_DEFAULTS.consensusThreshold.cv.value,
      stabilityThreshold: STOPPING_RULE_DEFAULTS.stabilityThreshold.value,
      roundLimit: STOPPING_RULE_DEFAULTS.roundLimit.value,
    },
  });
  const panelPage = text(
    renderToStaticMarkup(
      createElement(ConvergenceView, {
        view: {
          panelId: "p1",
          rules: { consensusMeasure: "cv", consensusThreshold: 0.5, stabilityThreshold: 0.15, roundLimit: 4 },
          questions: [{ ...Q, rounds: [POINT] }],
          evaluation,
          parts: { q1: [{ round: 1, total: 12000, parts: PARTS.map((v, i) => ({ pseudonym: `Panelist ${"ABC"[i]}`, value: v, share: v / 12000 })) }] },
          threePoint: {},
        },
      }),
    ),
  );
  const report = text(renderToStaticMarkup(createElement(RoundStatsTable, { rounds: [POINT], aggregation: "sum-of-parts" })));

  it("the panel page: consensus rule not applicable, no CV of the parts", () => {
    expect(panelPage).toMatch(/Consensus rule \(coefficient of variation ≤ [\d.]+\): not applicable/);
    expect(panelPage).not.toContain("0.661");
  });

  it("the report's table: the spread columns say not applicable, the total is shown, no CV of the parts", () => {
    expect(report).toContain("not applicable");
    expect(report).not.toContain("0.661");
    expect(report).toContain("12,000");
    expect(report).toContain("the consensus rule");
  });

  it("a shared-quantity question still shows its CV in the report's table", () => {
    const shared = text(renderToStaticMarkup(createElement(RoundStatsTable, { rounds: [POINT], aggregation: "shared" })));
    expect(shared).toContain("0.661");
    expect(shared).not.toContain("not applicable");
  });

  it("the CSV export: no median, IQR or CV of the parts for a sum-of-parts question, the total kept", () => {
    const csv = reportCsv({
      generatedAt: "",
      summary: "",
      panel: { id: "p", title: "Quillmoor regions", status: "running" },
      question: { id: "q1", text: Q.text, unit: "units", targetPeriod: "next quarter", aggregation: "sum-of-parts", answerFormat: "single", calibration: false },
      performanceWeights: null,
      viewer: { role: "owner", namesShown: false },
      blend: null,
      legs: { panel: null, baseline: null, trackRecord: { panelistsWithRecord: 0, meanFactor: null, panelists: [] } },
      convergence: { rounds: [POINT], verdict: null, recommendation: null, reasons: [] },
      departures: null,
      biasCorrection: [],
      outcome: null,
      movement: null,
      distributions: { panelRaw: null, panelCorrected: null, baseline: null, blend: null },
      methodNotes: [],
      inputs: [],
      warnings: [],
      cautions: [],
    } as QuestionReport);
    const rows = csv.trim().split("\r\n").filter((l) => l.startsWith("convergence,"));
    expect(rows).toContain("convergence,round 1,total,12000,units");
    expect(rows.some((l) => /,(median|IQR|relative IQR|CV),/.test(l))).toBe(false);
    expect(rows.join("\n")).toContain("not applicable");
  });
});
