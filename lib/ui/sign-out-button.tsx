"use client";
/** Signs the organiser or reviewer out (next-auth) and returns to the start page. */
import { signOut } from "next-auth/react";

export default function SignOutButton() {
  return (
    <button type="button" className="link-button" onClick={() => signOut({ callbackUrl: "/" })}>
      Sign out
    </button>
  );
}
