import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { getPanelistPanel } from "@/lib/panels/answers";
import { getFeedback } from "@/lib/panels/feedback";
import ActionForm, { FieldError, SubmitButton } from "@/lib/ui/action-form";
import ErrorBanner from "@/lib/ui/error-banner";
import Figure from "@/lib/ui/figure";
import { formatDateTime, formatNumber } from "@/lib/ui/format";
import LinkProblem from "@/lib/ui/link-problem";
import { panelistFromLink } from "@/lib/ui/panelist-access";
import QuestionFeedback from "@/lib/ui/question-feedback";
import { LocaleField, NumberInput } from "@/lib/ui/typed-number-input";
import type { PanelistQuestionView } from "@/lib/panels/answers";
import { questionPage, QuestionPager } from "@/lib/ui/question-pages";
import { submitAllAnswersAction, submitAnswerAction } from "./actions";

// The link is a secret: no referrer leaves the page, and search engines stay out.
export const metadata: Metadata = { title: "Your answers", referrer: "no-referrer", robots: { index: false, follow: false } };
export const dynamic = "force-dynamic";

export default async function PanelistPage({ params, searchParams }: { params: Promise<{ token: string }>; searchParams: Promise<{ page?: string | string[]; late?: string | string[] }> }) {
  const { token: asGiven } = await params;
  const { page, late } = await searchParams;
  const who = await panelistFromLink(asGiven);
  if ("problem" in who) return <LinkProblem problem={who.problem} />;
  // Punctuation an e-mail program added to the link: continue on the clean link.
  if (who.token !== asGiven) redirect(`/p/${who.token}${typeof page === "string" ? `?page=${encodeURIComponent(page)}` : ""}`);
  const token = who.token;
  const view = await getPanelistPanel(who.actor);
  // One page of questions at a time (lib/ui/question-pages.tsx), with the feedback of those only.
  const at = questionPage(view.questions.length, page);
  const shown = view.questions.slice(at.from, at.to);
  const feedback = await getFeedback(who.actor, { questionIds: shown.map((q) => q.id) });
  const round = view.round;
  const answerAction = submitAnswerAction.bind(null, token);
  const allAction = submitAllAnswersAction.bind(null, token);
  // Several questions open at once: one form and one "Save all" button for the page's questions.
  const together = view.acceptingAnswers && shown.length > 1;
  const feedbackFor = (questionId: string) => feedback.questions.find((q) => q.questionId === questionId) ?? null;
  const showInlineFeedback = feedback.round !== null && view.acceptingAnswers;
  const pager = (
    <QuestionPager
      at={at}
      count={view.questions.length}
      href={(n) => `/p/${token}?page=${n}`}
      note={(from, to) => `${view.questions.slice(from, to).filter((q) => q.answer).length} of ${to - from} answered`}
    />
  );

  const questionList = (
    <>
      {shown.map((q, k) => {
          const i = at.from + k;
          const f = feedbackFor(q.id);
          const three = q.answerFormat === "three-point";
          return (
            <section key={q.id} className="card" data-question={q.id}>
              <h2>
                {i + 1}. {q.text}
              </h2>
              <p className="muted small">
                In {q.unit}, for {q.targetPeriod}. Plausible range {formatNumber(q.lowerBound, 8)} to {formatNumber(q.upperBound, 8)}.
                {q.aggregation === "sum-of-parts" ? " Estimate your own part (e.g. your territory); the panel adds the parts." : ""}
              </p>
              {showInlineFeedback && f && feedback.round !== null ? <QuestionFeedback f={f} round={feedback.round} rationales="link" moreHref={`/p/${token}/feedback?q=${encodeURIComponent(q.id)}#f-${q.id}`} /> : null}
              {q.answer ? (
                <p className="current-answer" data-current-answer={q.answer.value}>
                  Your answer in round {q.answer.roundNumber}:{" "}
                  <strong>
                    {three && q.answer.low !== null && q.answer.high !== null ? (
                      <>
                        low <Figure value={q.answer.low} />, median <Figure value={q.answer.value} />, high{" "}
                        <Figure value={q.answer.high} />
                      </>
                    ) : (
                      <Figure value={q.answer.value} />
                    )}{" "}
                    {q.unit}
                  </strong>
                  <span className="muted small">
                    {" "}
                    (saved {formatDateTime(q.answer.answeredAt)}
                    {q.versions.length > 1 ? `; revised ${q.versions.length - 1} time${q.versions.length === 2 ? "" : "s"}` : ""})
                  </span>
                  {q.answer.rationale ? (
                    <>
                      <br />
                      <span className="muted small">Your rationale: {q.answer.rationale}</span>
                    </>
                  ) : null}
                </p>
              ) : null}
              {together ? (
                <AnswerFields q={q} prefix={`q${i}.`} />
              ) : view.acceptingAnswers ? (
                <ActionForm action={answerAction} submitLabel={q.answer ? "Save revised answer" : "Save answer"} ariaLabel={`Answer to question ${i + 1}`} otherSubmits>
                  <AnswerFields q={q} prefix="" />
                </ActionForm>
              ) : !showInlineFeedback && f && feedback.round !== null ? (
                <QuestionFeedback f={f} round={feedback.round} rationales="link" moreHref={`/p/${token}/feedback?q=${encodeURIComponent(q.id)}#f-${q.id}`} />
              ) : null}
            </section>
          );
        })}
    </>
  );

  return (
    <article className="panelist-page">
      <h1>{view.panel.title}</h1>
      {view.panel.description ? <p>{view.panel.description}</p> : null}
      <p className="muted small">
        Your answers are anonymous to the other panelists: they see only the group&apos;s figures and unnamed rationales.
      </p>
      {late !== undefined && !view.acceptingAnswers ? (
        <ErrorBanner data-late-answer>
          Your last answer was not stored: {view.panel.status === "finished" ? "the panel had finished" : `round ${round?.number ?? ""} had closed${round?.closedAt ? ` (on ${formatDateTime(round.closedAt)})` : ""}`} before it
          arrived.
        </ErrorBanner>
      ) : null}
      {view.panel.status === "finished" ? (
        <p className="notice">This panel is finished. Thank you for taking part.</p>
      ) : view.acceptingAnswers && round ? (
        <p className="notice" data-round-open={round.number}>
          Round {round.number} is open.
          {round.deadline ? ` It closes at ${formatDateTime(round.deadline)}.` : " The organiser closes it."} You can revise your
          answers until then.
        </p>
      ) : round?.status === "closed" ? (
        <p className="notice">
          Round {round.number} is closed. {feedback.round !== null ? "The group's figures are below. " : ""}You will be able
          to answer again with this link if the organiser opens another round.
        </p>
      ) : (
        <p className="notice">Round 1 has not opened yet. Come back to this link once the organiser opens it.</p>
      )}
      <p>
        {feedback.round !== null ? (
          <>
            <a href={`/p/${token}/feedback`}>Full feedback of round {feedback.round}</a>
            {" · "}
          </>
        ) : null}
        <a href={`/p/${token}/record`}>Your record</a> <span className="muted small">(how your past answers turned out; only you see it)</span>
      </p>

      {pager}
      {together ? (
        <ActionForm action={allAction} submitLabel="Save all answers" ariaLabel="Your answers" otherSubmits>
          {questionList}
        </ActionForm>
      ) : (
        questionList
      )}
      {pager}
    </article>
  );
}

