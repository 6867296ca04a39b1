/**
 * The report's section on performance weights (Cooke's classical model, docs/methods.md §21):
 * each panelist's calibration and information score and weight under their pseudonym, both pools
 * of every target question, and the out-of-sample comparison in one sentence. Rendered only on
 * a panel with calibration questions.
 */
import type { CalibrationReport } from "@/lib/triangulation/calibration";
import type { JsonSafe } from "@/lib/panels/json";
import Figure from "./figure";

export default function PerformanceWeights({ report }: { report: JsonSafe<CalibrationReport> }) {
  const r = report;
  return (
    <section aria-labelledby="performance-h" data-performance-weights>
      <h2 id="performance-h">Performance weights (calibration questions)</h2>
      <p className="small">
        {r.calibrationQuestions} calibration question{r.calibrationQuestions === 1 ? "" : "s"}, {r.counted} with a true value and answers. Each
        panelist gave the 5th, 50th and 95th percentiles; the scores come from this panel&apos;s answers only.
      </p>
      {r.waiting ? <p className="caution">{r.waiting}</p> : null}
      <p data-weighting-verdict={r.outOfSample ? (r.outOfSample.weightingHelped ? "helped" : "did-not-help") : "none"}>
        <strong>{r.verdict}</strong>
      </p>
      {r.panelists.length > 0 ? (
        <div className="table-scroll">
          <table aria-label="Scores per panelist">
            <thead>
              <tr>
                <th>Panelist</th>
                <th className="num">Answered</th>
                <th className="num">Calibration</th>
                <th className="num">Information</th>
                <th className="num">Weight</th>
              </tr>
            </thead>
            <tbody>
              {r.panelists.map((p) => (
                <tr key={p.pseudonym} data-calibration-panelist={p.pseudonym}>
                  <td>{p.pseudonym}</td>
                  <td className="num">
                    {p.answered} of {r.counted}
                  </td>
                  <td className="num">{p.scored ? <Figure value={p.calibration} name="calibration" digits={3} /> : <span className="muted">not scored</span>}</td>
                  <td className="num">{p.scored ? <Figure value={p.information} name="information" digits={3} /> : "—"}</td>
                  <td className="num">{p.scored ? <Figure value={p.weight} name="weight" digits={3} /> : "—"}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      ) : null}
      {r.pools ? (
        <p className="small">
          On the calibration questions themselves: equal-weight pool calibration <Figure value={r.pools.equal.calibration} digits={3} />, information{" "}
          <Figure value={r.pools.equal.information} digits={3} />; performance-weighted pool calibration <Figure value={r.pools.performance.calibration} digits={3} />,
          information <Figure value={r.pools.performance.information} digits={3} /> (cut-off <Figure value={r.pools.performance.cutoff} digits={3} />). In-sample
          scores flatter the weighted pool; the sentence above is the fair comparison.
        </p>
      ) : null}
      {r.targets.length > 0 ? (
        <div className="table-scroll">
          <table aria-label="Pools per target question">
            <thead>
              <tr>
                <th>Question</th>
                <th className="num">Equal weights P5 / P50 / P95</th>
                <th className="num">Performance-weighted P5 / P50 / P95</th>
              </tr>
            </thead>
            <tbody>
              {r.targets.map((t) => (
                <tr key={t.questionId} data-target-pools={t.questionId}>
                  <td>
                    {t.text} <span className="muted small">({t.unit})</span>
                    {t.note ? <div className="muted small">{t.note}</div> : null}
                  </td>
                  <td className="num" data-pool="equal">
                    {t.equal ? (
                      <>
                        <Figure value={t.equal.p5} /> / <Figure value={t.equal.p50} name="p50" /> / <Figure value={t.equal.p95} />
                      </>
                    ) : (
                      "—"
                    )}
                  </td>
                  <td className="num" data-pool="performance">
                    {t.performance ? (
                      <>
                        <Figure value={t.performance.p5} /> / <Figure value={t.performance.p50} name="p50" /> / <Figure value={t.performance.p95} />
                      </>
                    ) : (
                      "—"
                    )}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      ) : null}
      <details>
        <summary>How these are computed</summary>
        <ul className="small">
          {r.method.map((m) => (
            <li key={m}>{m}</li>
          ))}
        </ul>
      </details>
    </section>
  );
}
