/**
 * The previous round's quartiles that decide whether a round-2+ answer needs a rationale
 * (lib/panels/answers.ts), read and parsed once per closed round instead of on every answer.
 *
 * A closed round's statistics never change (rounds go draft → open → closed, and only
 * closeRoundInTx writes them, in the same transaction as the close), so this is a pure cache
 * of immutable data: keyed on the round's id and its closing time, kept on globalThis (route
 * modules load twice in the production server, DEVELOPERS.md), and correct with any number of
 * instances. Only the two figures per question are kept, not the statistics' JSON.
 */
import type { Prisma } from "@/lib/generated/prisma/client";
import type { QuestionStatistics } from "./round-statistics";

/** Q1 and Q3 of the final values, per shared-quantity question with both defined. */
export type RoundQuartiles = ReadonlyMap<string, { readonly q1: number; readonly q3: number }>;

/** Closed rounds kept; the oldest entry goes first (a few bytes per question). */
const KEEP = 500;
const cache: Map<string, RoundQuartiles> = ((globalThis as { __triangulateRoundQuartiles?: Map<string, RoundQuartiles> }).__triangulateRoundQuartiles ??= new Map());

/** The quartiles of a closed round, from the cache or read once. */
export async function closedRoundQuartiles(tx: Prisma.TransactionClient, round: { readonly id: string; readonly closedAt: Date | null }): Promise<RoundQuartiles> {
  const key = `${round.id}\u0000${round.closedAt?.getTime() ?? ""}`;
  const hit = cache.get(key);
  if (hit) return hit;
  const quartiles = new Map<string, { q1: number; q3: number }>();
  for (const row of await tx.roundStatistic.findMany({ where: { roundId: round.id }, select: { questionId: true, data: true } })) {
    const s = JSON.parse(row.data) as QuestionStatistics;
    if (s.aggregation !== "shared" || !s.values || s.values.q1 === null || s.values.q3 === null) continue;
    quartiles.set(row.questionId, { q1: s.values.q1, q3: s.values.q3 });
  }
  if (cache.size >= KEEP) cache.delete(cache.keys().next().value as string);
  cache.set(key, quartiles);
  return quartiles;
}
