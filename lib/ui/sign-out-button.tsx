"use client";
/**
 * Signs the organiser or reviewer out (next-auth) and returns to the start page. next-auth's
 * client is fetched on the click, so the pages that show no signed-in user (a panelist's) do not
 * load it (issue 15, the panelist page's weight).
 */
export default function SignOutButton() {
  return (
    <button type="button" className="link-button" onClick={async () => (await import("next-auth/react")).signOut({ callbackUrl: "/" })}>
      Sign out
    </button>
  );
}