/** Last round's answer in words, for the "keep my answer" button. */
function previousText(q: PanelistQuestionView): string {
  const p = q.previousAnswer!;
  return q.answerFormat === "three-point" && p.low !== null && p.high !== null
    ? `low ${formatNumber(p.low, 8)}, median ${formatNumber(p.value, 8)}, high ${formatNumber(p.high, 8)} ${q.unit}`
    : `${formatNumber(p.value, 8)} ${q.unit}`;
}

/**
 * One question's answer fields, named `<prefix><field>` (prefix "q<i>." in the "Save all" form),
 * prefilled with this round's answer, else last round's; with a one-tap "keep my answer" while
 * last round's answer is not yet this round's.
 */
function AnswerFields({ q, prefix }: { q: PanelistQuestionView; prefix: string }) {
  const three = q.answerFormat === "three-point";
  const shown = q.answer ?? q.previousAnswer;
  return (
    <>
      <LocaleField />
      <input type="hidden" name={`${prefix}questionId`} value={q.id} />
      {prefix && q.answer ? (
        <input type="hidden" name={`${prefix}current`} value={JSON.stringify([q.answer.value, q.answer.low, q.answer.high, q.answer.rationale.trim()])} />
      ) : null}
      {q.previousAnswer && !q.answer ? (
        <p className="keep-answer">
          <SubmitButton name="keep" value={q.id} className="secondary" data-keep={q.id}>
            Keep my answer ({previousText(q)})
          </SubmitButton>{" "}
          <span className="hint">Your final answer of round {q.previousAnswer.roundNumber}; or change it below.</span>
        </p>
      ) : null}
      {three ? (
        <div className="row">
          <label>
            {q.calibration ? (
              <>
                Low (5th percentile) <span className="hint">Only a 1-in-20 chance it is lower.</span>
              </>
            ) : (
              <>
                Low (10th percentile) <span className="hint">Only a 1-in-10 chance it is lower.</span>
              </>
            )}
            <NumberInput name={`${prefix}low`} defaultValue={shown?.low} />
            <FieldError name={`${prefix}low`} />
          </label>
          <label>
            Median estimate (50th percentile)
            <NumberInput name={`${prefix}value`} defaultValue={shown?.value} />
            <FieldError name={`${prefix}value`} />
          </label>
          <label>
            {q.calibration ? (
              <>
                High (95th percentile) <span className="hint">Only a 1-in-20 chance it is higher.</span>
              </>
            ) : (
              <>
                High (90th percentile) <span className="hint">Only a 1-in-10 chance it is higher.</span>
              </>
            )}
            <NumberInput name={`${prefix}high`} defaultValue={shown?.high} />
            <FieldError name={`${prefix}high`} />
          </label>
        </div>
      ) : (
        <label>
          Your estimate ({q.unit})
          <NumberInput name={`${prefix}value`} defaultValue={shown?.value} />
          <FieldError name={`${prefix}value`} />
        </label>
      )}
      {q.rationaleRequired ? (
        <p className="caution" data-rationale-required="true">
          {q.rationaleReason}
        </p>
      ) : null}
      <label>
        Rationale {q.rationaleRequired ? <strong>(required this round)</strong> : <span className="hint">What your estimate rests on; others read it without your name.</span>}
        <textarea name={`${prefix}rationale`} rows={3} maxLength={2000} defaultValue={shown?.rationale ?? ""} />
        <FieldError name={`${prefix}rationale`} />
      </label>
      <FieldError name={`${prefix}questionId`} />
      <FieldError name="keep" />
    </>
  );
}
