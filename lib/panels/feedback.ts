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
import type { HistogramBin } from "@/lib/stats";
import { authorisePanelist } from "./access";
import { explanationsRequired } from "./answers";
import { closedRoundFeedback } from "./round-feedback";
import { getPracticeResult, type PracticeResult } from "../triangulation/practice";

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
  /** A practice set's result for this panelist once its last round has closed (lib/triangulation/practice.ts); null on any other panel. */
  readonly practice: PracticeResult | null;
}

/** Rationales sent per question unless a page asks for more. */
export const RATIONALES_SHOWN = 5;

/** The `limit` rationales whose values lie nearest `anchor`, ordered by value (then text). */
function nearestRationales(all: readonly { value: number; rationale: string }[], anchor: number | null, limit: number) {
  const byValue = (a: { value: number; rationale: string }, b: { value: number; rationale: string }) => a.value - b.value || a.rationale.localeCompare(b.rationale);
  const chosen = anchor === null ? [...all] : [...all].sort((a, b) => Math.abs(a.value - anchor) - Math.abs(b.value - anchor) || byValue(a, b));
  return chosen.slice(0, limit).sort(byValue);
}

/** Which questions a page shows and how many rationales it asks for (by default every question, {@link RATIONALES_SHOWN} each). */
export interface FeedbackOptions {
  /** The questions to return (a page of them); all when absent. */
  readonly questionIds?: readonly string[];
  /** More rationales (`count`) for one question. */
  readonly more?: { readonly questionId: string; readonly count: number };
}

/**
 * The panelist's feedback on the latest closed round of their panel, with up to
 * {@link RATIONALES_SHOWN} rationales per question, or `more.count` for the question
 * `more.questionId`. What all panelists share is built once per closed round
 * (lib/panels/round-feedback.ts); only the reader's own answer and rationales are chosen here.
 */
export async function getFeedback(actor: Actor, options: FeedbackOptions = {}): Promise<FeedbackView> {
  const me = await authorisePanelist(actor);
  const round = await db.round.findFirst({ where: { panelId: me.panelId, status: "closed" }, orderBy: { number: "desc" }, select: { id: true, panelId: true, number: true, closedAt: true } });
  const finished = (await db.panel.findUniqueOrThrow({ where: { id: me.panelId }, select: { status: true } })).status === "finished";
  if (!round) return { round: null, finished, questions: [], practice: null };
  const shared = await closedRoundFeedback(round);
  const wanted = options.questionIds ? new Set(options.questionIds) : null;
  // A finished panel has no next round, so nobody is asked to explain in it.
  const required = finished ? new Map<string, string>() : await explanationsRequired(db, me, round.number + 1);
  return {
    round: round.number,
    finished,
    practice: await getPracticeResult(me),
    questions: shared
      .filter((q) => wanted === null || wanted.has(q.questionId))
      .map(({ finals, rationales, ...q }): QuestionFeedback => {
        const mine = finals.get(me.invitationId) ?? null;
        let myPosition: QuestionFeedback["myPosition"] = null;
        if (mine && q.q1 !== null && q.q3 !== null && q.aggregation === "shared") {
          myPosition = mine.value < q.q1 ? "below-iqr" : mine.value > q.q3 ? "above-iqr" : "within-iqr";
        }
        const more = options.more?.questionId === q.questionId ? options.more.count : RATIONALES_SHOWN;
        return {
          ...q,
          myAnswer: mine,
          myPosition,
          explanationRequested: required.has(q.questionId),
          rationales: nearestRationales(rationales, mine?.value ?? q.median, more),
          rationaleCount: rationales.length,
        };
      }),
  };
}
