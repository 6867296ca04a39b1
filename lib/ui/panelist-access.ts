/**
 * The panelist behind a private link, or the reason the link does not work (cut short, with
 * characters that are not its own, unknown, withdrawn, replaced or expired), for the /p/<token>
 * pages.
 *
 * E-mail programs often glue the punctuation after a link to it ("…/p/abc." or "<…/p/abc>"), so
 * the characters `. , ) > ] ; : ' "` (also percent-encoded) at the end are dropped before the
 * link is read; the pages then send the browser to the clean link. A link is 43 characters
 * (32 random bytes in base64url, lib/accounts/tokens.ts): a shorter one was cut short, typically
 * by a line break in the e-mail.
 */
import { actorFromInvitationToken, type PanelistActor } from "@/lib/accounts/actor";
import { NotAuthenticatedError } from "@/lib/errors";
import { cleanLinkToken, linkShapeProblem } from "./link-token";

/** The panelist of a link (`token`: the clean token, which the page should show in its address). */
export async function panelistFromLink(raw: string): Promise<{ actor: PanelistActor; token: string } | { problem: string }> {
  const token = cleanLinkToken(raw);
  const problem = linkShapeProblem(token);
  if (problem) return { problem };
  try {
    return { actor: await actorFromInvitationToken(token), token };
  } catch (error) {
    if (error instanceof NotAuthenticatedError) return { problem: error.message };
    throw error;
  }
}
