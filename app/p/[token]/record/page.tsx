import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { getOwnRecord } from "@/lib/triangulation/own-record";
import { MIN_OUTCOMES_FOR_ADVICE } from "@/lib/blend/own-record";
import Figure from "@/lib/ui/figure";
import { formatDate } from "@/lib/ui/format";
import LinkProblem from "@/lib/ui/link-problem";
import OwnErrorChart from "@/lib/ui/own-error-chart";
import { panelistFromLink } from "@/lib/ui/panelist-access";

// Only the panelist's own link opens this page (lib/triangulation/own-record.ts; THREATS.md).
export const metadata: Metadata = { title: "Your record", referrer: "no-referrer", robots: { index: false, follow: false } };
export const dynamic = "force-dynamic";

export default async function OwnRecordPage({ params }: { params: Promise<{ token: string }> }) {
  const { token: asGiven } = await params;
  const who = await panelistFromLink(asGiven);
  if ("problem" in who) return <LinkProblem problem={who.problem} />;
  if (who.token !== asGiven) redirect(`/p/${who.token}/record`);
  const r = await getOwnRecord(who.actor);
  const hit = (h: typeof r.interval80, name: string) =>
    h.count === 0 ? (
      <span className="muted">none yet</span>
    ) : (
      <>
        <Figure name={`${name}-hits`} value={h.hits} digits={6} /> of <Figure name={`${name}-count`} value={h.count} digits={6} /> (
        <Figure name={`${name}-rate`} value={h.rate} percent />; stated <Figure name={`${name}-nominal`} value={h.nominal} percent digits={0} />)
      </>
    );
  return (
    <article className="panelist-page">
      <p>
        <a href={`/p/${who.token}`}>Back to your answers</a>
      </p>
      <h1>Your record</h1>
      <p className="muted">
        Only you see this page, through your own link. It shows how your answers turned out on the questions whose outcome has been recorded, across the panels you
        were invited to. No one else&apos;s answers are used.
      </p>
      <section className="card" data-section="advice">
        <h2>In short</h2>
        <ul>
          <li data-advice="ranges80">{r.advice.ranges80.sentence}</li>
          {r.advice.ranges90 ? <li data-advice="ranges90">{r.advice.ranges90.sentence}</li> : null}
          <li data-advice="bias">{r.advice.bias.sentence}</li>
        </ul>
        <p className="muted small">
          Advice needs at least {MIN_OUTCOMES_FOR_ADVICE} outcomes. Ranges are called too narrow (or too wide) when they held so rarely (or so often) that ranges of the stated
          width would do so less than 5% of the time (an exact binomial test; 5% is common practice). Answers within 5% of the outcomes on average count as close.
        </p>
      </section>
      <section className="card" data-section="figures">
        <h2>Your figures</h2>
        <dl>
          <dt>Outcomes recorded</dt>
          <dd>
            <Figure name="count" value={r.count} digits={6} />
            {r.skipped ? <span className="muted small"> ({r.skipped} left out: a value or outcome of 0 or less, or out of range)</span> : null}
          </dd>
          <dt>Your 80% ranges (low to high) held</dt>
          <dd>{hit(r.interval80, "interval80")}</dd>
          <dt>Your 90% ranges on calibration questions (5th to 95th percentile) held</dt>
          <dd>{hit(r.interval90, "interval90")}</dd>
          <dt>Your bias factor</dt>
          <dd>
            <Figure name="bias-factor" value={r.bias.factor} /> (unshrunk <Figure name="bias-raw" value={r.bias.raw} />, credibility{" "}
            <Figure name="bias-credibility" value={r.bias.credibility} digits={3} />)
            <p className="muted small">
              Your answers are multiplied by this factor when the panel&apos;s figure is corrected for how high or low each panelist has answered before. The credibility
              n/(n + 5) says how far your own record is trusted over no correction at all (docs/methods.md §17).
            </p>
          </dd>
        </dl>
      </section>
      <section className="card" data-section="errors">
        <h2>Your answers against the outcomes</h2>
        {r.outcomes.length === 0 ? (
          <p className="muted">No outcome of your answers has been recorded yet.</p>
        ) : (
          <>
            <OwnErrorChart labels={r.outcomes.map((o) => formatDate(o.recordedAt))} values={r.outcomes.map((o) => o.errorPercent ?? 0)} />
            <p className="muted small">
              One point per recorded outcome, in the order the outcomes were recorded (dated): how far your answer (the middle of a range) was above or below the outcome,
              in percent of the outcome. The question behind each point is not listed, so that this page shows no more of your answers than your record needs.
            </p>
          </>
        )}
      </section>
    </article>
  );
}
