import type { Metadata } from "next";
import ErrorBanner from "@/lib/ui/error-banner";

export const metadata: Metadata = { title: "Not found" };

/** Any page that does not exist, or a panel or question this account may not open. */
export default function NotFound() {
  return (
    <section className="narrow" data-not-found="">
      <h1>Page not found</h1>
      <ErrorBanner>There is no such page, or your account may not open it. Check the address, or ask the panel&apos;s organiser to share it with you.</ErrorBanner>
      <p>
        <a href="/">Start page</a>
      </p>
    </section>
  );
}
