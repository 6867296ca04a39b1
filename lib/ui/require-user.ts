/**
 * Page guards: the signed-in organiser or reviewer, or a redirect to the sign-in page that
 * comes back here afterwards.
 */
import { redirect } from "next/navigation";
import type { UserActor } from "@/lib/accounts/actor";
import { getCurrentUser } from "@/lib/session";

/** The signed-in user, or a redirect to /sign-in?next=`here`. */
export async function requireSignedIn(here: string): Promise<UserActor> {
  const user = await getCurrentUser();
  if (!user) redirect(`/sign-in?next=${encodeURIComponent(here)}`);
  return user;
}

/** The signed-in organiser; a reviewer is sent to their reports. */
export async function requireOrganiserPage(here: string): Promise<UserActor> {
  const user = await requireSignedIn(here);
  if (user.role !== "organiser") redirect("/reports");
  return user;
}
