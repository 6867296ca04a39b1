"use client";
import { useEffect } from "react";
import ErrorBanner from "@/lib/ui/error-banner";

/** A page that failed on the server or in the browser: said plainly, with a way to try again. */
export default function PageError({ error, reset }: { error: Error & { digest?: string }; reset: () => void }) {
  useEffect(() => {
    document.title = "Something went wrong · Triangulate";
  }, []);
  return (
    <section className="narrow" data-page-error="">
      <h1>Something went wrong</h1>
      <ErrorBanner>
        This page could not be shown. Nothing you saved before is lost; try again, and if it keeps happening, tell the
        administrator{error.digest ? ` the reference ${error.digest}` : ""}.
      </ErrorBanner>
      <div className="actions">
        <button type="button" onClick={() => reset()}>
          Try again
        </button>
        <a href="/">Start page</a>
      </div>
    </section>
  );
}
