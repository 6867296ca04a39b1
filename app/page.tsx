export default function Home() {
  return (
    <article className="intro">
      <h1>One defensible number, with its range</h1>
      <p className="lead">
        Triangulate runs expert-estimate panels by the Delphi method: anonymous rounds, feedback of
        the group&apos;s median and quartiles, and stopping rules that say when another round is worth
        it. It then checks the panel against a statistical baseline forecast fitted to whatever
        history there is, corrects each estimator for how optimistic or pessimistic they have been
        before, and blends the legs into one figure with an honest range.
      </p>
      <ol className="legs">
        <li>
          <strong>Judgment</strong> — the panel&apos;s answers, round by round, without anyone
          anchoring the others.
        </li>
        <li>
          <strong>Statistics</strong> — a baseline forecast that averages exponential smoothing (chosen by
          AICc) and the Theta method, with 80% and 95% intervals checked against held-out data; or a named method.
        </li>
        <li>
          <strong>Track record</strong> — each panelist&apos;s past errors, turned into a bias
          factor once outcomes are known.
        </li>
      </ol>
      <p className="caution">
        Every forecast is uncertain. Reports show ranges and the inputs behind each figure: they
        support a decision, they do not make one.
      </p>
      <p>
        <a className="button" href="/sign-in">
          Sign in
        </a>
      </p>
    </article>
  );
}
