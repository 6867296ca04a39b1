import type { Metadata } from "next";
import { TRACKING_SIGNAL_LIMIT } from "@/lib/blend";
import { getAccuracyHistory } from "@/lib/triangulation/track-records";
import Figure from "@/lib/ui/figure";
import { countOf, formatDate, formatNumber } from "@/lib/ui/format";
import { requireOrganiserPage } from "@/lib/ui/require-user";
import TrackingSignalChart from "@/lib/ui/tracking-signal-chart";

export const metadata: Metadata = { title: "Accuracy history" };

const FIGURES = [
  ["rawPanel", "Raw panel"],
  ["correctedPanel", "Corrected panel"],
  ["baseline", "Baseline"],
  ["blend", "Blend"],
] as const;

const MEASURES = [
  ["n", "Questions with an outcome", 0],
  ["me", "Mean error (ME)", 4],
  ["mae", "MAE", 4],
  ["rmse", "RMSE", 4],
  ["mpe", "MPE (%)", 3],
  ["mape", "MAPE (%)", 3],
  ["smape", "sMAPE (%)", 3],
  ["trackingSignal", "Tracking signal (last)", 3],
] as const;

export default async function AccuracyPage() {
  const user = await requireOrganiserPage("/accuracy");
  const view = await getAccuracyHistory(user);
  const h = view.history;
  return (
    <article className="accuracy-page">
      <h1>Accuracy history</h1>
      <p className="lead">
        How each figure did over your questions with a recorded outcome: the panel&apos;s raw figure, the bias-corrected panel, the statistical baseline and the blend.
      </p>
      {view.withoutBaseline > 0 ? (
        <p className="muted small">{countOf(view.withoutBaseline, "question")} with an outcome had no baseline and are left out (there is no baseline or blend to compare).</p>
      ) : null}
      {view.unusable > 0 ? (
        <p className="muted small">{countOf(view.unusable, "question")} with an outcome {view.unusable === 1 ? "is" : "are"} left out because a recorded value is too extreme to score (outside 0 or 1e-12 to 1e15 in size).</p>
      ) : null}
      {h === null ? (
        <p className="muted">No question with an outcome and a baseline yet. Record a question's outcome on its page once it is known.</p>
      ) : (
        <>
          <section aria-labelledby="measures-h">
            <h2 id="measures-h">Accuracy of each figure</h2>
            <div className="table-scroll">
              <table className="accuracy-table">
                <thead>
                  <tr>
                    <th>Measure</th>
                    {FIGURES.map(([, label]) => (
                      <th key={label} className="num">
                        {label}
                      </th>
                    ))}
                  </tr>
                </thead>
                <tbody>
                  {MEASURES.map(([key, label, digits]) => (
                    <tr key={key} data-measure={key}>
                      <th>{label}</th>
                      {FIGURES.map(([f]) => (
                        <td key={f} className="num">
                          <Figure value={h[f].accuracy[key] ?? null} name={`${f}-${key}`} digits={digits || undefined} />
                        </td>
                      ))}
                    </tr>
                  ))}
                  <tr>
                    <th>Tracking-signal alarm (|TS| &gt; {TRACKING_SIGNAL_LIMIT})</th>
                    {FIGURES.map(([f]) => (
                      <td key={f} className="num" data-alarm={f}>
                        {h[f].alarm.firstBreach === null ? (
                          <span className="muted">none</span>
                        ) : (
                          <strong className="flag flag-95">
                            after question {h[f].alarm.firstBreach} (TS {formatNumber(h[f].alarm.value, 3)})
                          </strong>
                        )}
                      </td>
                    ))}
                  </tr>
                </tbody>
              </table>
            </div>
          </section>
          <section aria-labelledby="signal-h">
            <h2 id="signal-h">Tracking signal</h2>
            <TrackingSignalChart
              labels={view.questions.map((_, i) => `Question ${i + 1}`)}
              series={FIGURES.map(([f, label]) => ({ label, values: h[f].trackingSignal }))}
              limit={TRACKING_SIGNAL_LIMIT}
            />
            <p className="small muted">
              Tracking signal = cumulative relative error / mean absolute relative error, after each recorded outcome, with relative error = (outcome −
              figure) / |outcome|: questions of different sizes count alike. A figure that stays beyond ±{TRACKING_SIGNAL_LIMIT}{" "}
              is biased in one direction; ±{TRACKING_SIGNAL_LIMIT} is common practice, not an authoritative limit.
            </p>
          </section>
          <section aria-labelledby="questions-h">
            <h2 id="questions-h">Questions with an outcome</h2>
            <div className="table-scroll">
              <table className="small">
                <thead>
                  <tr>
                    <th>#</th>
                    <th>Question</th>
                    <th>Recorded</th>
                    <th className="num">Outcome</th>
                    <th className="num">Raw panel</th>
                    <th className="num">Corrected</th>
                    <th className="num">Baseline</th>
                    <th className="num">Blend</th>
                  </tr>
                </thead>
                <tbody>
                  {view.questions.map((q, i) => (
                    <tr key={q.questionId} data-history-question={q.questionId}>
                      <td>{i + 1}</td>
                      <td>
                        <a href={`/panels/${q.panelId}/questions/${q.questionId}`}>{q.text}</a>
                        <span className="hint">
                          {q.panelTitle} · {q.unit}
                        </span>
                      </td>
                      <td>{formatDate(q.recordedAt)}</td>
                      <td className="num">
                        <Figure value={q.outcomeValue} name="outcome-value" />
                      </td>
                      <td className="num">
                        <Figure value={q.rawPanel} />
                      </td>
                      <td className="num">
                        <Figure value={q.correctedPanel} />
                      </td>
                      <td className="num">
                        <Figure value={q.baseline} />
                      </td>
                      <td className="num">
                        <Figure value={q.blend} name="blend" />
                      </td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
          </section>
        </>
      )}
      <section aria-labelledby="accuracy-notes-h">
        <h2 id="accuracy-notes-h">Notes</h2>
        <ul className="small">
          {view.notes.map((n) => (
            <li key={n}>{n}</li>
          ))}
        </ul>
        <p className="caution">Past accuracy is a guide, not a guarantee: a few outcomes say little about the next one.</p>
      </section>
    </article>
  );
}
