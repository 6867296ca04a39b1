import type { Metadata } from "next";
import { getFeedback } from "@/lib/panels/feedback";
import LinkProblem from "@/lib/ui/link-problem";
import { panelistFromLink } from "@/lib/ui/panelist-access";
import QuestionFeedback from "@/lib/ui/question-feedback";

export const metadata: Metadata = { title: "Feedback", referrer: "no-referrer", robots: { index: false, follow: false } };
export const dynamic = "force-dynamic";

export default async function FeedbackPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const who = await panelistFromLink(token);
  if ("problem" in who) return <LinkProblem problem={who.problem} />;
  const feedback = await getFeedback(who.actor);
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
            What the panel answered in round {feedback.round}, without names. Compare it with your own answer; in the next
            round you may keep or revise your answer, and explain why.
          </p>
          {feedback.questions.map((f, i) => (
            <section key={f.questionId} className="card">
              <h2>
                {i + 1}. {f.text}
              </h2>
              <QuestionFeedback f={f} round={feedback.round!} />
            </section>
          ))}
        </>
      )}
    </article>
  );
}
