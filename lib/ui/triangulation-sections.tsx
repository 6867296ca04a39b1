/**
 * Sections of a question's triangulation, shared by the organiser's question page and the
 * reviewer's report: the blended figure and range, the three legs side by side, the baseline's
 * method, parameters and holdout accuracy with its chart, the weight rule with its inputs, the
 * departure report (table and chart), the bias correction applied, the outcome's scores, and
 * the method notes, inputs and cautions. They only display the report read model
 * (lib/triangulation/report.ts) and the stored baseline (lib/triangulation/baselines.ts); no figure is
 * computed here.
 */
import type { BaselineView } from "@/lib/triangulation/baselines";
import type { QuestionReport } from "@/lib/triangulation/report";
import { BIAS_PRIOR_STRENGTH, MIN_OUTCOMES_FOR_THEIL, MIN_OUTCOMES_FOR_WEIGHTS } from "@/lib/blend";
import BaselineChart from "./baseline-chart";
import DepartureChart from "./departure-chart";
import Figure from "./figure";
import { formatDate, formatDecimals, formatExact, formatNumber } from "./format";
import RangeChart, { type RangeRow } from "./range-chart";
import LaunchTable, { launchPreview } from "./launch-table";

type Intervals = readonly { readonly level: number; readonly lower: number | null; readonly upper: number | null }[];

function level(iv: Intervals | undefined, l: number): { lower: number | null; upper: number | null } {
  const x = iv?.find((i) => i.level === l);
  return { lower: x?.lower ?? null, upper: x?.upper ?? null };
}

/** "a to b" with both figures carrying their exact values. */
function Range({ lower, upper, name }: { lower: number | null; upper: number | null; name: string }) {
  return (
    <>
      <Figure value={lower} name={`${name}-lower`} /> to <Figure value={upper} name={`${name}-upper`} />
    </>
  );
}

const RULE_NAME: Record<string, string> = {
  equal: "equal weights",
  "inverse-mse": "inverse-MSE weights from past outcomes (Bates & Granger 1969)",
  organiser: "set by the organiser",
  optimal: "Bates–Granger optimal weights",
};

function who(p: { pseudonym: string; name: string | null }): string {
  return p.name ? `${p.pseudonym} (${p.name})` : p.pseudonym;
}

/** A percentile (0–100) for reading: one decimal, "< 0.1" and "> 99.9" at the tails; exact value in data-value. */
function Percentile({ value }: { value: number | null }) {
  const text = value === null ? "—" : value < 0.1 ? "< 0.1" : value > 99.9 ? "> 99.9" : formatDecimals(value, 1);
  return (
    <span data-stat="percentile" data-value={value === null ? "" : String(value)} title={value === null ? "not defined" : formatExact(value)}>
      {text}
    </span>
  );
}

/** The blended figure and its 80% and 95% ranges, with the weight behind it: shown first. */
/** Warnings about the legs (lib/triangulation/warnings.ts): outside the plausible range, an order of magnitude apart. */
export function LegWarnings({ report }: { report: QuestionReport }) {
  if (report.warnings.length === 0) return null;
  return (
    <section className="card warnings" aria-label="Warnings" data-warnings={report.warnings.length}>
      <ul>
        {report.warnings.map((w) => (
          <li key={w} className="caution" data-warning>
            {w}
          </li>
        ))}
      </ul>
    </section>
  );
}

