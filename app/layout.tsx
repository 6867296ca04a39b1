import type { Metadata } from "next";
import "./globals.css";

export const metadata: Metadata = {
  title: { default: "Triangulate", template: "%s · Triangulate" },
  description:
    "Expert panels by the Delphi method, checked against a statistical baseline and each estimator's track record.",
};

export default function RootLayout({ children }: { children: React.ReactNode }) {
  return (
    <html lang="en">
      <body>
        <header className="site-header">
          <a href="/" className="brand">
            Triangulate
          </a>
          <nav aria-label="Main">
            <a href="/panels">Panels</a>
            <a href="/reports">Reports</a>
            <a href="/sign-in">Sign in</a>
          </nav>
        </header>
        <main className="site-main">{children}</main>
      </body>
    </html>
  );
}
