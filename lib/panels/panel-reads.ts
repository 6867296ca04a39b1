/**
 * The reads that the question reports and triangulations of one request share, each done once
 * per request and then filtered per question in memory (issue 13: the panel report built each
 * question's report from its own reads of every closed round, the organiser's outcomes and
 * the convergence view, so its cost grew with questions × answers).
 *
 * A PanelReads belongs to one request of one actor (callers authorise before they read) and is
 * dropped with it: nothing is kept between requests, so no figure can outlive a changed input —
 * except a closed round's final answers, which never change (lib/panels/closed-rounds.ts).
 * `wholeRounds` reads each closed round's final answers once for all questions (a page that
 * shows every question); without it only the asked question's answers are read.
 */
import { db } from "@/lib/db";
import type { Actor } from "@/lib/accounts/actor";
import type { TrackRecord } from "@/lib/blend";
import { finalAnswers } from "./round-closing";
import { closedRound } from "./closed-rounds";
import { getConvergence, type ConvergenceView } from "./rounds";
import { runJob } from "@/lib/work/pool";
import { nextTurn } from "@/lib/work/turn";
import { filterOutcomes, loadOutcomes, type HistoryFilter, type RecordedOutcome } from "../triangulation/track-records";

type FinalAnswerRow = NonNullable<ReturnType<Awaited<ReturnType<typeof finalAnswers>>["get"]>>[number];

export interface PanelReads {
  /** The final answers to one question in one round (finalAnswers' rows). */
  finalAnswers(roundId: string, questionId: string): Promise<readonly FinalAnswerRow[]>;
  /** The organiser's outcomes that count under `filter` (as loadOutcomes with it). */
  outcomes(ownerId: string, filter: HistoryFilter): Promise<readonly RecordedOutcome[]>;
  /** Track records under `filter` (as trackRecordsFor with it). */
  trackRecords(ownerId: string, filter: HistoryFilter): Promise<ReadonlyMap<string, { record: TrackRecord; skipped: number }>>;
  /** The panel's invitations with their roster member and its name. */
  invitations(panelId: string): Promise<readonly { id: string; rosterMemberId: string; name: string }[]>;
  /** The panel's convergence view (getConvergence). */
  convergence(actor: Actor, panelId: string): Promise<ConvergenceView>;
}

function memo<T>(): (key: string, load: () => Promise<T>) => Promise<T> {
  const kept = new Map<string, Promise<T>>();
  return (key, load) => {
    let p = kept.get(key);
    if (!p) {
      p = load();
      kept.set(key, p);
    }
    return p;
  };
}

const filterKey = (ownerId: string, f: HistoryFilter) => `${ownerId}\u0000${f.excludeQuestionId ?? ""}\u0000${f.before?.getTime() ?? ""}`;

/** A fresh set of shared reads for one request (see the module comment). */
export function panelReads(options: { wholeRounds?: boolean } = {}): PanelReads {
  const rounds = memo<Awaited<ReturnType<typeof finalAnswers>>>();
  const roundStatus = memo<{ id: string; status: string; closedAt: Date | null } | null>();
  const allOutcomes = memo<RecordedOutcome[]>();
  const records = memo<ReadonlyMap<string, { record: TrackRecord; skipped: number }>>();
  const outcomesText = memo<string>();
  const invitations = memo<{ id: string; rosterMemberId: string; name: string }[]>();
  const convergence = memo<ConvergenceView>();
  const reads: PanelReads = {
    async finalAnswers(roundId, questionId) {
      // A closed round's answers are read once and kept (lib/panels/closed-rounds.ts).
      const round = await roundStatus(roundId, () => db.round.findUnique({ where: { id: roundId }, select: { id: true, status: true, closedAt: true } }));
      if (round?.status === "closed") return (await closedRound(round)).answers.get(questionId) ?? [];
      const byQuestion = options.wholeRounds
        ? await rounds(roundId, () => finalAnswers(db, roundId))
        : await rounds(`${roundId}\u0000${questionId}`, () => finalAnswers(db, roundId, questionId));
      return byQuestion.get(questionId) ?? [];
    },
    async outcomes(ownerId, filter) {
      return filterOutcomes(await allOutcomes(ownerId, () => loadOutcomes(ownerId)), filter);
    },
    async trackRecords(ownerId, filter) {
      const all = await allOutcomes(ownerId, () => loadOutcomes(ownerId));
      const counted = filterOutcomes(all, filter);
      // The filter only leaves outcomes out: one that leaves none out (that of a question without an outcome)
      // gives the records of all of them, computed once for every such question.
      // On the worker pool: the records of 300 panelists take tens of milliseconds, and a page with
      // outcomes on many questions computes them once per such question (issue 13).
      // The outcomes cross to the worker as one JSON text made once per request, with the positions that count.
      return records(counted.length === all.length ? `${ownerId}\u0000all` : filterKey(ownerId, filter), async () => {
        // Written an outcome at a time, a turn of the event loop before each (lib/work/turn.ts): it is megabytes at 1,000 panelists.
        const text = await outcomesText(ownerId, async () => {
          const parts: string[] = [];
          for (const outcome of all) {
            await nextTurn();
            parts.push(JSON.stringify(outcome));
          }
          return `[${parts.join(",")}]`;
        });
        const kept = new Set(counted);
        return runJob("trackRecords", { outcomes: text, keep: counted.length === all.length ? null : all.flatMap((o, i) => (kept.has(o) ? [i] : [])) });
      });
    },
    invitations(panelId) {
      return invitations(panelId, async () =>
        (await db.invitation.findMany({ where: { panelId }, select: { id: true, rosterMemberId: true, rosterMember: { select: { name: true } } } })).map((i) => ({
          id: i.id,
          rosterMemberId: i.rosterMemberId,
          name: i.rosterMember.name,
        })),
      );
    },
    convergence(actor, panelId) {
      return convergence(panelId, () => getConvergence(actor, panelId));
    },
  };
  return reads;
}
