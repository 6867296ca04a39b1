/**
 * Feedback for a panelist after a round closes (DESIGN.md workflow step 4): the group median
 * and quartiles, the spread of answers for a chart with their own answer marked, and the
 * anonymous rationales, ordered by the value they came with.
 *
 * Nothing here identifies another panelist: no names, e-mails, roster or invitation ids, and
 * no pseudonyms of others — the values and rationales of others are plain lists sorted by
 * value.
 */
import { db } from "@/lib/db";
import type { Actor } from "@/lib/accounts/actor";
import { requirePanelist } from "./access";
import { explanationsRequired } from "./answers";
import { finalAnswers, settleDeadlines } from "./round-closing";
import type { QuestionStatistics } from "./round-statistics";

export interface QuestionFeedback {
  readonly questionId: string;
  readonly text: string;
  readonly unit: string;
  readonly answerFormat: "single" | "three-point";
  readonly aggregation: "shared" | "sum-of-parts";
  readonly n: number;
  readonly median: number | null;
  readonly q1: number | null;
  readonly q3: number | null;
  readonly min: number | null;
  readonly max: number | null;
  /** Three-point questions: the pooled panel distribution's 10th / 50th / 90th percentiles. */
  readonly pooled: { readonly p10: number; readonly p50: number; readonly p90: number } | null;
  /** Sum-of-parts questions: the total of the parts. */
  readonly total: number | null;
  /** Every final answer's value (most likely value for three-point), ascending: chart data. */
  readonly values: readonly number[];
  /** The panelist's own final answer in that round (null if they did not answer). */
  readonly myAnswer: { readonly value: number; readonly low: number | null; readonly high: number | null } | null;
  /** Where their answer lay relative to the IQR (shared-quantity questions). */
  readonly myPosition: "below-iqr" | "within-iqr" | "above-iqr" | null;
  /** True when the next round will ask them to explain (answer outside the IQR). */
  readonly explanationRequested: boolean;
  /** Non-empty rationales of all answers with their values, ordered by value. */
  readonly rationales: readonly { readonly value: number; readonly rationale: string }[];
}

export interface FeedbackView {
  /** The round the feedback is about (the latest closed round); null before round 1 closes. */
  readonly round: number | null;
  readonly questions: readonly QuestionFeedback[];
}

/** The panelist's feedback on the latest closed round of their panel. */
export async function getFeedback(actor: Actor): Promise<FeedbackView> {
  const me = requirePanelist(actor);
  await settleDeadlines(me.panelId);
  const round = await db.round.findFirst({
    where: { panelId: me.panelId, status: "closed" },
    orderBy: { number: "desc" },
    include: { statistics: { include: { question: true }, orderBy: { question: { position: "asc" } } } },
  });
  if (!round) return { round: null, questions: [] };
  const finals = await finalAnswers(db, round.id);
  const required = await explanationsRequired(db, me, round.number + 1);
  return {
    round: round.number,
    questions: round.statistics.map((row): QuestionFeedback => {
      const s = JSON.parse(row.data) as QuestionStatistics;
      const answers = finals.get(row.questionId) ?? [];
      const mine = answers.find((a) => a.invitationId === me.invitationId) ?? null;
      const v = s.values;
      let myPosition: QuestionFeedback["myPosition"] = null;
      if (mine && v && v.q1 !== null && v.q3 !== null && s.aggregation === "shared") {
        myPosition = mine.value < v.q1 ? "below-iqr" : mine.value > v.q3 ? "above-iqr" : "within-iqr";
      }
      return {
        questionId: row.questionId,
        text: row.question.text,
        unit: row.question.unit,
        answerFormat: s.answerFormat,
        aggregation: s.aggregation,
        n: s.n,
        median: v?.median ?? null,
        q1: v?.q1 ?? null,
        q3: v?.q3 ?? null,
        min: v?.min ?? null,
        max: v?.max ?? null,
        pooled: s.pooled ? { p10: s.pooled.p10, p50: s.pooled.p50, p90: s.pooled.p90 } : null,
        total: s.sumOfParts?.total ?? null,
        values: answers.map((a) => a.value).sort((a, b) => a - b),
        myAnswer: mine ? { value: mine.value, low: mine.low, high: mine.high } : null,
        myPosition,
        explanationRequested: required.has(row.questionId),
        rationales: answers
          .filter((a) => a.rationale.trim().length > 0)
          .map((a) => ({ value: a.value, rationale: a.rationale }))
          .sort((a, b) => a.value - b.value || a.rationale.localeCompare(b.rationale)),
      };
    }),
  };
}
