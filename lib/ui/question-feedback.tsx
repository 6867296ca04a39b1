"use client";
/**
 * A panelist's feedback on one question of the last closed round: the group median and
 * quartiles (or the total, for sum-of-parts questions), a chart of the spread with their own
 * answer marked, the anonymous rationales, and — when their answer lay outside the
 * interquartile range — a request to explain their reasoning in the next round.
 *
 * Everything here comes from getFeedback (lib/panels/feedback.ts), which carries no name,
 * e-mail, id or pseudonym of anyone else; the chart receives the group's histogram bins.
 * Rationales: a bounded list (those nearest the panelist's answer) with a link to more
 * (`moreHref` with `n=` the next count), or only a link to them (`rationales="link"`).
 *
 * A client component, so that the page's embedded data carries the figures (`f`, a few hundred
 * bytes) instead of the rendered tree of every question's feedback (issue 13: that tree, sent
 * once as HTML and again as script data, made most of a panelist's page); the HTML is the same.
 */
import type { QuestionFeedback as Feedback } from "@/lib/panels/feedback";
import Figure from "./figure";
import { formatPercent } from "./format";
import dynamic from "next/dynamic";

// chart.js is loaded only on pages that draw a spread chart: a panelist answering an open
// round fetches none of it (issue 15, the panelist page's weight).
const SpreadChart = dynamic(() => import("./spread-chart"));

const POSITION = {
  "below-iqr": "below the lower quartile (Q1)",
  "above-iqr": "above the upper quartile (Q3)",
  "within-iqr": "within the interquartile range",
} as const;

/** How many more rationales a "show more" link adds. */
const MORE_STEP = 20;

export default function QuestionFeedback({ f, round, rationales: mode = "list", moreHref }: { f: Feedback; round: number; rationales?: "list" | "link"; moreHref: string }) {
  const sum = f.aggregation === "sum-of-parts";
  const rest = f.rationaleCount - f.rationales.length;
  const rationales = (
    <ul className="rationales">
      {f.rationales.map((r, i) => (
        <li key={i}>
          <span className="muted small">
            With an answer of <Figure value={r.value} /> {f.unit}:
          </span>
          <br />
          {r.rationale}
        </li>
      ))}
    </ul>
  );
  return (
    <div className="feedback" id={`f-${f.questionId}`} data-feedback-question={f.questionId}>
      <h3>
        Round {round} feedback <span className="muted small">({f.n} answer{f.n === 1 ? "" : "s"})</span>
      </h3>
      {f.n === 0 ? (
        <p className="muted">Nobody answered this question in round {round}.</p>
      ) : (
        <>
          <dl className="facts">
            {sum ? (
              <>
                <dt>Total of all parts</dt>
                <dd>
                  <Figure value={f.total} name="total" /> {f.unit}{" "}
                  <span className="muted small">(the panel figure: {f.n} parts added up)</span>
                </dd>
                {f.myAnswer && f.total ? (
                  <>
                    <dt>Your part&apos;s share</dt>
                    <dd>{formatPercent(f.myAnswer.value / f.total)} of the total</dd>
                  </>
                ) : null}
              </>
            ) : (
              <>
                <dt>Group median</dt>
                <dd>
                  <Figure value={f.median} name="median" /> {f.unit}
                </dd>
                <dt>Quartiles (Q1 – Q3)</dt>
                <dd>
                  <Figure value={f.q1} name="q1" /> – <Figure value={f.q3} name="q3" /> {f.unit}
                </dd>
              </>
            )}
            <dt>Lowest – highest</dt>
            <dd>
              <Figure value={f.min} name="min" /> – <Figure value={f.max} name="max" /> {f.unit}
            </dd>
            {f.pooled ? (
              <>
                <dt>Pooled range (P10 – P90)</dt>
                <dd>
                  <Figure value={f.pooled.p10} name="p10" /> – <Figure value={f.pooled.p90} name="p90" /> {f.unit}{" "}
                  <span className="muted small">(all three-point answers pooled; median <Figure value={f.pooled.p50} name="p50" />)</span>
                </dd>
              </>
            ) : null}
            <dt>Your answer</dt>
            <dd data-own-answer={f.myAnswer?.value ?? ""}>
              {f.myAnswer ? (
                <>
                  <strong>
                    <Figure value={f.myAnswer.value} name="own" /> {f.unit}
                  </strong>
                  {f.myAnswer.low !== null && f.myAnswer.high !== null ? (
                    <span className="muted small">
                      {" "}
                      (low <Figure value={f.myAnswer.low} /> – high <Figure value={f.myAnswer.high} />)
                    </span>
                  ) : null}
                  {f.myPosition ? <span> — {POSITION[f.myPosition]}</span> : null}
                </>
              ) : (
                <span className="muted">you did not answer in round {round}</span>
              )}
            </dd>
          </dl>
          {f.histogram.length > 0 ? (
            <SpreadChart
              bins={f.histogram}
              own={f.myAnswer?.value ?? null}
              q1={sum ? null : f.q1}
              median={sum ? null : f.median}
              q3={sum ? null : f.q3}
              unit={f.unit}
            />
          ) : null}
          <p className="hint">
            {sum
              ? "Each bar counts the panelists' parts in its range, without names, and the diamond is yours. Each panelist estimates their own part, so the spread shows different parts, not disagreement."
              : "Each bar counts the anonymous answers in its range; the shaded box runs from Q1 to Q3, the line marks the median, and the diamond is your answer. Quartiles by Hyndman & Fan (1996) definition 7."}
          </p>
          {f.explanationRequested ? (
            <p className="caution" role="note" data-explanation-requested="true">
              Your round {round} answer lay {f.myPosition ? POSITION[f.myPosition] : "outside the interquartile range"} of the
              group. Please explain your reasoning in the rationale of your next answer — you may keep your answer if you
              think it is right; your reasons help the others.
            </p>
          ) : null}
          {f.rationaleCount > 0 ? (
            mode === "link" ? (
              <p className="small">
                <a href={moreHref} data-rationales-link={f.rationaleCount}>
                  Read the anonymous rationales ({f.rationaleCount})
                </a>
              </p>
            ) : (
              <>
                <h4>
                  Anonymous rationales{" "}
                  <span className="muted small">
                    ({rest > 0 ? `the ${f.rationales.length} nearest ${f.myAnswer ? "your answer" : "the median"} of ${f.rationaleCount}` : f.rationaleCount})
                  </span>
                </h4>
                {rationales}
                {rest > 0 ? (
                  <p className="small">
                    <a href={`${moreHref}&n=${f.rationales.length + MORE_STEP}#f-${f.questionId}`} data-more-rationales={rest}>
                      Show {Math.min(rest, MORE_STEP)} more
                    </a>
                  </p>
                ) : null}
              </>
            )
          ) : (
            <p className="muted small">No rationales were given.</p>
          )}
        </>
      )}
    </div>
  );
}
