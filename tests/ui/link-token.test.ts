/**
 * Private links as people paste them (lib/ui/link-token.ts). The token below has the shape
 * lib/accounts/tokens.ts gives (32 bytes in base64url: 43 characters, RFC 4648 §5 alphabet);
 * the mangled forms are what e-mail programs do to a link at the end of a sentence or in <…>.
 */
import { describe, expect, it } from "vitest";
import { cleanLinkToken, LINK_CUT_SHORT, LINK_EXTRA_CHARACTERS, linkShapeProblem } from "../../lib/ui/link-token";

const TOKEN = "Qm9va2VkLWZvci1XcmVuLTItcGFuZWwtcm91bmQtMQ-";

describe("private link tokens", () => {
  it("the example has an invitation token's shape", () => {
    expect(TOKEN).toHaveLength(43);
    expect(linkShapeProblem(TOKEN)).toBeNull();
  });

  it("drops the punctuation e-mail programs append, plain or percent-encoded", () => {
    for (const tail of [".", ",", ")", ">", ").", ">,", "%3E", "%29.", "%2C", "]", ";", '"', "'"]) expect(cleanLinkToken(TOKEN + tail), tail).toBe(TOKEN);
    // Dashes and underscores belong to the token (base64url) and stay.
    expect(cleanLinkToken(TOKEN.slice(0, -1) + "_")).toBe(TOKEN.slice(0, -1) + "_");
  });

  it("a link cut short says so; one with something added says that (not the other way round)", () => {
    expect(linkShapeProblem(TOKEN.slice(0, 30))).toBe(LINK_CUT_SHORT);
    expect(linkShapeProblem("")).toBe(LINK_CUT_SHORT);
    expect(linkShapeProblem(cleanLinkToken(TOKEN + "!"))).toBe(LINK_EXTRA_CHARACTERS);
    expect(linkShapeProblem(TOKEN + "abc")).toBe(LINK_EXTRA_CHARACTERS);
    expect(linkShapeProblem(cleanLinkToken(`${TOKEN}%ZZ`))).toBe(LINK_EXTRA_CHARACTERS);
    expect(LINK_CUT_SHORT).toMatch(/cut short/);
    expect(LINK_EXTRA_CHARACTERS).toMatch(/not part of it/);
  });
});
