import type { Metadata } from "next";
import { notFound, redirect } from "next/navigation";
import { NotFoundError } from "@/lib/errors";
import { listAuditEvents } from "@/lib/panels/audit";
import { getBaseline, type BaselineView } from "@/lib/triangulation/baselines";
import { getPanel } from "@/lib/panels/panels";
import { getQuestionReportWithRule } from "@/lib/triangulation/report";
import { BASELINE_METHODS } from "@/lib/validation/triangulation-inputs";
import ActionForm, { FieldError } from "@/lib/ui/action-form";
import BaselineForm from "@/lib/ui/baseline-form";
import { formatDateTime, formatNumber } from "@/lib/ui/format";
import { requireSignedIn } from "@/lib/ui/require-user";
import {
  BaselineDetails,
  BiasCorrectionTable,
  BlendHeadline,
  LegWarnings,
  DepartureSection,
  LegsSideBySide,
  NotesInputsCautions,
  OutcomeSection,
  TrackRecordTable,
  WeightInputs,
} from "@/lib/ui/triangulation-sections";
import { baselineAction, blendRuleAction, correctOutcomeAction, recordOutcomeAction } from "./actions";

export const metadata: Metadata = { title: "Question" };

async function baselineOrNull(load: () => Promise<BaselineView>): Promise<BaselineView | null> {
  try {
    return await load();
  } catch (error) {
    if (error instanceof NotFoundError) return null;
    throw error;
  }
}

