import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { NotFoundError } from "@/lib/errors";
import { getPanel } from "@/lib/panels/panels";
import { getConvergencePage } from "@/lib/panels/views";
import ConvergenceView from "@/lib/ui/convergence-view";
import { formatDateTime } from "@/lib/ui/format";
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
  return (
    <article>
      <p className="muted small">
        <a href="/reports">Reports</a> /
      </p>
      <h1>{panel.title}</h1>
      <p>
        <span className="status">{panel.status}</span>{" "}
        <span className="muted small">
          {panel.rounds.filter((r) => r.status === "closed").length} closed round(s); created {formatDateTime(panel.createdAt)}.
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
        Every forecast is uncertain. This view shows the panel&apos;s spread round by round and the figures the stopping
        rules rest on; it supports a decision, it does not make one. The statistical baseline and the blend are not part
        of this report yet.
      </p>
      <h2>Questions</h2>
      <ul>
        {panel.questions.map((q) => (
          <li key={q.id}>
            {q.text} <span className="muted small">({q.unit}, {q.targetPeriod}; {q.aggregation === "shared" ? "shared quantity" : "sum of parts"})</span>
          </li>
        ))}
      </ul>
      <h2>Convergence across rounds</h2>
      <ConvergenceView view={convergence} reader="reviewer" />
    </article>
  );
}
