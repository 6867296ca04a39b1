/**
 * The site header. Its navigation follows who is signed in: organisers get their panels,
 * expert roster, reports, the portfolio and API tokens; reviewers their reports and the portfolio; nobody signed in gets the
 * sign-in link. Panelist pages (/p/…) show the name only (see HeaderNav).
 */
import type { UserActor } from "@/lib/accounts/actor";
import HeaderNav from "./header-nav";
import SignOutButton from "./sign-out-button";

export default function SiteHeader({ user }: { user: UserActor | null }) {
  return (
    <header className="site-header">
      <a href="/" className="brand">
        Triangulate
      </a>
      <HeaderNav>
        {user === null ? (
          <a href="/sign-in">Sign in</a>
        ) : (
          <>
            {user.role === "organiser" ? (
              <>
                <a href="/panels">Panels</a>
                <a href="/roster">Expert roster</a>
                <a href="/accuracy">Accuracy</a>
              </>
            ) : null}
            <a href="/reports">Reports</a>
            <a href="/portfolio">Portfolio</a>
            {user.role === "organiser" ? <a href="/account/tokens">API tokens</a> : null}
            <a href="/account">Account</a>
            <span className="who">
              {user.name} ({user.role})
            </span>
            <SignOutButton />
          </>
        )}
      </HeaderNav>
    </header>
  );
}
