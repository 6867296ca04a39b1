/**
 * Track records of the organiser's expert roster (lib/triangulation/track-records.ts
 * `listTrackRecords`): per member the questions with an outcome, mean error, mean log ratio
 * outcome/answer, MAPE, interval hit rate of three-point answers, the bias factor with its
 * shrinkage, and Theil's proportions once there are enough outcomes.
 */
import type { RosterTrackRecordView } from "@/lib/triangulation/track-records";
import { BIAS_PRIOR_STRENGTH, MIN_OUTCOMES_FOR_THEIL } from "@/lib/blend";
import Figure from "./figure";
import { countOf, formatNumber, formatPercent } from "./format";

export default function TrackRecordRoster({ records }: { records: readonly RosterTrackRecordView[] }) {
  const withTheil = records.filter((r) => r.record.theil !== null);
  return (
    <>
      <p className="small muted">
        Over your questions with a recorded outcome. Mean error = mean of (outcome − answer): positive means the person answers too low. Mean log ratio = mean of ln(outcome /
        answer). Bias factor = exp(Z · mean log ratio) with credibility Z = n / (n + {BIAS_PRIOR_STRENGTH}): with few recorded outcomes the factor is shrunk
        toward 1, so one lucky or unlucky question does not swing a person&apos;s correction (Bühlmann-style credibility; the constant{" "}
        {BIAS_PRIOR_STRENGTH} is a judgement call — common practice, not a published value). The corrected answer is answer × factor. Interval hit rate: the
        share of outcomes inside the person&apos;s low–high range (nominally 80% for P10–P90).
      </p>
      <div className="table-scroll">
        <table className="small track-records">
          <thead>
            <tr>
              <th>Name</th>
              <th className="num">Outcomes n</th>
              <th className="num">Mean error</th>
              <th className="num">Mean log ratio</th>
              <th className="num">MAPE</th>
              <th className="num">Interval hit rate</th>
              <th className="num">Unshrunk factor</th>
              <th className="num">Z</th>
              <th className="num">Bias factor</th>
            </tr>
          </thead>
          <tbody>
            {records.map((r) => (
              <tr key={r.rosterMemberId} data-track-record={r.name}>
                <td>
                  {r.name} {r.group ? <span className="muted">· {r.group}</span> : null}
                  {r.skipped > 0 ? <span className="hint">{countOf(r.skipped, "answer")} left out (value or outcome ≤ 0, or too extreme to score)</span> : null}
                </td>
                <td className="num" data-stat="count">
                  {r.record.count}
                </td>
                <td className="num">
                  <Figure value={r.record.meanError} name="mean-error" />
                </td>
                <td className="num">
                  <Figure value={r.record.meanLogRatio} name="mean-log-ratio" digits={3} />
                </td>
                <td className="num">{r.record.mape === null ? "—" : `${formatNumber(r.record.mape, 3)}%`}</td>
                <td className="num">
                  {r.record.intervalHitRate.count === 0 ? (
                    <span className="muted">no three-point answers</span>
                  ) : (
                    <>
                      {formatPercent(r.record.intervalHitRate.rate, 0)} ({r.record.intervalHitRate.hits}/{r.record.intervalHitRate.count})
                    </>
                  )}
                </td>
                <td className="num">
                  <Figure value={r.record.bias.raw} digits={4} />
                </td>
                <td className="num">
                  <Figure value={r.record.bias.credibility} digits={3} />
                </td>
                <td className="num">
                  <Figure value={r.record.bias.factor} name="bias-factor" digits={4} />
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <h3>Theil&apos;s decomposition of the squared error</h3>
      {withTheil.length === 0 ? (
        <p className="muted small">
          Shown for a person once {MIN_OUTCOMES_FOR_THEIL} of their answers have an outcome (with fewer, the proportions are mostly noise; common practice).
        </p>
      ) : (
        <div className="table-scroll">
          <table className="small">
            <thead>
              <tr>
                <th>Name</th>
                <th className="num">n</th>
                <th className="num">MSE</th>
                <th className="num">Bias U<sup>M</sup></th>
                <th className="num">Regression U<sup>R</sup></th>
                <th className="num">Disturbance U<sup>D</sup></th>
                <th className="num">Variance U<sup>S</sup></th>
                <th className="num">Covariance U<sup>C</sup></th>
              </tr>
            </thead>
            <tbody>
              {withTheil.map((r) => {
                const t = r.record.theil!;
                return (
                  <tr key={r.rosterMemberId} data-theil={r.name}>
                    <td>{r.name}</td>
                    <td className="num">{t.n}</td>
                    <td className="num">
                      <Figure value={t.mse} />
                    </td>
                    <td className="num">
                      <Figure value={t.um} digits={3} />
                    </td>
                    <td className="num">
                      <Figure value={t.ur} digits={3} />
                    </td>
                    <td className="num">
                      <Figure value={t.ud} digits={3} />
                    </td>
                    <td className="num">
                      <Figure value={t.us} digits={3} />
                    </td>
                    <td className="num">
                      <Figure value={t.uc} digits={3} />
                    </td>
                  </tr>
                );
              })}
            </tbody>
          </table>
          <p className="hint">
            Theil (1966): U<sup>M</sup> + U<sup>R</sup> + U<sup>D</sup> = 1 and U<sup>M</sup> + U<sup>S</sup> + U<sup>C</sup> = 1. A large U<sup>M</sup> is a systematic bias (what the bias factor corrects); a large U<sup>R</sup> means
            the person&apos;s answers move too much or too little with the outcomes; U<sup>D</sup> is the unsystematic rest.
          </p>
        </div>
      )}
    </>
  );
}
