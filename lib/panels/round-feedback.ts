/**
 * What every panelist's feedback on a closed round has in common (docs/methods.md §14.4): per
 * question (in position order, those with statistics), the stored round statistics' figures, the histogram of the final answers, the
 * non-empty rationales with their values, and each panelist's final answer (by invitation id,
 * to pick out their own). lib/panels/feedback.ts adds what is the reader's own.
 *
 * Built once per closed round and kept (issue 13: each panelist page re-read the round's every
 * answer and re-parsed its statistics' JSON), from lib/panels/closed-rounds.ts, for the same
 * reason and under the same rules (immutable data keyed on the round's id and closing time, on
 * globalThis, bounded by the answers held, the same number as there). Questions are fixed once round 1 opens
 * (lib/panels/panels.ts requireDraft), so their text is kept too. A question nobody answered
 * has n = 0 and no bins.
 */
import { db } from "@/lib/db";
import { histogram, type HistogramBin } from "@/lib/stats";
import { closedRound, KEEP_ANSWERS } from "./closed-rounds";

export interface RoundFeedbackQuestion {
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
  readonly pooled: { readonly p10: number; readonly p50: number; readonly p90: number } | null;
  readonly total: number | null;
  readonly histogram: readonly HistogramBin[];
  /** Non-empty rationales with the values they came with (final answers, by pseudonym order). */
  readonly rationales: readonly { readonly value: number; readonly rationale: string }[];
  /** Each panelist's final answer, by invitation id. */
  readonly finals: ReadonlyMap<string, { readonly value: number; readonly low: number | null; readonly high: number | null }>;
}

export type RoundFeedback = readonly RoundFeedbackQuestion[];


interface Kept {
  readonly answers: number;
  readonly feedback: Promise<RoundFeedback>;
}
const cache: Map<string, Kept> = ((globalThis as { __triangulateRoundFeedback?: Map<string, Kept> }).__triangulateRoundFeedback ??= new Map());

async function build(round: { readonly id: string; readonly panelId: string; readonly closedAt: Date | null }): Promise<{ feedback: RoundFeedback; answers: number }> {
  const { answers: finals, statistics } = await closedRound(round);
  const questions = await db.question.findMany({ where: { panelId: round.panelId }, orderBy: { position: "asc" }, select: { id: true, text: true, unit: true } });
  let count = 0;
  const feedback = questions.flatMap((question): RoundFeedbackQuestion[] => {
    const s = statistics.get(question.id);
    if (!s) return [];
    const answers = finals.get(question.id) ?? [];
    count += answers.length;
    const v = s.values;
    return [
      {
        questionId: question.id,
        text: question.text,
        unit: question.unit,
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
        rationales: answers.filter((a) => a.rationale.trim().length > 0).map((a) => ({ value: a.value, rationale: a.rationale })),
        finals: new Map(answers.map((a) => [a.invitationId, { value: a.value, low: a.low, high: a.high }])),
      },
    ];
  });
  return { feedback, answers: count };
}

/** The shared feedback of a closed round, from the cache or built once (concurrent callers share one build). */
export async function closedRoundFeedback(round: { readonly id: string; readonly panelId: string; readonly closedAt: Date | null }): Promise<RoundFeedback> {
  const key = `${round.id}\u0000${round.closedAt?.getTime() ?? ""}`;
  const hit = cache.get(key);
  if (hit) {
    // Most recently used last: the eviction below takes the first.
    cache.delete(key);
    cache.set(key, hit);
    return hit.feedback;
  }
  const building = build(round);
  const entry: { answers: number; feedback: Promise<RoundFeedback> } = { answers: 0, feedback: building.then((b) => b.feedback) };
  cache.set(key, entry);
  try {
    const built = await building;
    entry.answers = built.answers;
    let held = 0;
    for (const k of cache.values()) held += k.answers;
    for (const [k, kept] of cache) {
      if (held <= KEEP_ANSWERS || k === key) break;
      cache.delete(k);
      held -= kept.answers;
    }
    return built.feedback;
  } catch (error) {
    cache.delete(key);
    throw error;
  }
}
