/**
 * The panelist behind a private link, or the reason the link does not work (unknown,
 * withdrawn, replaced or expired), for the /p/<token> pages.
 */
import { actorFromInvitationToken, type PanelistActor } from "@/lib/accounts/actor";
import { NotAuthenticatedError } from "@/lib/errors";

export async function panelistFromLink(token: string): Promise<{ actor: PanelistActor } | { problem: string }> {
  if (!/^[A-Za-z0-9_-]{20,200}$/.test(token)) return { problem: "This invitation link is not valid. Check that you copied all of it." };
  try {
    return { actor: await actorFromInvitationToken(token) };
  } catch (error) {
    if (error instanceof NotAuthenticatedError) return { problem: error.message };
    throw error;
  }
}
