import type { Metadata } from "next";
import { hasOrganiser } from "@/lib/accounts/users";
import ActionForm, { FieldError } from "@/lib/ui/action-form";
import { createFirstOrganiserAction } from "./actions";

export const metadata: Metadata = { title: "First run" };
export const dynamic = "force-dynamic";

export default async function SetupPage() {
  if (await hasOrganiser()) {
    return (
      <section>
        <h1>First run</h1>
        <p className="notice">
          An organiser account already exists, so this page does nothing any more. <a href="/sign-in">Sign in</a>, or ask
          an organiser to create an account for you.
        </p>
      </section>
    );
  }
  return (
    <section className="narrow">
      <h1>Create the first organiser</h1>
      <p className="muted">
        This page works only while no organiser exists. The account you create here can set up panels, invite panelists
        and share panels with reviewers.
      </p>
      <ActionForm action={createFirstOrganiserAction} submitLabel="Create organiser" pendingLabel="Creating…">
        <label>
          Name
          <input name="name" autoComplete="name" required />
          <FieldError name="name" />
        </label>
        <label>
          E-mail
          <input name="email" type="email" autoComplete="username" required />
          <FieldError name="email" />
        </label>
        <label>
          Password <span className="hint">At least 12 characters.</span>
          <input name="password" type="password" autoComplete="new-password" required />
          <FieldError name="password" />
        </label>
      </ActionForm>
    </section>
  );
}
