/**
 * The convergence view of a panel after each closed round (organisers and reviewers): per
 * question, the median with its interquartile band across rounds (chart and table of n, median,
 * Q1, Q3, IQR, relative IQR, CV), or for sum-of-parts questions each part by pseudonym and the
 * total; then each stopping rule's verdict with the numbers behind it and the recommendation,
 * worded as support for the organiser's decision.
 */
import type { ConvergencePoint } from "@/lib/panels/rounds";
import type { ConvergencePageView, RoundParts } from "@/lib/panels/views";
import { STOPPING_RULE_DEFAULTS as D, consensusApplies, type QuestionVerdict } from "@/lib/stats/stopping-rules";
import ConvergenceChart from "./convergence-chart";
import Figure from "./figure";
import { formatNumber, formatPercent } from "./format";
import RuleSource from "./rule-source";

const MEASURE = { cv: "coefficient of variation", "relative-iqr": "relative IQR" } as const;

function Verdict({ met, applicable = true }: { met: boolean; applicable?: boolean }) {
  if (!applicable) return <span className="muted">not applicable</span>;
  return met ? <span className="verdict-met">met</span> : <span className="verdict-not-met">not met</span>;
}

function change(v: number | null): string {
  if (v === null) return "—";
  if (!Number.isFinite(v)) return "unbounded (previous value 0)";
  return formatPercent(v);
}

function QuestionVerdictText({ v, unitLabel }: { v: QuestionVerdict; unitLabel: string }) {
  const c = v.consensus;
  const s = v.stability;
  return (
    <ul className="verdicts" data-question-verdict={v.questionId}>
      <li>
        Consensus rule ({MEASURE[c.measure]} ≤ {formatNumber(c.threshold)}): <Verdict met={c.met} applicable={c.applicable} />
        {c.applicable ? (
          <>
            {" "}
            — {MEASURE[c.measure]} is <Figure value={c.value} name="consensus-value" />
            {c.value === null ? " (not defined for these answers)" : ""}.
          </>
        ) : (
          <> — panelists estimate different parts, so agreement between them is not the question.</>
        )}
      </li>
      <li>
        Stability rule (change ≤ {formatPercent(s.threshold, 0)} between rounds): <Verdict met={s.met} applicable={s.applicable} />
        {!s.applicable ? (
          <> — needs two closed rounds to compare.</>
        ) : s.totalChange !== null || s.distributionChange === null ? (
          <> — the total {unitLabel} changed by {change(s.totalChange)}.</>
        ) : (
          <>
            {" "}
            — {change(s.distributionChange)} of the panelists moved between the previous round&apos;s quartile classes (the
            median changed by {change(s.medianChange)}, for information).
          </>
        )}
      </li>
      <li>
        {v.settled
          ? v.consensus.applicable && !v.consensus.met
            ? "Settled: the answers are stable but not in agreement; the spread of views is the finding."
            : "Settled: the answers are stable."
          : "Not settled: the answers are not yet stable (consensus alone does not settle a question)."}
      </li>
    </ul>
  );
}

/**
 * The panel figure across closed rounds: the median with its interquartile band, or for a
 * sum-of-parts question the total of the parts (a band between panelists' parts means nothing).
 */
export function RoundsChart({ rounds, unit, sum }: { rounds: readonly ConvergencePoint[]; unit: string; sum: boolean }) {
  return (
    <ConvergenceChart
      unit={unit}
      label={sum ? "Total of the parts" : "Median"}
      points={rounds.map((r) => ({ round: r.round, median: sum ? r.total : r.median, q1: sum ? null : r.q1, q3: sum ? null : r.q3 }))}
    />
  );
}

/**
 * The statistics of each closed round: n, the median, Q1, Q3, IQR, relative IQR and CV; for a
 * sum-of-parts question n and the total, with the spread figures "not applicable" — the same
 * `consensusApplies` that makes the panel page's consensus verdict "not applicable" (panelists
 * estimate different parts, so their spread is not disagreement).
 */