export function BlendHeadline({ report }: { report: QuestionReport }) {
  const b = report.blend;
  const unit = report.question.unit;
  if (!b) {
    return (
      <section className="card blend-headline" aria-labelledby="blend-h" data-blend="none">
        <h2 id="blend-h">Blended figure</h2>
        <p className="muted">
          {report.legs.baseline === null
            ? "No baseline is attached to this question yet, so there is no blend: the panel's figure stands alone (below)."
            : "No closed round has answers to this question yet, so there is no panel figure to blend."}
        </p>
      </section>
    );
  }
  const r80 = level(b.intervals, 80);
  const r95 = level(b.intervals, 95);
  return (
    <section className="card blend-headline" aria-labelledby="blend-h" data-blend="present">
      <h2 id="blend-h">Blended figure for {report.question.targetPeriod}</h2>
      <p className="headline-figure">
        <Figure value={b.figure} name="blend-figure" /> <span className="unit">{unit}</span>
      </p>
      <p className="hint">The median of the blended distribution: the outcome is as likely to fall above it as below.</p>
      <dl className="facts">
        <dt>80% range</dt>
        <dd>
          <Range lower={r80.lower} upper={r80.upper} name="blend-80" /> {unit}
        </dd>
        <dt>95% range</dt>
        <dd>
          <Range lower={r95.lower} upper={r95.upper} name="blend-95" /> {unit}
        </dd>
        <dt>Weights</dt>
        <dd>
          <Figure value={b.panelWeight} name="blend-panel-weight" digits={3} /> on the corrected panel figure,{" "}
          <Figure value={b.baselineWeight} name="blend-baseline-weight" digits={3} /> on the baseline — {RULE_NAME[b.ruleApplied] ?? b.ruleApplied}
          {b.ruleApplied !== b.ruleRequested ? ` (asked: ${RULE_NAME[b.ruleRequested] ?? b.ruleRequested})` : ""}, set on the {b.ruleFrom}.
        </dd>
      </dl>
      <p className="small" data-range-how="blend">
        {b.rangeHow}
      </p>
      <p className="small muted">Blended figure = w × corrected panel figure + (1 − w) × baseline. {b.reason}</p>
    </section>
  );
}

function rangeRow(label: string, figure: number | null, iv: Intervals | undefined): RangeRow {
  const a = level(iv, 80);
  const c = level(iv, 95);
  return { label, figure, lower80: a.lower, upper80: a.upper, lower95: c.lower, upper95: c.upper };
}

