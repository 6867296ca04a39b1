import type { Metadata } from "next";
import { listApiTokens } from "@/lib/accounts/users";
import ActionForm, { FieldError } from "@/lib/ui/action-form";
import { formatDateTime } from "@/lib/ui/format";
import { requireOrganiserPage } from "@/lib/ui/require-user";
import { API_TOKEN_DEFAULT_DAYS, API_TOKEN_MAX_DAYS } from "@/lib/accounts/tokens";
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
        stored, so a token is shown once, when it is created. A token expires after the days you choose (at most{" "}
        {API_TOKEN_MAX_DAYS}); revoke a token you no longer use. Tokens are created and revoked only here, signed in, never
        with a token.
      </p>
      <div className="card narrow">
        <h2>New token</h2>
        <ActionForm action={createTokenAction} submitLabel="Create token" resetOnSuccess>
          <label>
            Label <span className="hint">What the token is for, e.g. "weekly export script".</span>
            <input name="name" required maxLength={80} />
            <FieldError name="name" />
          </label>
          <label>
            Valid for (days) <span className="hint">1 to {API_TOKEN_MAX_DAYS}.</span>
            <input name="expiresInDays" type="number" min={1} max={API_TOKEN_MAX_DAYS} step={1} defaultValue={API_TOKEN_DEFAULT_DAYS} required />
            <FieldError name="expiresInDays" />
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
                <th>Expires</th>
                <th>Status</th>
                <th>
                  <span className="visually-hidden">Action</span>
                </th>
              </tr>
            </thead>
            <tbody>
              {tokens.map((t) => (
                <tr key={t.id}>
                  <td>{t.name}</td>
                  <td>{formatDateTime(t.createdAt)}</td>
                  <td>{t.lastUsedAt ? formatDateTime(t.lastUsedAt) : "never"}</td>
                  <td>{formatDateTime(t.expiresAt)}</td>
                  <td>{t.revokedAt ? `revoked ${formatDateTime(t.revokedAt)}` : Date.parse(t.expiresAt) <= Date.now() ? "expired" : "active"}</td>
                  <td>
                    {t.revokedAt || Date.parse(t.expiresAt) <= Date.now() ? null : (
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
