import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { NotFoundError } from "@/lib/errors";
import { getPanel } from "@/lib/panels/panels";
import { getConvergencePage } from "@/lib/panels/views";
import { getPanelReports } from "@/lib/triangulation/panel-reports";
import { getCalibration } from "@/lib/triangulation/calibration";
import PerformanceWeights from "@/lib/ui/performance-weights";
import ConvergenceView from "@/lib/ui/convergence-view";
import Figure from "@/lib/ui/figure";
import { countOf, formatDateTime } from "@/lib/ui/format";
import { requireSignedIn } from "@/lib/ui/require-user";

export const metadata: Metadata = { title: "Report" };

export default async function ReportPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const user = await requireSignedIn(`/reports/${id}`);
  let panel;
  try {
    panel = await getPanel(user, id);
  } catch (error) {
    if (error instanceof NotFoundError) notFound();
    throw error;
  }
  const convergence = await getConvergencePage(user, id);
  const reports = await getPanelReports(user, id, panel.questions.map((q) => q.id));
  const calibration = panel.questions.some((q) => q.calibration) ? await getCalibration(user, id) : null;
  return (
    <article>
      <p className="muted small">
        <a href="/reports">Reports</a> /
      </p>
      <h1>{panel.title}</h1>
      <p>
        <span className="status">{panel.status}</span>{" "}
        <span className="muted small">
          {countOf(panel.rounds.filter((r) => r.status === "closed").length, "closed round")}; created {formatDateTime(panel.createdAt)}.
          {panel.role !== "reviewer" ? (
            <>
              {" "}
              <a href={`/panels/${id}`}>Manage this panel</a>
            </>
          ) : null}
        </span>
      </p>
      {panel.description ? <p className="lead">{panel.description}</p> : null}
      <p className="caution">
        Every forecast is uncertain. Each question&apos;s report gives the blended figure with its range, the three legs
        behind it (the panel&apos;s judgment raw and bias-corrected, the statistical baseline, the track records), the
        departures and the inputs; it supports a decision, it does not make one.
      </p>
      <h2>Questions</h2>
      <div className="actions">
        <a className="button secondary" href={`/api/v1/panels/${encodeURIComponent(id)}/report.csv`} download data-export="panel-csv">
          Export every question&apos;s report (CSV)
        </a>
      </div>
      <div className="table-scroll">
        <table>
          <thead>
            <tr>
              <th>Question</th>
              <th className="num">Blended figure</th>
              <th className="num">80% range</th>
              <th>Status</th>
            </tr>
          </thead>
          <tbody>
            {panel.questions.map((q, i) => {
              const r = reports[i];
              const iv = r.blend?.intervals.find((x) => x.level === 80);
              return (
                <tr key={q.id} data-report-question={q.id}>
                  <td>
                    <a href={`/reports/${id}/questions/${q.id}`}>{q.text}</a>{" "}
                    <span className="muted small">
                      ({q.unit}, {q.targetPeriod}; {q.aggregation === "shared" ? "shared quantity" : "sum of parts"})
                    </span>
                  </td>
                  <td className="num">{r.blend ? <Figure value={r.blend.figure} /> : <span className="muted">no blend yet</span>}</td>
                  <td className="num">
                    {iv ? (
                      <>
                        <Figure value={iv.lower} /> to <Figure value={iv.upper} />
                      </>
                    ) : (
                      "—"
                    )}
                  </td>
                  <td>
                    {q.calibration ? (
                      "calibration question"
                    ) : r.outcome ? (
                      <>
                        outcome: <Figure value={r.outcome.outcomeValue} name="outcome" />
                      </>
                    ) : r.legs.baseline ? (
                      "baseline attached"
                    ) : (
                      "no baseline"
                    )}
                  </td>
                </tr>
              );
            })}
          </tbody>
        </table>
      </div>
      {calibration ? <PerformanceWeights report={calibration} /> : null}
      <h2>Convergence across rounds</h2>
      <ConvergenceView view={convergence} reader="reviewer" />
    </article>
  );
}