/** The three legs side by side: judgment (raw and corrected), statistics, track record. */
export function LegsSideBySide({ report }: { report: QuestionReport }) {
  const unit = report.question.unit;
  const p = report.legs.panel;
  const b = report.legs.baseline;
  const t = report.legs.trackRecord;
  const rows: RangeRow[] = [];
  if (p) {
    rows.push(rangeRow("Panel (raw)", p.raw.figure, p.raw.intervals));
    rows.push(rangeRow("Panel (corrected)", p.corrected.figure, p.corrected.intervals));
  }
  if (b) rows.push({ label: `Baseline (${b.method})`, figure: b.target.mean, lower80: b.target.lower80, upper80: b.target.upper80, lower95: b.target.lower95, upper95: b.target.upper95 });
  if (report.blend) rows.push(rangeRow("Blend", report.blend.figure, report.blend.intervals));
  return (
    <section aria-labelledby="legs-h" className="legs-section">
      <h2 id="legs-h">The three legs</h2>
      <div className="legs-grid">
        <div className="card leg" data-leg="judgment">
          <h3>Judgment: the panel</h3>
          {p ? (
            <table className="small">
              <thead>
                <tr>
                  <th>
                    <span className="visually-hidden">Figure or range</span>
                  </th>
                  <th className="num">Raw</th>
                  <th className="num">Bias-corrected</th>
                </tr>
              </thead>
              <tbody>
                <tr>
                  <th>Figure</th>
                  <td className="num">
                    <Figure value={p.raw.figure} name="panel-raw" />
                  </td>
                  <td className="num">
                    <Figure value={p.corrected.figure} name="panel-corrected" />
                  </td>
                </tr>
                {[80, 95].map((l) => (
                  <tr key={l}>
                    <th>{l}% range</th>
                    <td className="num">
                      <Range {...level(p.raw.intervals, l)} name={`panel-raw-${l}`} />
                    </td>
                    <td className="num">
                      <Range {...level(p.corrected.intervals, l)} name={`panel-corrected-${l}`} />
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          ) : (
            <p className="muted">No closed round with answers yet.</p>
          )}
          {p ? (
            <>
              <p className="small" data-range-how="panel">
                {p.rangeHow}
              </p>
              <p className="hint">
                Round {p.round}, {p.n} answers. Unit: {unit}.
              </p>
            </>
          ) : null}
        </div>
        <div className="card leg" data-leg="statistics">
          <h3>Statistics: the baseline</h3>
          {b ? (
            <>
              <p>
                <Figure value={b.target.mean} name="leg-baseline-mean" /> {unit}
              </p>
              <p className="small">
                80%: <Range lower={b.target.lower80} upper={b.target.upper80} name="leg-baseline-80" />
                <br />
                95%: <Range lower={b.target.lower95} upper={b.target.upper95} name="leg-baseline-95" />
              </p>
              <p className="small" data-range-how="baseline">
                {b.rangeHow}
              </p>
              <p className="hint">
                Method {b.method}
                {b.requestedMethod === "auto" ? " (chosen automatically)" : " (chosen by the organiser)"}, {b.observations} observations,{" "}
                {b.horizon} step{b.horizon === 1 ? "" : "s"} ahead{b.analogue ? `, analogous product × ${b.analogue.scaleFactor}` : ""}.
              </p>
            </>
          ) : (
            <p className="muted">No baseline attached.</p>
          )}
        </div>
        <div className="card leg" data-leg="track-record">
          <h3>Track record</h3>
          <p>
            <strong data-stat="panelists-with-record">{t.panelistsWithRecord}</strong> of {p?.n ?? 0} panelists have recorded outcomes behind them.
          </p>
          {t.meanFactor !== null ? (
            <p className="small">
              Mean bias factor applied: <Figure value={t.meanFactor} name="mean-factor" digits={3} />
              {t.panelistsWithRecord === 0 ? " (all 1: no track record yet, so corrected = raw)" : ""}.
            </p>
          ) : null}
          <p className="hint">Each answer is multiplied by its panelist&apos;s shrunk bias factor; details under &ldquo;Bias correction&rdquo;.</p>
        </div>
      </div>
      {rows.length > 0 ? <RangeChart rows={rows} unit={unit} actual={report.outcome?.outcomeValue ?? null} /> : null}
    </section>
  );
}

/** The baseline's method, parameters, holdout accuracy and chart (history, fitted, fan). */
export function BaselineDetails({ report, baseline }: { report: QuestionReport; baseline: BaselineView | null }) {
  const b = report.legs.baseline;
  const unit = report.question.unit;
  if (!b || !baseline) return null;
  const params = Object.entries(b.parameters);
  const chosen = baseline.result.method;
  return (
    <section aria-labelledby="baseline-h" className="baseline-details" data-baseline-method={chosen}>
      <h2 id="baseline-h">Baseline</h2>
      <div className="card">
        <p className="headline-figure small-headline">
          <Figure value={b.target.mean} name="baseline-mean" /> <span className="unit">{unit}</span>{" "}
          <span className="muted small">
            the baseline answers: <span data-baseline-answers>{b.target.label}</span>; the question&apos;s target period: {report.question.targetPeriod}
          </span>
        </p>
        <dl className="facts">
          <dt>80% interval</dt>
          <dd>
            <Range lower={b.target.lower80} upper={b.target.upper80} name="baseline-80" /> {unit}
          </dd>
          <dt>95% interval</dt>
          <dd>
            <Range lower={b.target.lower95} upper={b.target.upper95} name="baseline-95" /> {unit}
          </dd>
          <dt>Method</dt>
          <dd data-stat="baseline-method">
            {chosen}
            {b.requestedMethod === "auto" ? " — the automatic baseline: ETS weighted by AICc and Theta, averaged" : " — named by the organiser"}
          </dd>
          <dt>Parameters</dt>
          <dd>
            {params.length === 0
              ? "none (the method has no parameters to estimate)"
              : params.map(([k, v], i) => (
                  <span key={k}>
                    {i > 0 ? ", " : ""}
                    {k} = <Figure value={v} name={`param-${k}`} />
                  </span>
                ))}
          </dd>
          <dt>Season, what it answers</dt>
          <dd>
            season {b.season}; the {b.target.label}
          </dd>
          <dt>History</dt>
          <dd>
            {baseline.result.launch
              ? `none of its own: ${b.observations} periods of ${baseline.result.launch.analogues.length} analogous launch${baseline.result.launch.analogues.length === 1 ? "" : "es"} (${baseline.result.launch.analogues.map((a) => a.name).join(", ")}); market potential ${baseline.result.launch.market.how}`
              : `${b.observations} observations (${b.source === "csv" ? `CSV column '${baseline.valueColumn}'` : "pasted values"})`}
            {b.analogue ? `; an analogous product's history × ${b.analogue.scaleFactor}: ${b.analogue.note}` : ""}
          </dd>
          <dt>Standard error at the horizon</dt>
          <dd>
            <Figure value={b.sd} name="baseline-sd" /> {unit} {b.sdSource ? <span className="muted small">(implied by its {b.sdSource})</span> : null}
          </dd>
          <dt>Holdout accuracy</dt>
          <dd>
            {b.holdout.chosenMase !== null ? (
              <>
                rolling-origin MASE <Figure value={b.holdout.chosenMase} name="holdout-mase" digits={3} />
              </>
            ) : (
              "no holdout comparison (a named method is fitted on the whole history)"
            )}
            ; in-sample MASE <Figure value={b.insample.mase} name="insample-mase" digits={3} />, MAPE{" "}
            {b.insample.mape === null || b.insample.mape === undefined ? "—" : `${formatNumber(b.insample.mape, 3)}%`}
          </dd>
        </dl>
        <BaselineChart
          labels={baseline.preview.rows.map((r) => String(r.row))}
          history={baseline.preview.rows.map((r) => r.scaled)}
          fitted={baseline.result.fitted}
          forecast={baseline.result.forecast.map((s) => ({
            step: s.step,
            mean: s.mean,
            lower80: s.lower["80"] ?? null,
            upper80: s.upper["80"] ?? null,
            lower95: s.lower["95"] ?? null,
            upper95: s.upper["95"] ?? null,
          }))}
          targetStep={b.horizon}
          unit={unit}
          launch={baseline.result.launch !== undefined}
          caption={
            baseline.result.launch
              ? "The launch forecast by period after launch, with its 80% and 95% bands up to the target period"
              : `History, one-step fitted values (${chosen}) and the forecast with its 80% and 95% bands up to the target period`
          }
        />
        {baseline.result.launch ? <LaunchTable launch={launchPreview(baseline.result)!} unit={unit} /> : null}
        {b.holdout.candidates.length > 0 ? (
          <details open>
            <summary>Every candidate&apos;s holdout MASE (lower is better; below 1 beats the naive method in-sample)</summary>
            <table className="small candidates">
              <thead>
                <tr>
                  <th>Method</th>
                  <th className="num">MASE</th>
                  <th>Note</th>
                </tr>
              </thead>
              <tbody>
                {b.holdout.candidates.map((c) => (
                  <tr key={c.method} data-candidate={c.method} className={c.method === chosen ? "chosen" : undefined}>
                    <td>
                      {c.method}
                      {c.method === chosen ? " (chosen)" : ""}
                    </td>
                    <td className="num">
                      <Figure value={c.mase} digits={4} />
                    </td>
                    <td className="muted">{c.error ?? ""}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </details>
        ) : null}
        {b.notes.length > 0 ? (
          <ul className="small muted">
            {b.notes.map((n) => (
              <li key={n}>{n}</li>
            ))}
          </ul>
        ) : null}
      </div>
    </section>
  );
}

/** The blend weight rule and the inputs behind the weight. */
export function WeightInputs({ report }: { report: QuestionReport }) {
  const b = report.blend;
  if (!b) return null;
  return (
    <dl className="facts small" data-weight-rule={b.ruleApplied}>
      <dt>Rule applied</dt>
      <dd>{RULE_NAME[b.ruleApplied] ?? b.ruleApplied}</dd>
      <dt>Panel weight w</dt>
      <dd>
        <Figure value={b.panelWeight} name="weight-panel" digits={4} />
      </dd>
      <dt>Recorded outcomes behind it</dt>
      <dd>
        {b.outcomesBehindWeight ?? 0} (inverse-MSE needs at least {MIN_OUTCOMES_FOR_WEIGHTS}; with fewer, equal weights apply. Even then the
        weight is shrunk toward 50/50 — the history has half the say only after 24 outcomes — because weights estimated from short
        records lose to equal weights in practice: Smith &amp; Wallis 2009)
      </dd>
      <dt>MSE of the panel / baseline</dt>
      <dd>
        <Figure value={b.msePanel} digits={4} /> / <Figure value={b.mseBaseline} digits={4} />{" "}
        <span className="muted">(relative errors over the organiser&apos;s recorded outcomes; w = (1/MSE panel) / (1/MSE panel + 1/MSE baseline))</span>
      </dd>
      <dt>Why</dt>
      <dd>{b.reason}</dd>
    </dl>
  );
}

/** The departure report: every answer in every round and the panel figure; table and chart. */
export function DepartureSection({ report }: { report: QuestionReport }) {
  const d = report.departures;
  const unit = report.question.unit;
  if (!d) {
    return (
      <section aria-labelledby="departures-h">
        <h2 id="departures-h">Departures from the baseline</h2>
        <p className="muted">The departure report needs a baseline and a closed round with answers.</p>
      </section>
    );
  }
  const rounds = d.panel.rounds.map((r) => r.round).filter((r): r is number => r !== null);
  const pseudonyms = [...new Set(d.answers.map((a) => a.pseudonym))].sort();
  const series = pseudonyms.map((p) => ({ label: p, z: rounds.map((r) => d.answers.find((a) => a.pseudonym === p && a.round === r)?.z ?? null) }));
  const row = (key: string, label: string, x: (typeof d.answers)[number] | (typeof d.panel.rounds)[number] | typeof d.correctedPanel, round: number | null, panel = false) => (
    <tr key={key} data-departure={key} className={panel ? "panel-row" : undefined}>
      <td>{round ?? "final"}</td>
      <td>{label}</td>
      <td className="num">
        <Figure value={x.value} name="value" />
      </td>
      <td className="num">
        <Figure value={x.difference} name="difference" />
      </td>
      <td className="num">{x.percent === null ? "—" : `${formatNumber(x.percent, 3)}%`}</td>
      <td className="num">
        <Figure value={x.z} name="z" digits={3} />
      </td>
      <td className="num">
        <Percentile value={x.percentile} />
      </td>
      <td>{x.outside95 ? <strong className="flag flag-95">outside 95%</strong> : x.outside80 ? <span className="flag flag-80">outside 80%</span> : <span className="muted">inside 80%</span>}</td>
    </tr>
  );
  return (
    <section aria-labelledby="departures-h" className="departures">
      <h2 id="departures-h">Departures from the baseline</h2>
      <p className="small muted">
        Against the baseline&apos;s {formatNumber(d.correctedPanel.baseline)} {unit} with standard error {formatNumber(d.correctedPanel.sd)} {unit} (
        {d.correctedPanel.sdSource}). Difference = value − baseline; percent of the baseline; z = difference / standard error; percentile = where the
        value falls in the baseline&apos;s normal predictive distribution, 100·Φ(z).
      </p>
      <DepartureChart rounds={rounds} answers={series} panel={d.panel.rounds.map((r) => r.z)} />
      <div className="table-scroll">
        <table className="small departure-table">
          <thead>
            <tr>
              <th>Round</th>
              <th>Answer</th>
              <th className="num">Value</th>
              <th className="num">Difference</th>
              <th className="num">Percent</th>
              <th className="num">z</th>
              <th className="num">Percentile</th>
              <th>Flag</th>
            </tr>
          </thead>
          <tbody>
            {rounds.flatMap((r) => [
              ...d.answers.filter((a) => a.round === r).sort((a, b) => a.pseudonym.localeCompare(b.pseudonym)).map((a) => row(`${a.pseudonym}-${r}`, a.pseudonym, a, r)),
              row(`panel-${r}`, "Panel figure (raw)", d.panel.rounds.find((x) => x.round === r)!, r, true),
            ])}
            {row("corrected-panel", "Panel figure (corrected)", d.correctedPanel, null, true)}
          </tbody>
        </table>
      </div>
      {d.panel.rounds.length > 1 ? (
        <p className="small">
          Across rounds the panel&apos;s z moved by <Figure value={d.panel.totalZChange} name="total-z-change" digits={3} />
          {d.panel.rounds.slice(1).map((r) => (
            <span key={r.round}>
              ; round {r.round} {r.closer === null ? "" : r.closer ? "moved toward the baseline" : "moved away from the baseline"}
            </span>
          ))}
          .
        </p>
      ) : null}
    </section>
  );
}

/** The bias correction applied to each final answer. */
export function BiasCorrectionTable({ report }: { report: QuestionReport }) {
  const rows = report.biasCorrection;
  if (!report.viewer.namesShown) {
    if (!report.legs.panel) return null;
    return (
      <section aria-labelledby="bias-h">
        <h2 id="bias-h">Bias correction applied</h2>
        <p className="small">
          {report.legs.trackRecord.panelistsWithRecord} of {report.legs.panel.n} panelists had a usable track record; the mean factor applied was{" "}
          <Figure value={report.legs.trackRecord.meanFactor} digits={3} />. The corrected panel figure is shown above.
        </p>
        <p className="small muted">
          Each panelist&apos;s factor, and the track record behind it, comes from their answers on other panels and would tell who is behind a pseudonym,
          so they are shown per panelist only to an organiser of this panel after revealing the names (recorded in the audit log).
        </p>
      </section>
    );
  }
  if (rows.length === 0) return null;
  return (
    <section aria-labelledby="bias-h">
      <h2 id="bias-h">Bias correction applied</h2>
      <p className="small muted">
        Corrected answer = answer × bias factor. Bias factor = exp(Z · mean log ratio outcome/answer) with credibility Z = n / (n + {BIAS_PRIOR_STRENGTH}
        ): with few recorded outcomes the factor is shrunk toward 1 (Bühlmann-style credibility; the constant {BIAS_PRIOR_STRENGTH} is a judgement call,
        common practice rather than a published value). The raw and the corrected panel figures are both shown above.
      </p>
      <div className="table-scroll">
        <table className="small">
          <thead>
            <tr>
              <th>Panelist</th>
              <th className="num">Answer</th>
              <th className="num">Outcomes n</th>
              <th className="num">Unshrunk factor</th>
              <th className="num">Credibility Z</th>
              <th className="num">Factor applied</th>
              <th className="num">Corrected answer</th>
            </tr>
          </thead>
          <tbody>
            {rows.map((p) => (
              <tr key={p.pseudonym} data-bias={p.pseudonym}>
                <td>{who(p)}</td>
                <td className="num">
                  <Figure value={p.value} />
                  {p.low !== null && p.high !== null ? (
                    <span className="muted">
                      {" "}
                      ({formatNumber(p.low)}–{formatNumber(p.high)})
                    </span>
                  ) : null}
                </td>
                <td className="num">{p.nOutcomes}</td>
                <td className="num">
                  <Figure value={p.rawFactor} digits={4} />
                </td>
                <td className="num">
                  <Figure value={p.credibility} digits={3} />
                </td>
                <td className="num">
                  <Figure value={p.factor} name="factor" digits={4} />
                </td>
                <td className="num">
                  <Figure value={p.correctedValue} name="corrected" />
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </section>
  );
}

/** Each panelist's track record as it stood for this question. */
export function TrackRecordTable({ report, open = false }: { report: QuestionReport; open?: boolean }) {
  const rows = report.legs.trackRecord.panelists;
  if (rows.length === 0) return null;
  return (
    <details open={open}>
      <summary>Track records behind the factors</summary>
      <div className="table-scroll">
        <table className="small">
          <thead>
            <tr>
              <th>Panelist</th>
              <th className="num">Outcomes</th>
              <th className="num">Mean error</th>
              <th className="num">Mean log ratio</th>
              <th className="num">MAPE</th>
              <th className="num">Interval hits</th>
              <th className="num">Bias factor</th>
            </tr>
          </thead>
          <tbody>
            {rows.map((p) => (
              <tr key={p.pseudonym}>
                <td>{who(p)}</td>
                <td className="num">{p.count}</td>
                <td className="num">
                  <Figure value={p.meanError} />
                </td>
                <td className="num">
                  <Figure value={p.meanLogRatio} digits={3} />
                </td>
                <td className="num">{p.mape === null ? "—" : `${formatNumber(p.mape, 3)}%`}</td>
                <td className="num">{p.intervalCount === 0 ? "—" : `${p.intervalHits}/${p.intervalCount}`}</td>
                <td className="num">
                  <Figure value={p.biasFactor} digits={4} />
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <p className="hint">Theil&apos;s decomposition is shown on the expert roster page once a panelist has {MIN_OUTCOMES_FOR_THEIL} recorded outcomes.</p>
    </details>
  );
}

/** The recorded outcome and the scores of every figure. */
export function OutcomeSection({ report }: { report: QuestionReport }) {
  const r = report.outcome;
  const unit = report.question.unit;
  if (!r) return null;
  const s = r.scores;
  const all = [s.rawPanel, s.correctedPanel, s.baseline, s.blend, ...s.panelists].filter((x): x is NonNullable<typeof x> => x !== null);
  return (
    <section aria-labelledby="outcome-h" className="outcome" data-outcome="yes">
      <h2 id="outcome-h">Outcome and errors</h2>
      <p>
        Outcome: <Figure value={r.outcomeValue} name="outcome-value" /> {unit}
        {r.note ? <span className="muted"> — {r.note}</span> : null}
        {r.correctedAt ? <span className="muted small"> (corrected on {formatDate(r.correctedAt)}; see the audit log)</span> : null}
      </p>
      <div className="table-scroll">
        <table className="small">
          <thead>
            <tr>
              <th>Figure</th>
              <th className="num">Forecast</th>
              <th className="num">Error (outcome − forecast)</th>
              <th className="num">Absolute % error</th>
              <th className="num">sMAPE term</th>
              <th className="num">Scaled error</th>
            </tr>
          </thead>
          <tbody>
            {all.map((x) => (
              <tr key={x.label} data-score={x.label}>
                <td>{x.label}</td>
                <td className="num">
                  <Figure value={x.forecast} name="forecast" />
                </td>
                <td className="num">
                  <Figure value={x.error} name="error" />
                </td>
                <td className="num">{x.absolutePercentError === null ? "—" : `${formatNumber(x.absolutePercentError, 3)}%`}</td>
                <td className="num">{x.symmetricPercentError === null ? "—" : `${formatNumber(x.symmetricPercentError, 3)}%`}</td>
                <td className="num">
                  <Figure value={x.scaledError} digits={3} />
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <p className="hint">
        Scaled error = |error| / the in-sample MAE of the naive method on the baseline&apos;s history (the MASE scale, Hyndman &amp; Koehler 2006). The
        figures are those that stood when the outcome was recorded.
      </p>
    </section>
  );
}

/** Method notes, inputs and cautions. */
export function NotesInputsCautions({ report }: { report: QuestionReport }) {
  return (
    <section aria-labelledby="notes-h" className="notes">
      <h2 id="notes-h">Method notes, inputs and cautions</h2>
      <div className="caution">
        <strong>Cautions</strong>
        <ul>
          {report.cautions.map((c) => (
            <li key={c}>{c}</li>
          ))}
        </ul>
      </div>
      <h3>Inputs behind the figures</h3>
      <ul className="small">
        {report.inputs.map((c) => (
          <li key={c}>{c}</li>
        ))}
      </ul>
      <h3>Method notes</h3>
      <ul className="small">
        {report.methodNotes.map((c) => (
          <li key={c}>{c}</li>
        ))}
      </ul>
    </section>
  );
}

