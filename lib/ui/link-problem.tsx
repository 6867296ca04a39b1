import ErrorBanner from "./error-banner";

/** What a panelist sees when their private link is unknown, withdrawn or expired. */
export default function LinkProblem({ problem }: { problem: string }) {
  return (
    <section className="narrow">
      <h1>This link does not work</h1>
      <ErrorBanner>{problem}</ErrorBanner>
    </section>
  );
}
