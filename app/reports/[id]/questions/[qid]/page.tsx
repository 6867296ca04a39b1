import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { NotFoundError } from "@/lib/errors";
import { getBaseline, type BaselineView } from "@/lib/triangulation/baselines";
import { getQuestionReport, questionReportFileName, type QuestionReport } from "@/lib/triangulation/report";
import { RoundsChart, RoundStatsTable } from "@/lib/ui/convergence-view";
import { formatDateTime } from "@/lib/ui/format";
import PrintButton from "@/lib/ui/print-button";
import { requireSignedIn } from "@/lib/ui/require-user";
import {
  BaselineDetails,
  BiasCorrectionTable,
  BlendHeadline,
  DepartureSection,
  LegsSideBySide,
  NotesInputsCautions,
  OutcomeSection,
  TrackRecordTable,
  WeightInputs,
} from "@/lib/ui/triangulation-sections";

export const metadata: Metadata = { title: "Question report" };

async function load(user: Parameters<typeof getQuestionReport>[0], id: string, qid: string): Promise<[QuestionReport, BaselineView | null]> {
  try {
    const report = await getQuestionReport(user, id, qid);
    let baseline: BaselineView | null = null;
    try {
      baseline = await getBaseline(user, id, qid);
    } catch (error) {
      if (!(error instanceof NotFoundError)) throw error;
    }
    return [report, baseline];
  } catch (error) {
    if (error instanceof NotFoundError) notFound();
    throw error;
  }
}

export default async function QuestionReportPage({ params }: { params: Promise<{ id: string; qid: string }> }) {
  const { id, qid } = await params;
  const user = await requireSignedIn(`/reports/${id}/questions/${qid}`);
  const [report, baseline] = await load(user, id, qid);
  const q = report.question;
  const api = `/api/v1/panels/${encodeURIComponent(id)}/questions/${encodeURIComponent(qid)}`;
  const c = report.convergence;
  return (
    <article className="report-page" data-report={qid}>
      <p className="muted small no-print">
        <a href="/reports">Reports</a> / <a href={`/reports/${id}`}>{report.panel.title}</a> /
      </p>
      <header className="report-head">
        <p className="muted small">
          {report.panel.title} · report generated {formatDateTime(report.generatedAt)}
        </p>
        <h1>{q.text}</h1>
        <p className="muted small">
          Measured in {q.unit}; target period {q.targetPeriod}; {q.aggregation === "shared" ? "shared quantity (panel figure: the median)" : "sum of parts (panel figure: the total)"};{" "}
          {q.answerFormat === "single" ? "single-value answers" : "three-point answers (P10 / P50 / P90)"}.
        </p>
        <div className="actions no-print report-actions">
          <a className="button secondary" href={`${api}/report.csv`} download data-export="csv">
            Export CSV
          </a>
          <a className="button secondary" href={`${api}/report.json`} download={`${questionReportFileName(report)}.json`} data-export="json">
            Export JSON
          </a>
          <PrintButton />
          {report.viewer.role !== "reviewer" ? <a href={`/panels/${id}/questions/${qid}`}>Manage this question</a> : null}
        </div>
      </header>

      <p className="lead" data-report-summary>
        {report.summary}
      </p>

      <p className="caution">
        Every forecast is uncertain: read the ranges, not only the figures, and the inputs each rests on (at the end of this report). This report supports a
        decision; it does not make one.
      </p>

      <BlendHeadline report={report} />
      <LegsSideBySide report={report} />

      <section aria-labelledby="convergence-h" className="report-section">
        <h2 id="convergence-h">Convergence across rounds</h2>
        {c.rounds.length === 0 ? (
          <p className="muted">No round has closed yet.</p>
        ) : (
          <>
            <RoundsChart rounds={c.rounds} unit={q.unit} sum={q.aggregation === "sum-of-parts"} />
            <RoundStatsTable rounds={c.rounds} aggregation={q.aggregation} />
            {c.recommendation ? (
              <p className="small">
                After the latest round the stopping rules {c.recommendation === "stop" ? "suggested the panel could stop" : "suggested another round"}.{" "}
                {c.reasons.join(" ")}
              </p>
            ) : null}
          </>
        )}
      </section>

      <DepartureSection report={report} />
      <BiasCorrectionTable report={report} />
      <TrackRecordTable report={report} open />
      <BaselineDetails report={report} baseline={baseline} />
      {report.blend ? (
        <section aria-labelledby="weight-h" className="report-section">
          <h2 id="weight-h">How the blend weight was set</h2>
          <WeightInputs report={report} />
        </section>
      ) : null}
      <OutcomeSection report={report} />
      <NotesInputsCautions report={report} />
    </article>
  );
}
