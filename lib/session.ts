/**
 * The signed-in user of a page or server action, from the next-auth session cookie.
 */
import { getServerSession } from "next-auth";
import { authOptions } from "@/lib/auth";
import { actorFromSession, type UserActor } from "@/lib/accounts/actor";

/**
 * The signed-in organiser or reviewer as an actor for the domain services, or null when
 * nobody is signed in (or the account has been deleted or the session ended since).
 */
export async function getCurrentUser(): Promise<UserActor | null> {
  const session = await getServerSession(authOptions);
  const user = session?.user as { id?: unknown; gen?: unknown } | undefined;
  return user ? actorFromSession(user.id, user.gen) : null;
}
