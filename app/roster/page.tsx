import type { Metadata } from "next";
import { listRoster } from "@/lib/panels/roster";
import { listTrackRecords } from "@/lib/triangulation/track-records";
import TrackRecordRoster from "@/lib/ui/track-record-table";
import ActionForm, { FieldError } from "@/lib/ui/action-form";
import { requireOrganiserPage } from "@/lib/ui/require-user";
import { addMemberAction, deleteMemberAction, updateMemberAction } from "./actions";

export const metadata: Metadata = { title: "Expert roster" };

export default async function RosterPage() {
  const user = await requireOrganiserPage("/roster");
  const [members, records] = await Promise.all([listRoster(user), listTrackRecords(user)]);
  return (
    <section>
      <h1>Expert roster</h1>
      <p className="muted">
        The people you invite to panels again and again. Their answers and, later, their track record attach to the
        roster entry. Other panelists never see these names or addresses.
      </p>
      <div className="card">
        <h2>Add a person</h2>
        <ActionForm action={addMemberAction} submitLabel="Add to roster" resetOnSuccess ariaLabel="Add a person">
          <div className="row">
            <label>
              Name
              <input name="name" required maxLength={120} />
              <FieldError name="name" />
            </label>
            <label>
              E-mail
              <input name="email" type="email" required maxLength={200} />
              <FieldError name="email" />
            </label>
            <label>
              Group <span className="hint">e.g. sales, engineering</span>
              <input name="group" maxLength={40} />
              <FieldError name="group" />
            </label>
          </div>
        </ActionForm>
      </div>
      <h2>
        On your roster <span className="muted small">({members.length})</span>
      </h2>
      {members.length === 0 ? (
        <p className="muted">Nobody yet.</p>
      ) : (
        <div className="table-scroll">
          <table>
            <thead>
              <tr>
                <th>Name</th>
                <th>E-mail</th>
                <th>Group</th>
                <th>Change</th>
              </tr>
            </thead>
            <tbody>
              {members.map((m) => (
                <tr key={m.id} data-roster-member={m.email}>
                  <td>{m.name}</td>
                  <td>{m.email}</td>
                  <td>{m.group || <span className="muted">—</span>}</td>
                  <td>
                    <details>
                      <summary>Edit or remove</summary>
                      <ActionForm action={updateMemberAction} submitLabel="Save">
                        <input type="hidden" name="memberId" value={m.id} />
                        <label>
                          Name
                          <input name="name" defaultValue={m.name} maxLength={120} />
                          <FieldError name="name" />
                        </label>
                        <label>
                          E-mail
                          <input name="email" type="email" defaultValue={m.email} maxLength={200} />
                          <FieldError name="email" />
                        </label>
                        <label>
                          Group
                          <input name="group" defaultValue={m.group} maxLength={40} />
                          <FieldError name="group" />
                        </label>
                      </ActionForm>
                      <ActionForm
                        action={deleteMemberAction}
                        submitLabel="Remove from roster"
                        submitClassName="secondary"
                        confirm={`Remove ${m.name} from your roster?`}
                      >
                        <input type="hidden" name="memberId" value={m.id} />
                      </ActionForm>
                    </details>
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
      <section aria-labelledby="track-records-h" id="track-records">
        <h2 id="track-records-h">Track records</h2>
        {records.length === 0 ? <p className="muted">Nobody on the roster yet.</p> : <TrackRecordRoster records={records} />}
        <p className="small">
          How the panel, the corrected panel, the baseline and the blend did overall: <a href="/accuracy">accuracy history</a>.
        </p>
      </section>
    </section>
  );
}
