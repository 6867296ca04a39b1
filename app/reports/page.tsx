import type { Metadata } from "next";
import { listPanels } from "@/lib/panels/panels";
import { formatDateTime } from "@/lib/ui/format";
import { requireSignedIn } from "@/lib/ui/require-user";

export const metadata: Metadata = { title: "Reports" };

export default async function ReportsPage() {
  const user = await requireSignedIn("/reports");
  const panels = await listPanels(user);
  return (
    <section>
      <h1>Reports</h1>
      <p className="muted">
        {user.role === "reviewer"
          ? "Panels whose reports have been shared with you. They are read-only."
          : "Read-only views of your panels and of panels shared with you, as reviewers see them."}{" "}
        Each question&apos;s report gives the blended figure and its range first, then the panel, the statistical baseline
        and the track records behind it, with exports (CSV, JSON) and a print layout.
      </p>
      {panels.length === 0 ? (
        <p className="muted">Nothing has been shared with you yet.</p>
      ) : (
        <div className="table-scroll">
          <table>
            <thead>
              <tr>
                <th>Panel</th>
                <th>Status</th>
                <th>Latest round</th>
                <th>Created</th>
              </tr>
            </thead>
            <tbody>
              {panels.map((p) => (
                <tr key={p.id}>
                  <td>
                    <a href={`/reports/${p.id}`}>{p.title}</a>
                  </td>
                  <td>
                    <span className="status">{p.status}</span>
                  </td>
                  <td>{p.currentRound ? `Round ${p.currentRound.number} (${p.currentRound.status})` : "—"}</td>
                  <td>{formatDateTime(p.createdAt)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </section>
  );
}
