"use client";
/**
 * "Revoke or re-issue" for one invitation row of the organiser's panel page. The two forms are
 * rendered in the browser when the row is first opened, and stay mounted after (a re-issued link
 * is shown once, in the form's state): the page sends each row's few fields, not two forms per
 * panelist (issue 13: 300 rows of forms were most of a 2.5 MB page).
 */
import { useEffect, useRef, useState } from "react";
import ActionForm, { FieldError } from "./action-form";
import type { FormAction } from "../actions/form-state";

export default function InvitationActions({
  panelId,
  invitationId,
  name,
  active,
  revoke,
  reissue,
}: {
  panelId: string;
  invitationId: string;
  name: string;
  active: boolean;
  revoke: FormAction;
  reissue: FormAction;
}) {
  const details = useRef<HTMLDetailsElement>(null);
  const [opened, setOpened] = useState(false);
  // Opened before the page's script ran: no toggle event reached React.
  useEffect(() => {
    if (details.current?.open) setOpened(true);
  }, []);
  return (
    <details ref={details} data-invitation-id={invitationId} onToggle={(e) => e.currentTarget.open && setOpened(true)}>
      <summary>Revoke or re-issue</summary>
      {opened ? (
        <>
          {active ? (
            <ActionForm action={revoke} submitLabel="Revoke link" submitClassName="secondary" confirm={`Revoke ${name}'s link? It stops working at once; answers already given stay.`}>
              <input type="hidden" name="panelId" value={panelId} />
              <input type="hidden" name="invitationId" value={invitationId} />
            </ActionForm>
          ) : null}
          <ActionForm action={reissue} submitLabel="Re-issue link" confirm={`Give ${name} a new link? The old one stops working.`}>
            <input type="hidden" name="panelId" value={panelId} />
            <input type="hidden" name="invitationId" value={invitationId} />
            <label>
              Days until it expires
              <input name="expiresInDays" inputMode="numeric" defaultValue={30} />
              <FieldError name="expiresInDays" />
            </label>
            <label className="inline">
              <input type="checkbox" name="send" value="yes" defaultChecked /> E-mail the new link
            </label>
          </ActionForm>
        </>
      ) : null}
    </details>
  );
}
