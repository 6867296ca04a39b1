/**
 * The portfolio (issue 15): every question of every panel the user may read — an organiser's own
 * panels and those shared with them, a reviewer's shared ones (`listPanels`) — with its blended
 * figure, its 80% range, the stopping rules' verdict, the outcome when one is recorded and how the
 * blended figure moved since the previous closed round. One row per question, as JSON, CSV and the
 * /portfolio page.
 *
 * Every figure is the question's report's (lib/triangulation/report.ts), built per panel with one set of
 * shared reads (`getPanelReports`): each panel's closed rounds, track records, invitations and
 * convergence are read once per request, not once per question. Only panel-level figures appear:
 * no pseudonym, answer or per-person figure (THREATS.md), so it shows nothing a reviewer's report
 * does not.
 */
import type { Actor } from "@/lib/accounts/actor";
import { db } from "@/lib/db";
import { csvCell } from "@/lib/csv/cell";
import { roundAsShown } from "@/lib/ui/format";
import { listPanels } from "../panels/panels";
import type { PanelRole } from "../panels/access";
import { getPanelReports } from "./panel-reports";
import type { QuestionReport } from "./report";

export type ConvergenceState = "no-closed-round" | "not-settled" | "settled";

export interface PortfolioRow {
  readonly panelId: string;
  readonly panelTitle: string;
  readonly panelStatus: string;
  readonly role: PanelRole;
  readonly questionId: string;
  readonly questionText: string;
  readonly unit: string;
  readonly targetPeriod: string;
  readonly aggregation: "shared" | "sum-of-parts";
  /** The blended figure; null without a blend (no baseline or no closed round with answers). */
  readonly figure: number | null;
  readonly lower80: number | null;
  readonly upper80: number | null;
  readonly convergence: ConvergenceState;
  readonly latestRound: number | null;
  readonly outcome: number | null;
  readonly outcomeRecordedAt: string | null;
  readonly movement: QuestionReport["movement"];
}

export interface Portfolio {
  readonly generatedAt: string;
  readonly movementRule: string;
  readonly rows: readonly PortfolioRow[];
}

/** How the change column is computed, as the page and the API say it. */
export const MOVEMENT_RULE =
  "Change since the previous closed round: today's blended figure minus the blended figure from the panel's answers up to the closed round before the latest one, " +
  "with today's baseline, weight rule and track records (so only the panel's answers differ). Empty with fewer than two closed rounds with answers or without a blend.";

/** The stopping rules' state of a question after its latest closed round. */
export function convergenceState(r: Pick<QuestionReport, "convergence">): ConvergenceState {
  const v = r.convergence.verdict;
  if (r.convergence.rounds.length === 0 || !v) return "no-closed-round";
  return v.settled ? "settled" : "not-settled";
}

export const CONVERGENCE_LABEL: Readonly<Record<ConvergenceState, string>> = {
  "no-closed-round": "no closed round",
  "not-settled": "not settled",
  settled: "settled",
};

function rowOf(panel: { id: string; title: string; status: string; role: PanelRole }, r: QuestionReport): PortfolioRow {
  const iv = r.blend?.intervals.find((x) => x.level === 80);
  return {
    panelId: panel.id,
    panelTitle: panel.title,
    panelStatus: panel.status,
    role: panel.role,
    questionId: r.question.id,
    questionText: r.question.text,
    unit: r.question.unit,
    targetPeriod: r.question.targetPeriod,
    aggregation: r.question.aggregation,
    figure: r.blend?.figure ?? null,
    lower80: iv?.lower ?? null,
    upper80: iv?.upper ?? null,
    convergence: convergenceState(r),
    latestRound: r.legs.panel?.round ?? null,
    outcome: r.outcome?.outcomeValue ?? null,
    outcomeRecordedAt: r.outcome?.recordedAt ?? null,
    movement: r.movement,
  };
}

/** The portfolio of the signed-in organiser or reviewer: panels newest first, questions in panel order. */
export async function getPortfolio(actor: Actor): Promise<Portfolio> {
  const panels = await listPanels(actor);
  const rows: PortfolioRow[] = [];
  for (const p of panels) {
    const questions = await db.question.findMany({ where: { panelId: p.id }, orderBy: { position: "asc" }, select: { id: true } });
    const reports = await getPanelReports(
      actor,
      p.id,
      questions.map((q) => q.id),
    );
    for (const r of reports) rows.push(rowOf(p, r));
  }
  return { generatedAt: new Date().toISOString(), movementRule: MOVEMENT_RULE, rows };
}

const shown = (v: number | null | undefined) => (v === null || v === undefined ? null : roundAsShown(v));

/**
 * The portfolio's rows as CSV, one line per question, in the JSON's order. Figures are rounded as
 * the page shows them (4 significant digits, `roundAsShown`); the outcome as recorded.
 */
export function portfolioCsv(p: Portfolio): string {
  const header = ["panel", "question", "unit", "target period", "blended figure", "80% lower", "80% upper", "convergence", "latest closed round", "outcome", "change since previous round", "previous round", "previous figure"];
  const lines = [
    header,
    ...p.rows.map((r) => [r.panelTitle, r.questionText, r.unit, r.targetPeriod, shown(r.figure), shown(r.lower80), shown(r.upper80), CONVERGENCE_LABEL[r.convergence], r.latestRound, r.outcome, shown(r.movement?.change), r.movement?.fromRound ?? null, shown(r.movement?.previousFigure)]),
  ];
  return lines.map((row) => row.map(csvCell).join(",")).join("\r\n") + "\r\n";
}

/** The portfolio as CSV with its file name. */
export async function getPortfolioCsv(actor: Actor): Promise<{ filename: string; csv: string }> {
  const p = await getPortfolio(actor);
  return { filename: `portfolio-${p.generatedAt.slice(0, 10)}.csv`, csv: portfolioCsv(p) };
}
