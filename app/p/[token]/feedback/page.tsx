import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { getFeedback, RATIONALES_SHOWN } from "@/lib/panels/feedback";
import { MAX_PANELISTS_PER_PANEL } from "@/lib/validation/limits";
import LinkProblem from "@/lib/ui/link-problem";
import { panelistFromLink } from "@/lib/ui/panelist-access";
import QuestionFeedback from "@/lib/ui/question-feedback";
import { questionPage, QuestionPager } from "@/lib/ui/question-pages";
import { getPanelistPanel } from "@/lib/panels/answers";
import Figure from "@/lib/ui/figure";

export const metadata: Metadata = { title: "Feedback", referrer: "no-referrer", robots: { index: false, follow: false } };
export const dynamic = "force-dynamic";

export default async function FeedbackPage({ params, searchParams }: { params: Promise<{ token: string }>; searchParams: Promise<{ q?: string | string[]; n?: string | string[]; page?: string | string[] }> }) {
  const { token: asGiven } = await params;
  const { q, n, page } = await searchParams;
  const who = await panelistFromLink(asGiven);
  if ("problem" in who) return <LinkProblem problem={who.problem} />;
  // Punctuation an e-mail program added to the link: continue on the clean link.
  if (who.token !== asGiven) redirect(`/p/${who.token}/feedback`);
  const token = who.token;
  // ?q=<question id>&n=<count>: more of that question's rationales (the "show more" links).
  const count = Math.min(MAX_PANELISTS_PER_PANEL, Math.max(RATIONALES_SHOWN, Math.trunc(Number(typeof n === "string" ? n : RATIONALES_SHOWN)) || RATIONALES_SHOWN));
  // One page of questions at a time (lib/ui/question-pages.tsx): the one holding ?q= if given.
  const { questions } = await getPanelistPanel(who.actor);
  const at = questionPage(questions.length, page, typeof q === "string" ? questions.findIndex((x) => x.id === q) : undefined);
  const feedback = await getFeedback(who.actor, {
    questionIds: questions.slice(at.from, at.to).map((x) => x.id),
    ...(typeof q === "string" ? { more: { questionId: q, count } } : {}),
  });
  const pager = <QuestionPager at={at} count={questions.length} href={(p) => `/p/${token}/feedback?page=${p}`} />;
  return (
    <article className="panelist-page">
      <p>
        <a href={`/p/${token}`}>Back to your answers</a>
      </p>
      {feedback.round === null ? (
        <>
          <h1>Feedback</h1>
          <p className="muted">The group&apos;s figures appear here once round 1 has closed.</p>
        </>
      ) : (
        <>
          <h1>Feedback of round {feedback.round}</h1>
          <p className="muted">
            What the panel answered in round {feedback.round}, without names.{" "}
            {feedback.finished
              ? "The panel is finished: these are its final figures. Thank you for taking part."
              : "Compare it with your own answer; in the next round you may keep or revise your answer, and explain why."}
          </p>
          {feedback.practice ? <PracticeSection p={feedback.practice} /> : null}
          {pager}
          {feedback.questions.map((f, i) => (
            <section key={f.questionId} className="card">
              <h2>
                {at.from + i + 1}. {f.text}
              </h2>
              <QuestionFeedback f={f} round={feedback.round!} moreHref={`/p/${token}/feedback?q=${encodeURIComponent(f.questionId)}`} />
            </section>
          ))}
          {pager}
        </>
      )}
    </article>
  );
}

/** A practice set's result for this panelist only (lib/triangulation/practice.ts; docs/methods.md §22). */
function PracticeSection({ p }: { p: NonNullable<Awaited<ReturnType<typeof getFeedback>>["practice"]> }) {
  return (
    <section className="card" data-section="practice">
      <h2>Your practice result</h2>
      <p data-practice-sentence>{p.sentence}</p>
      {p.scored ? (
        <dl>
          <dt>Your calibration score</dt>
          <dd>
            <Figure name="practice-calibration" value={p.calibration} digits={3} />
          </dd>
          <dt>Your information score</dt>
          <dd>
            <Figure name="practice-information" value={p.information} digits={3} />
          </dd>
        </dl>
      ) : null}
      <table>
        <thead>
          <tr>
            <th>Question</th>
            <th>True value</th>
            <th>Your 5th / 50th / 95th percentile</th>
            <th>Inside your range</th>
          </tr>
        </thead>
        <tbody>
          {p.questions.map((q) => (
            <tr key={q.questionId} data-practice-question={q.questionId}>
              <td>{q.text}</td>
              <td>
                <Figure name="practice-true-value" value={q.trueValue} /> {q.unit}
              </td>
              <td>
                {q.myAnswer ? (
                  <>
                    <Figure value={q.myAnswer.low} /> / <Figure value={q.myAnswer.value} /> / <Figure value={q.myAnswer.high} />
                  </>
                ) : (
                  <span className="muted">not answered</span>
                )}
              </td>
              <td data-inside={q.inside === null ? "" : String(q.inside)}>{q.inside === null ? "" : q.inside ? "yes" : "no"}</td>
            </tr>
          ))}
        </tbody>
      </table>
      <p className="muted small">
        A practice set: questions whose true values were known in advance, to give you a first score before a real panel. Only you see this, through your own link. The
        scores are those of Cooke&apos;s classical model (docs/methods.md §21), the same the organiser&apos;s report shows for your pseudonym.
      </p>
    </section>
  );
}
