import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { hasOrganiser } from "@/lib/accounts/users";
import { getCurrentUser } from "@/lib/session";
import { sameOriginPath } from "@/lib/http/same-origin-path";
import SignInForm from "@/lib/ui/sign-in-form";

export const metadata: Metadata = { title: "Sign in" };

export default async function SignInPage({ searchParams }: { searchParams: Promise<{ next?: string | string[]; created?: string }> }) {
  const { next, created } = await searchParams;
  const user = await getCurrentUser();
  const home = (role: string) => (role === "organiser" ? "/panels" : "/reports");
  if (user) redirect(sameOriginPath(next) ?? home(user.role));
  const firstRun = !(await hasOrganiser());
  return (
    <section>
      <h1>Sign in</h1>
      <p className="muted">For organisers and reviewers. Panelists need no account: they use the private link in their invitation.</p>
      {created ? <p className="notice">The organiser account was created. Sign in with it.</p> : null}
      {firstRun ? (
        <p className="notice">
          No organiser account exists yet. <a href="/setup">Create the first organiser</a>.
        </p>
      ) : null}
      <SignInForm next={sameOriginPath(next) ?? "/panels"} />
    </section>
  );
}