export default async function QuestionPage({ params }: { params: Promise<{ id: string; qid: string }> }) {
  const { id, qid } = await params;
  const here = `/panels/${id}/questions/${qid}`;
  const user = await requireSignedIn(here);
  if (user.role === "reviewer") redirect(`/reports/${id}/questions/${qid}`);
  let panel;
  try {
    panel = await getPanel(user, id);
  } catch (error) {
    if (error instanceof NotFoundError) notFound();
    throw error;
  }
  if (panel.role === "reviewer") redirect(`/reports/${id}/questions/${qid}`);
  const question = panel.questions.find((q) => q.id === qid);
  if (!question) notFound();
  const [{ report, weightRule: current }, baseline, audit] = await Promise.all([
    getQuestionReportWithRule(user, id, qid),
    baselineOrNull(() => getBaseline(user, id, qid)),
    listAuditEvents(user, id),
  ]);
  const hasOutcome = report.outcome !== null;
  const openRound = panel.rounds.some((r) => r.status === "open");
  const corrections = audit.filter((e) => e.action === "outcome.corrected" && e.detail.questionId === qid);
  const rule = current.from === "question" ? current.rule : "panel";
  return (
    <article className="question-page">
      <p className="muted small no-print">
        <a href="/panels">Panels</a> / <a href={`/panels/${id}`}>{panel.title}</a> /
      </p>
      <h1>
        {question.position}. {question.text}
      </h1>
      <p className="muted small">
        Measured in {question.unit}; target period {question.targetPeriod}; plausible range {formatNumber(question.lowerBound, 8)} to{" "}
        {formatNumber(question.upperBound, 8)}; {question.aggregation === "shared" ? "shared quantity (median)" : "sum of parts (total)"}.{" "}
        <a href={`/reports/${id}/questions/${qid}`}>Reviewer report</a>
      </p>

      <LegWarnings report={report} />
      <BlendHeadline report={report} />

      <section aria-labelledby="attach-h" className="card">
        <h2 id="attach-h">{baseline ? "Replace the baseline" : "Attach a baseline"}</h2>
        {hasOutcome ? (
          <p className="muted">The outcome is recorded: the baseline is part of the scored record and can no longer change.</p>
        ) : (
          <>
            <p className="hint">
              The history the statistical baseline is fitted to: the series of past periods up to the last one known. The forecast for the target period
              comes with 80% and 95% prediction intervals; &ldquo;automatic&rdquo; averages exponential smoothing (its models weighted by AICc) and the Theta method, its
              intervals set by the combination&apos;s own errors on the history, allowing for the values the models estimated (docs/methods.md §20). A product with no history yet can borrow the course of analogous launches (Bass diffusion, with the market potential from the
              panel).
            </p>
            <details open={!baseline}>
              <summary>{baseline ? "Change the history or the method" : "History and method"}</summary>
              <BaselineForm
                action={baselineAction}
                panelId={id}
                questionId={qid}
                methods={BASELINE_METHODS}
                unit={question.unit}
                marketQuestions={panel.questions.filter((q) => q.id !== qid).map((q) => ({ id: q.id, text: `${q.position}. ${q.text}` }))}
                defaults={{
                  source: baseline?.source ?? "csv",
                  csv: "",
                  valueColumn: baseline?.valueColumn ?? "value",
                  season: baseline?.season ?? 1,
                  method: baseline?.requestedMethod ?? "auto",
                  horizon: baseline?.horizon ?? null,
                  firstPeriod: baseline && baseline.target.quantity !== "value" ? baseline.target.firstPeriod : 1,
                  quantity: baseline?.target.quantity ?? "value",
                  period: baseline?.target.period ?? "other",
                  analogue: baseline?.analogue ?? null,
                }}
              />
            </details>
          </>
        )}
      </section>

      <BaselineDetails report={report} baseline={baseline} />

      <section aria-labelledby="weights-h" className="card">
        <h2 id="weights-h">Blend weight rule</h2>
        <p className="small">
          Rule now: <strong>{current.rule === "equal" ? "equal weights" : current.rule === "inverse-mse" ? "inverse-MSE from past outcomes" : `set by the organiser (w = ${current.panelWeight})`}</strong>,{" "}
          {current.from === "question" ? "set on this question" : "the panel's rule"}.
        </p>
        <WeightInputs report={report} />
        {hasOutcome ? null : (
          <ActionForm action={blendRuleAction} submitLabel="Save weight rule" ariaLabel="Blend weight rule">
            <input type="hidden" name="panelId" value={id} />
            <input type="hidden" name="questionId" value={qid} />
            <fieldset>
              <legend>Weight of the panel against the baseline</legend>
              <label className="inline">
                <input type="radio" name="rule" value="panel" defaultChecked={rule === "panel"} /> The panel&apos;s rule
              </label>
              <label className="inline">
                <input type="radio" name="rule" value="equal" defaultChecked={rule === "equal"} /> Equal weights (50/50; Blattberg &amp; Hoch 1990)
              </label>
              <label className="inline">
                <input type="radio" name="rule" value="inverse-mse" defaultChecked={rule === "inverse-mse"} /> Inverse-MSE from past outcomes (Bates &amp;
                Granger 1969)
              </label>
              <label className="inline">
                <input type="radio" name="rule" value="organiser" defaultChecked={rule === "organiser"} /> Set by me
              </label>
              <FieldError name="rule" />
              <label className="narrow">
                Panel weight w (0 to 1; only when set by you)
                <input name="panelWeight" inputMode="decimal" defaultValue={rule === "organiser" ? (current.panelWeight ?? "") : ""} />
                <FieldError name="panelWeight" />
              </label>
            </fieldset>
          </ActionForm>
        )}
      </section>

      <LegsSideBySide report={report} />
      <BiasCorrectionTable report={report} />
      <TrackRecordTable report={report} />
      <DepartureSection report={report} />

      <section aria-labelledby="outcome-form-h" className="card">
        <h2 id="outcome-form-h">{hasOutcome ? "Correct the outcome" : "Record the outcome"}</h2>
        {hasOutcome ? (
          <>
            <p className="hint">
              A correction rescores the figures as they were reported; the old value, the new one and your reason are kept in the audit log.
            </p>
            <ActionForm action={correctOutcomeAction} submitLabel="Correct the outcome" ariaLabel="Correct the outcome">
              <input type="hidden" name="panelId" value={id} />
              <input type="hidden" name="questionId" value={qid} />
              <div className="row">
                <label>
                  Corrected outcome value ({question.unit})
                  <input name="outcomeValue" inputMode="decimal" />
                  <FieldError name="outcomeValue" />
                </label>
                <label style={{ flexBasis: "24rem" }}>
                  Reason
                  <input name="reason" maxLength={500} />
                  <FieldError name="reason" />
                </label>
              </div>
            </ActionForm>
            {corrections.length > 0 ? (
              <ul className="small muted">
                {corrections.map((e) => (
                  <li key={e.id}>
                    {formatDateTime(e.createdAt)}: {e.sentence}
                  </li>
                ))}
              </ul>
            ) : null}
          </>
        ) : openRound ? (
          <p className="muted">A round is open: close it first, so that the panel figure that is scored is final.</p>
        ) : report.legs.panel === null ? (
          <p className="muted">There is no panel figure to score yet: a round with answers must close first.</p>
        ) : (
          <>
            <p className="hint">
              When the outcome is known, record it. Every figure (raw panel, corrected panel, baseline, blend and each panelist&apos;s final answer) is scored,
              and the track records behind bias factors and inverse-MSE weights include it from then on. You will see the number as it will be recorded, with
              its unit, and confirm it before anything is saved.
            </p>
            <ActionForm action={recordOutcomeAction} submitLabel="Record the outcome" ariaLabel="Record the outcome">
              <input type="hidden" name="panelId" value={id} />
              <input type="hidden" name="questionId" value={qid} />
              <div className="row">
                <label>
                  Outcome value ({question.unit})
                  <input name="outcomeValue" inputMode="decimal" />
                  <FieldError name="outcomeValue" />
                </label>
                <label style={{ flexBasis: "24rem" }}>
                  Where the value comes from
                  <input name="note" maxLength={2000} />
                  <FieldError name="note" />
                </label>
              </div>
            </ActionForm>
          </>
        )}
      </section>

      <OutcomeSection report={report} />
      <NotesInputsCautions report={report} />
    </article>
  );
}
