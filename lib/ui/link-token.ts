/**
 * Reading the token of a private link as a person pasted or clicked it (pure; used by
 * lib/ui/panelist-access.ts). E-mail programs often glue the punctuation after a link to it
 * ("…/p/abc." or "<…/p/abc>"), so `. , ) > ] ; : ' "` at the end (also percent-encoded) are
 * dropped. A token is 43 characters (32 random bytes in base64url, lib/accounts/tokens.ts): a
 * shorter one was cut short, typically by a line break in the e-mail; a longer one, or one with
 * other characters, has something added.
 */

/** The length of an invitation token (32 bytes in base64url, no padding). */
export const LINK_TOKEN_LENGTH = 43;

export const LINK_CUT_SHORT =
  "This link is cut short: part of it is missing, often because the e-mail broke it over two lines. Open the link from your invitation again, or copy all of it.";
export const LINK_EXTRA_CHARACTERS =
  "This link has characters that are not part of it. Open the link from your invitation again, or copy exactly the link and nothing before or after it.";

/** The token as written, without the punctuation e-mail programs add at its end. */
export function cleanLinkToken(raw: string): string {
  let s = raw;
  try {
    s = decodeURIComponent(raw);
  } catch {
    // A malformed %-escape: read it as written; the shape check below refuses it.
  }
  return s.trim().replace(/[.,)>\];:'"]+$/, "");
}

/** The shape problem of a cleaned token, or null when it has an invitation token's shape. */
export function linkShapeProblem(token: string): string | null {
  if (!/^[A-Za-z0-9_-]*$/.test(token)) return LINK_EXTRA_CHARACTERS;
  if (token.length < LINK_TOKEN_LENGTH) return LINK_CUT_SHORT;
  if (token.length > LINK_TOKEN_LENGTH) return LINK_EXTRA_CHARACTERS;
  return null;
}

