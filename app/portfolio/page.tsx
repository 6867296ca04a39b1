import type { Metadata } from "next";
import { CONVERGENCE_LABEL, getPortfolio } from "@/lib/triangulation/portfolio";
import { formatDateTime } from "@/lib/ui/format";
import PortfolioTable from "@/lib/ui/portfolio-table";
import { requireSignedIn } from "@/lib/ui/require-user";

export const metadata: Metadata = { title: "Portfolio" };

const RANK = { "no-closed-round": 0, "not-settled": 1, settled: 2 } as const;

export default async function PortfolioPage() {
  const user = await requireSignedIn("/portfolio");
  const portfolio = await getPortfolio(user);
  const rows = portfolio.rows.map((r) => ({
    questionId: r.questionId,
    panelId: r.panelId,
    panelTitle: r.panelTitle,
    questionText: r.questionText,
    unit: r.unit,
    targetPeriod: r.targetPeriod,
    figure: r.figure,
    lower80: r.lower80,
    upper80: r.upper80,
    convergenceRank: RANK[r.convergence],
    convergenceLabel: CONVERGENCE_LABEL[r.convergence],
    outcome: r.outcome,
    change: r.movement?.change ?? null,
    fromRound: r.movement?.fromRound ?? null,
    toRound: r.movement?.toRound ?? null,
  }));
  return (
    <section>
      <h1>Portfolio</h1>
      <p className="muted">
        {user.role === "reviewer" ? "Every question of the panels shared with you" : "Every question of your panels and of panels shared with you"}, with the
        blended figure and its 80% range as each question&apos;s report gives them (figures as of {formatDateTime(portfolio.generatedAt)}).
      </p>
      <p className="small">{portfolio.movementRule}</p>
      <div className="actions">
        <a className="button secondary" href="/api/v1/portfolio.csv" download data-export="portfolio-csv">
          Export CSV
        </a>
      </div>
      {rows.length === 0 ? <p className="muted">No panel to show yet.</p> : <PortfolioTable rows={rows} />}
    </section>
  );
}
