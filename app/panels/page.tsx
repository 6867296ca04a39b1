import type { Metadata } from "next";
import { listPanels } from "@/lib/panels/panels";
import { formatDateTime } from "@/lib/ui/format";
import { requireOrganiserPage } from "@/lib/ui/require-user";

export const metadata: Metadata = { title: "Panels" };

const ROLE_LABEL = { owner: "yours", organiser: "shared with you (co-organiser)", reviewer: "shared with you (read only)" } as const;

export default async function PanelsPage() {
  const user = await requireOrganiserPage("/panels");
  const panels = await listPanels(user);
  return (
    <section>
      <div className="row" style={{ justifyContent: "space-between" }}>
        <h1>Panels</h1>
        <a className="button" href="/panels/new">
          New panel
        </a>
      </div>
      {panels.length === 0 ? (
        <p className="muted">
          No panels yet. A panel asks a group of experts the same questions over a few anonymous rounds;{" "}
          <a href="/panels/new">create one</a>, and add people to your <a href="/roster">expert roster</a> to invite
          them.
        </p>
      ) : (
        <div className="table-scroll">
          <table>
            <thead>
              <tr>
                <th>Panel</th>
                <th>Status</th>
                <th className="num">Questions</th>
                <th>Current round</th>
                <th>Access</th>
                <th>Created</th>
              </tr>
            </thead>
            <tbody>
              {panels.map((p) => (
                <tr key={p.id}>
                  <td>
                    <a href={p.role === "reviewer" ? `/reports/${p.id}` : `/panels/${p.id}`}>{p.title}</a>
                  </td>
                  <td>
                    <span className="status">{p.status}</span>
                  </td>
                  <td className="num">{p.questionCount}</td>
                  <td>{p.currentRound ? `Round ${p.currentRound.number} (${p.currentRound.status})` : "—"}</td>
                  <td>{ROLE_LABEL[p.role]}</td>
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
