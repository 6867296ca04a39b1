import type { Metadata } from "next";
import { listApiTokens } from "@/lib/accounts/users";
import ActionForm, { FieldError } from "@/lib/ui/action-form";
import { formatDateTime } from "@/lib/ui/format";
import { requireOrganiserPage } from "@/lib/ui/require-user";
import { createTokenAction, revokeTokenAction } from "./actions";

export const metadata: Metadata = { title: "API tokens" };

export default async function TokensPage() {
  const user = await requireOrganiserPage("/account/tokens");
  const tokens = await listApiTokens(user);
  return (
    <section>
      <h1>Personal API tokens</h1>
      <p className="muted">
        A token lets a script act as you on the JSON API (<a href="/api/v1/openapi.json">/api/v1/openapi.json</a>{" "}
        describes it): send it as <code>Authorization: Bearer &lt;token&gt;</code>. Only a hash of each token is
        stored, so a token is shown once, when it is created. Revoke a token you no longer use.
      </p>
      <div className="card narrow">
        <h2>New token</h2>
        <ActionForm action={createTokenAction} submitLabel="Create token" resetOnSuccess>
          <label>
            Label <span className="hint">What the token is for, e.g. "weekly export script".</span>
            <input name="name" required maxLength={80} />
            <FieldError name="name" />
          </label>
        </ActionForm>
      </div>
      <h2>Your tokens</h2>
      {tokens.length === 0 ? (
        <p className="muted">No tokens yet.</p>
      ) : (
        <div className="table-scroll">
          <table>
            <thead>
              <tr>
                <th>Label</th>
                <th>Created</th>
                <th>Last used</th>
                <th>Status</th>
                <th />
              </tr>
            </thead>
            <tbody>
              {tokens.map((t) => (
                <tr key={t.id}>
                  <td>{t.name}</td>
                  <td>{formatDateTime(t.createdAt)}</td>
                  <td>{t.lastUsedAt ? formatDateTime(t.lastUsedAt) : "never"}</td>
                  <td>{t.revokedAt ? `revoked ${formatDateTime(t.revokedAt)}` : "active"}</td>
                  <td>
                    {t.revokedAt ? null : (
                      <ActionForm
                        action={revokeTokenAction}
                        submitLabel="Revoke"
                        submitClassName="secondary"
                        confirm={`Revoke the token "${t.name}"? Scripts using it will stop working.`}
                      >
                        <input type="hidden" name="tokenId" value={t.id} />
                      </ActionForm>
                    )}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </section>
  );
}
