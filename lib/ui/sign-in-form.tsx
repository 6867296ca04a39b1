"use client";
/**
 * Sign-in form for organisers and reviewers (next-auth credentials provider). Errors from
 * next-auth come back without a page change and are shown above the button.
 */
import { useState } from "react";
import { signIn } from "next-auth/react";
import ErrorBanner from "./error-banner";
import { useReady } from "./use-ready";

export default function SignInForm({ next }: { next: string }) {
  const [error, setError] = useState<string | null>(null);
  const [pending, setPending] = useState(false);
  const ready = useReady();
  return (
    <form
      className="narrow"
      noValidate
      data-ready={ready ? "" : undefined}
      onSubmit={async (event) => {
        event.preventDefault();
        const data = new FormData(event.currentTarget);
        const email = String(data.get("email") ?? "").trim();
        const password = String(data.get("password") ?? "");
        if (!email || !password) {
          setError("Enter your e-mail address and your password.");
          return;
        }
        setPending(true);
        setError(null);
        const result = await signIn("credentials", { email, password, redirect: false });
        if (!result || result.error) {
          setPending(false);
          setError(
            result?.error === "CredentialsSignin" || !result?.error
              ? "That e-mail address and password do not match an account."
              : result.error,
          );
          return;
        }
        window.location.assign(next);
      }}
    >
      <label>
        E-mail
        <input name="email" type="email" autoComplete="username" required />
      </label>
      <label>
        Password
        <input name="password" type="password" autoComplete="current-password" required />
      </label>
      {error ? (
        <ErrorBanner>{error}</ErrorBanner>
      ) : null}
      <div className="actions">
        <button type="submit" disabled={!ready || pending}>
          {pending ? "Signing in…" : "Sign in"}
        </button>
      </div>
    </form>
  );
}