export function RoundStatsTable({ rounds, aggregation }: { rounds: readonly ConvergencePoint[]; aggregation: "shared" | "sum-of-parts" }) {
  const spread = consensusApplies(aggregation);
  const na = <span className="muted" data-not-applicable="">not applicable</span>;
  return (
    <div className="table-scroll">
      <table className="convergence-table" data-aggregation={aggregation}>
        <thead>
          <tr>
            <th>Round</th>
            <th className="num">n</th>
            <th className="num">{spread ? "Median" : "Total"}</th>
            <th className="num">
              Q1 <span className="hint">lower quartile</span>
            </th>
            <th className="num">
              Q3 <span className="hint">upper quartile</span>
            </th>
            <th className="num">
              IQR <span className="hint">Q3 − Q1</span>
            </th>
            <th className="num">Relative IQR</th>
            <th className="num">CV</th>
          </tr>
        </thead>
        <tbody>
          {rounds.map((r) => (
            <tr key={r.round} data-round={r.round}>
              <td>Round {r.round}</td>
              <td className="num">
                <Figure value={r.n} name="n" />
              </td>
              <td className="num">{spread ? <Figure value={r.median} name="median" /> : <Figure value={r.total} name="total" />}</td>
              <td className="num">{spread ? <Figure value={r.q1} name="q1" /> : na}</td>
              <td className="num">{spread ? <Figure value={r.q3} name="q3" /> : na}</td>
              <td className="num">{spread ? <Figure value={r.iqr} name="iqr" /> : na}</td>
              <td className="num">{spread ? <Figure value={r.relativeIqr} name="relativeIqr" digits={3} /> : na}</td>
              <td className="num">{spread ? <Figure value={r.cv} name="cv" digits={3} /> : na}</td>
            </tr>
          ))}
        </tbody>
      </table>
      {spread ? (
        <p className="hint">
          Quartiles by Hyndman &amp; Fan (1996) definition 7 (R&apos;s default). Relative IQR = IQR / |median|; CV =
          sample standard deviation / mean. A dash means the figure is not defined (e.g. CV of a single answer).
        </p>
      ) : (
        <p className="hint">
          Sum of parts: the panel figure is the total of the parts. Panelists estimate different parts, so the spread between
          them is not disagreement: quartiles, relative IQR and CV do not apply, nor does the consensus rule; stability is judged
          on the total.
        </p>
      )}
    </div>
  );
}

/** Parts listed one by one in a sum-of-parts question's table; the others are added up in one row. */
export const PARTS_SHOWN = 10;

/**
 * Each panelist's part (under pseudonyms) and the total, per closed round. With more than
 * {@link PARTS_SHOWN} parts, the largest (by their latest part) are listed and the others added
 * up in one row, with a link to every part in the round's statistics (issue 13: a table of every
 * part of every sum-of-parts question made most of a 2.5 MB page at 300 panelists).
 */
