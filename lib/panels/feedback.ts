/**
 * Feedback for a panelist after a round closes (docs/methods.md §14.4): the group median
 * and quartiles, the spread of answers for a chart with their own answer marked, and the
 * anonymous rationales, ordered by the value they came with.
 *
 * Nothing here identifies another panelist: no names, e-mails, roster or invitation ids, and
 * no pseudonyms of others — the values and rationales of others are plain lists sorted by
 * value.
 *
 * A phone gets what it shows (issue 13): the group's spread as histogram bins (lib/stats
 * `histogram`), not every value, and a bounded number of rationales — those whose values lie
 * nearest the panelist's own answer (the median when they did not answer) — with the count of
 * all of them, so that a page can offer more.
 */
import { db } from "@/lib/db";
import type { Actor } from "@/lib/accounts/actor";
import { histogram, type HistogramBin } from "@/lib/stats";
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
  /** The final answers' values (median estimates, P50, for three-point) as histogram bins: chart data. */
  readonly histogram: readonly HistogramBin[];
  /** The panelist's own final answer in that round (null if they did not answer). */
  readonly myAnswer: { readonly value: number; readonly low: number | null; readonly high: number | null } | null;
  /** Where their answer lay relative to the IQR (shared-quantity questions). */
  readonly myPosition: "below-iqr" | "within-iqr" | "above-iqr" | null;
  /** True when the next round will ask them to explain (answer outside the IQR). */
  readonly explanationRequested: boolean;
  /** Non-empty rationales with their values: those nearest the own answer (see the module comment), ordered by value. */
  readonly rationales: readonly { readonly value: number; readonly rationale: string }[];
  /** How many answers came with a non-empty rationale (all of them, not only those sent). */
  readonly rationaleCount: number;
}

export interface FeedbackView {
  /** The round the feedback is about (the latest closed round); null before round 1 closes. */
  readonly round: number | null;
  /** True when the panel is finished: there is no next round to keep or revise an answer in. */
  readonly finished: boolean;
  readonly questions: readonly QuestionFeedback[];
}

/** Rationales sent per question unless a page asks for more. */
export const RATIONALES_SHOWN = 5;

/** The `limit` rationales whose values lie nearest `anchor`, ordered by value (then text). */
function nearestRationales(all: readonly { value: number; rationale: string }[], anchor: number | null, limit: number) {
  const byValue = (a: { value: number; rationale: string }, b: { value: number; rationale: string }) => a.value - b.value || a.rationale.localeCompare(b.rationale);
  const chosen = anchor === null ? [...all] : [...all].sort((a, b) => Math.abs(a.value - anchor) - Math.abs(b.value - anchor) || byValue(a, b));
  return chosen.slice(0, limit).sort(byValue);
}

/**
 * The panelist's feedback on the latest closed round of their panel, with up to
 * {@link RATIONALES_SHOWN} rationales per question, or `more.count` for the question `more.questionId`.
 */
export async function getFeedback(actor: Actor, more?: { readonly questionId: string; readonly count: number }): Promise<FeedbackView> {
  const me = requirePanelist(actor);
  await settleDeadlines(me.panelId);
  const round = await db.round.findFirst({
    where: { panelId: me.panelId, status: "closed" },
    orderBy: { number: "desc" },
    include: { statistics: { include: { question: true }, orderBy: { question: { position: "asc" } } } },
  });
  const finished = (await db.panel.findUniqueOrThrow({ where: { id: me.panelId }, select: { status: true } })).status === "finished";
  if (!round) return { round: null, finished, questions: [] };
  const finals = await finalAnswers(db, round.id);
  // A finished panel has no next round, so nobody is asked to explain in it.
  const required = finished ? new Map<string, string>() : await explanationsRequired(db, me, round.number + 1);
  return {
    round: round.number,
    finished,
    questions: round.statistics.map((row): QuestionFeedback => {
      const s = JSON.parse(row.data) as QuestionStatistics;
      const answers = finals.get(row.questionId) ?? [];
      const mine = answers.find((a) => a.invitationId === me.invitationId) ?? null;
      const given = answers.filter((a) => a.rationale.trim().length > 0).map((a) => ({ value: a.value, rationale: a.rationale }));
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
        histogram: answers.length > 0 ? histogram(answers.map((a) => a.value)) : [],
        myAnswer: mine ? { value: mine.value, low: mine.low, high: mine.high } : null,
        myPosition,
        explanationRequested: required.has(row.questionId),
        rationales: nearestRationales(given, mine?.value ?? v?.median ?? null, more?.questionId === row.questionId ? more.count : RATIONALES_SHOWN),
        rationaleCount: given.length,
      };
    }),
  };
}
