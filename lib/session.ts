/**
 * The signed-in user of a page or server action, from the next-auth session cookie.
 */
import { getServerSession } from "next-auth";
import { authOptions } from "@/lib/auth";
import { actorFromUserId, type UserActor } from "@/lib/accounts/actor";

/**
 * The signed-in organiser or reviewer as an actor for the domain services, or null when
 * nobody is signed in (or the account has been deleted since).
 */
export async function getCurrentUser(): Promise<UserActor | null> {
  const session = await getServerSession(authOptions);
  const id = (session?.user as { id?: string } | undefined)?.id;
  return id ? actorFromUserId(id) : null;
}