export function PartsTable({ rounds, statisticsHref }: { rounds: readonly RoundParts[]; statisticsHref: (round: number) => string }) {
  const latest = new Map<string, number>();
  for (const r of rounds) for (const p of r.parts) latest.set(p.pseudonym, p.value);
  const all = [...latest.keys()].sort();
  const cut = all.length > PARTS_SHOWN;
  const pseudonyms = cut ? [...all].sort((a, b) => latest.get(b)! - latest.get(a)! || a.localeCompare(b)).slice(0, PARTS_SHOWN) : all;
  const listed = new Set(pseudonyms);
  return (
    <div className="table-scroll">
      <table className="parts-table">
        <caption className="muted small">
          {cut
            ? `The ${PARTS_SHOWN} largest of ${all.length} parts (by each panelist's latest part, under pseudonyms), the others added up, and the total, per round`
            : "Each panelist's part (under pseudonyms) and the total, per round"}
        </caption>
        <thead>
          <tr>
            <th>Part</th>
            {rounds.map((r) => (
              <th key={r.round} className="num">
                Round {r.round}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {pseudonyms.map((p) => (
            <tr key={p}>
              <td>{p}</td>
              {rounds.map((r) => {
                const part = r.parts.find((x) => x.pseudonym === p);
                return (
                  <td key={r.round} className="num">
                    {part ? (
                      <>
                        <Figure value={part.value} /> <span className="muted small">({formatPercent(part.share)})</span>
                      </>
                    ) : (
                      "—"
                    )}
                  </td>
                );
              })}
            </tr>
          ))}
          {cut ? (
            <tr data-other-parts={all.length - PARTS_SHOWN}>
              <td>{all.length - PARTS_SHOWN} other parts</td>
              {rounds.map((r) => {
                const others = r.parts.filter((x) => !listed.has(x.pseudonym));
                const sum = others.reduce((s, x) => s + x.value, 0);
                return (
                  <td key={r.round} className="num">
                    <Figure value={sum} /> <span className="muted small">({others.length} parts{r.total !== 0 ? `, ${formatPercent(sum / r.total)}` : ""})</span>
                  </td>
                );
              })}
            </tr>
          ) : null}
          <tr>
            <th>Total</th>
            {rounds.map((r) => (
              <th key={r.round} className="num" data-round={r.round}>
                <Figure value={r.total} name="total" />
              </th>
            ))}
          </tr>
        </tbody>
      </table>
      {cut ? (
        <p className="hint">
          Every part:{" "}
          {rounds.map((r, i) => (
            <span key={r.round}>
              {i > 0 ? ", " : ""}
              <a href={statisticsHref(r.round)}>round {r.round} statistics (JSON)</a>
            </span>
          ))}
          .
        </p>
      ) : null}
    </div>
  );
}

export default function ConvergenceView({ view, reader = "organiser" }: { view: ConvergencePageView; reader?: "organiser" | "reviewer" }) {
  const statisticsHref = (round: number) => `/api/v1/panels/${encodeURIComponent(view.panelId)}/rounds/${round}/statistics`;
  const closedRounds = Math.max(0, ...view.questions.map((q) => q.rounds.length));
  if (closedRounds === 0) {
    return <p className="muted">The convergence view appears once round 1 has closed.</p>;
  }
  const ev = view.evaluation;
  return (
    <div className="convergence">
      {view.questions.map((q, qi) => {
        const verdict = ev?.questions.find((v) => v.questionId === q.questionId);
        const sum = q.aggregation === "sum-of-parts";
        const rounds = view.parts[q.questionId] ?? [];
        return (
          <section key={q.questionId} className="card" data-convergence-question={q.questionId}>
            <h3>
              Question {qi + 1}: {q.text}
            </h3>
            <p className="muted small">
              Unit: {q.unit}. {sum ? "Sum of parts: the panel figure is the total of the parts." : "Shared quantity: the panel figure is the median."}
            </p>
            <RoundsChart rounds={q.rounds} unit={q.unit} sum={sum} />
            {sum ? (
              <PartsTable rounds={rounds} statisticsHref={statisticsHref} />
            ) : (
              <RoundStatsTable rounds={q.rounds} aggregation="shared" />
            )}
            {view.threePoint[q.questionId]?.length ? (
              <div className="table-scroll">
                <table className="three-point-table">
                  <caption className="muted small">
                    Three-point answers: medians of the lows (P10), of the median estimates (P50) and of the highs (P90), and the pooled panel
                    distribution
                  </caption>
                  <thead>
                    <tr>
                      <th>Round</th>
                      <th className="num">Median low</th>
                      <th className="num">Median of P50s</th>
                      <th className="num">Median high</th>
                      <th className="num">Pooled P10</th>
                      <th className="num">Pooled P50</th>
                      <th className="num">Pooled P90</th>
                    </tr>
                  </thead>
                  <tbody>
                    {view.threePoint[q.questionId].map((t) => {
                      const r = q.rounds.find((x) => x.round === t.round);
                      return (
                        <tr key={t.round} data-round={t.round}>
                          <td>Round {t.round}</td>
                          <td className="num">
                            <Figure value={t.lows?.median} name="low-median" />
                          </td>
                          <td className="num">
                            <Figure value={r?.median} />
                          </td>
                          <td className="num">
                            <Figure value={t.highs?.median} name="high-median" />
                          </td>
                          <td className="num">
                            <Figure value={t.pooled?.p10} name="pooled-p10" />
                          </td>
                          <td className="num">
                            <Figure value={t.pooled?.p50} name="pooled-p50" />
                          </td>
                          <td className="num">
                            <Figure value={t.pooled?.p90} name="pooled-p90" />
                          </td>
                        </tr>
                      );
                    })}
                  </tbody>
                </table>
                <p className="hint">
                  The pooled distribution is the equal-weight linear opinion pool of the answers, each read as two half-normal
                  sides meeting at its median (P50), with its low and high as P10 and P90; that reading is Triangulate&apos;s own convention, not a
                  published named distribution.
                </p>
              </div>
            ) : null}
            {verdict && ev ? (
              <>
                <h4>Stopping rules after round {ev.roundNumber}</h4>
                <QuestionVerdictText v={verdict} unitLabel={q.unit} />
              </>
            ) : null}
          </section>
        );
      })}
      {ev ? (
        <section className="card recommendation" data-recommendation={ev.recommendation}>
          <h3>What the stopping rules suggest after round {ev.roundNumber}</h3>
          <p>
            Round limit: round {ev.roundLimit.roundNumber} of {ev.roundLimit.limit} —{" "}
            {ev.roundLimit.met ? <span className="verdict-met">reached</span> : <span className="muted">not reached</span>}.
          </p>
          <p>
            <strong>
              {ev.recommendation === "stop"
                ? "The rules suggest the panel can stop here."
                : "The rules suggest running another round."}
            </strong>{" "}
            {ev.reasons.join(" ")}
          </p>
          <p className="caution">
            {reader === "organiser" ? "This supports your decision; it does not make it." : "This supports the organiser's decision; it does not make it."} A question counts as settled when its answers are stable
            (Dajani, Sincoff &amp; Talley 1979); consensus is shown but is not a reason to stop on its own (von der Gracht 2012),
            and the thresholds are conventions rather than verified findings unless marked otherwise below.
          </p>
          <details>
            <summary>The rules of this panel and where their defaults come from</summary>
            <ul className="small">
              <li>
                Consensus: {MEASURE[view.rules.consensusMeasure]} ≤ {formatNumber(view.rules.consensusThreshold)}.{" "}
                <RuleSource
                  rule={D.consensusThreshold[view.rules.consensusMeasure]}
                  shown={String(D.consensusThreshold[view.rules.consensusMeasure].value)}
                />
              </li>
              <li>
                Stability: change ≤ {formatPercent(view.rules.stabilityThreshold, 0)}.{" "}
                <RuleSource rule={D.stabilityThreshold} shown={formatPercent(D.stabilityThreshold.value, 0)} />
              </li>
              <li>
                Round limit: {view.rules.roundLimit}. <RuleSource rule={D.roundLimit} shown={String(D.roundLimit.value)} />
              </li>
            </ul>
          </details>
        </section>
      ) : null}
    </div>
  );
}
