import type { Metadata } from "next";
import { getCurrentUser } from "@/lib/session";
import SiteHeader from "@/lib/ui/site-header";
import "./globals.css";

export const metadata: Metadata = {
  title: { default: "Triangulate", template: "%s · Triangulate" },
  description:
    "Expert panels by the Delphi method, checked against a statistical baseline and each estimator's track record.",
};

export default async function RootLayout({ children }: { children: React.ReactNode }) {
  const user = await getCurrentUser();
  return (
    <html lang="en">
      <body>
        <a className="skip-link" href="#main">
          Skip to main content
        </a>
        <SiteHeader user={user} />
        <main id="main" className="site-main" tabIndex={-1}>
          {children}
        </main>
      </body>
    </html>
  );
}
