/**
 * A closed round's final answers ({@link finalAnswers}) and parsed statistics, read once and
 * kept (issue 13: the reports, the convergence view and every panelist's feedback re-read and
 * re-parsed every closed round on each request; those reads were most of a report's time).
 *
 * A closed round never changes: answers are stored only while a round is open
 * (lib/panels/answers.ts), its statistics are written in the transaction that closes it
 * (lib/panels/round-closing.ts), and nothing reopens a round. So this caches immutable data, as
 * lib/panels/round-quartiles.ts does: keyed on the round's id and its closing time, kept on
 * globalThis (route modules load twice in the production server, DEVELOPERS.md), correct with any
 * number of instances. Callers pass only rounds whose status is closed. What is kept is frozen
 * (a caller that sorted a list in place would throw instead of changing another request's data),
 * and bounded by the answers held: past {@link KEEP_ANSWERS} the least recently used round goes.
 */
import { db } from "@/lib/db";
import { finalAnswers } from "./round-closing";
import type { QuestionStatistics } from "./round-statistics";

export type FinalAnswerRow = NonNullable<ReturnType<Awaited<ReturnType<typeof finalAnswers>>["get"]>>[number];

export interface ClosedRound {
  /** The final answers per question id, ordered by pseudonym (as finalAnswers). */
  readonly answers: ReadonlyMap<string, readonly FinalAnswerRow[]>;
  /** The stored statistics per question id, in question position order. */
  readonly statistics: ReadonlyMap<string, QuestionStatistics>;
}

/**
 * Final answers kept over all cached rounds (a round of 1,000 panelists × 50 questions holds
 * 50,000): three such rounds. About 730 bytes of heap each with the round's statistics (measured
 * on the 300 × 30 scale scenario, issue 13), so at most about 105 MiB, within the server's bounded
 * heap (lib/work/heap-limits.json).
 */
export const KEEP_ANSWERS = 150_000;

interface Kept {
  size: number;
  readonly round: Promise<ClosedRound>;
}
const cache: Map<string, Kept> = ((globalThis as { __triangulateClosedRounds?: Map<string, Kept> }).__triangulateClosedRounds ??= new Map());

function deepFreeze<T>(value: T): T {
  if (value !== null && typeof value === "object" && !Object.isFrozen(value)) {
    Object.freeze(value);
    for (const v of Object.values(value)) deepFreeze(v);
  }
  return value;
}

async function read(roundId: string): Promise<ClosedRound> {
  const answers = await finalAnswers(db, roundId);
  const rows = await db.roundStatistic.findMany({ where: { roundId }, select: { questionId: true, data: true }, orderBy: { question: { position: "asc" } } });
  for (const list of answers.values()) deepFreeze(list);
  return { answers, statistics: new Map(rows.map((r) => [r.questionId, deepFreeze(JSON.parse(r.data) as QuestionStatistics)])) };
}

/** A closed round's final answers and statistics, from the cache or read once (concurrent callers share the read). */
export async function closedRound(round: { readonly id: string; readonly closedAt: Date | null }): Promise<ClosedRound> {
  const key = `${round.id}\u0000${round.closedAt?.getTime() ?? ""}`;
  const hit = cache.get(key);
  if (hit) {
    cache.delete(key);
    cache.set(key, hit);
    return hit.round;
  }
  const entry: Kept = { size: 0, round: read(round.id) };
  cache.set(key, entry);
  let kept: ClosedRound;
  try {
    kept = await entry.round;
  } catch (error) {
    if (cache.get(key) === entry) cache.delete(key);
    throw error;
  }
  entry.size = [...kept.answers.values()].reduce((n, list) => n + list.length, 0);
  let held = [...cache.values()].reduce((n, k) => n + k.size, 0);
  for (const [k, old] of cache) {
    if (held <= KEEP_ANSWERS || k === key) break;
    cache.delete(k);
    held -= old.size;
  }
  return kept;
}
