import type { Metadata } from "next";
import ActionForm, { FieldError } from "@/lib/ui/action-form";
import { requireSignedIn } from "@/lib/ui/require-user";
import { changePasswordAction } from "./actions";

export const metadata: Metadata = { title: "Account" };

export default async function AccountPage() {
  const user = await requireSignedIn("/account");
  return (
    <section>
      <h1>Account</h1>
      <p className="muted">
        Signed in as {user.name} ({user.email}), {user.role}.
        {user.role === "organiser" ? (
          <>
            {" "}
            Scripts use <a href="/account/tokens">personal API tokens</a>.
          </>
        ) : null}
      </p>
      <div className="card narrow">
        <h2>Change password</h2>
        <p className="hint">Changing it signs you out everywhere, here too; then sign in with the new password.</p>
        <ActionForm action={changePasswordAction} submitLabel="Change password" resetOnSuccess>
          <label>
            Current password
            <input name="currentPassword" type="password" autoComplete="current-password" required maxLength={200} />
            <FieldError name="currentPassword" />
          </label>
          <label>
            New password <span className="hint">At least 12 characters.</span>
            <input name="newPassword" type="password" autoComplete="new-password" required minLength={12} maxLength={200} />
            <FieldError name="newPassword" />
          </label>
        </ActionForm>
      </div>
    </section>
  );
}
