/**
 * Track records and the accuracy history, derived on read from the recorded outcomes
 * (lib/triangulation/outcome.ts): each row of the Resolution table keeps the outcome value and the
 * figures as they stood when the outcome was recorded, including every panelist's final answer with
 * their roster member. Nothing is counted up in place, so correcting an outcome value or
 * deleting a panel changes every derived figure consistently.
 *
 * - Track record per roster member (lib/blend `trackRecord`): count, mean error, mean log
 *   ratio outcome/answer, MAPE, interval hit rate of three-point answers, Theil's decomposition
 *   once there are enough questions, and the bias factor shrunk toward 1.
 *   A shared-quantity answer is scored against the question's outcome value; a sum-of-parts
 *   answer against its own part's outcome when the organiser recorded one (else it is left out).
 *   Answers or outcomes ≤ 0 are left out (a log ratio needs both positive) and counted in `skipped`,
 *   and so are answers outside the input range (lib/blend/track-record.ts `usableRecord`, stored before that rule).
 * - Accuracy history per organiser (lib/blend `accuracyHistory`): raw panel, corrected panel,
 *   baseline and blend over the questions with an outcome that had a baseline, in the order the outcomes were recorded,
 *   with the tracking signal on relative errors (outcome − figure)/|outcome| (docs/methods.md §8). The inverse-MSE blend weights (Bates & Granger 1969) use the
 *   same history: the corrected panel figure (the one that is blended) against the baseline,
 *   with each error taken relative to the outcome value ((outcome − figure)/outcome), so that a
 *   question counted in thousands of units does not outweigh one counted in hundreds
 *   (questions with an outcome of 0 are left out of the weights).
 *
 * A question's own figures never use its own outcome: bias factors and weights for a
 * question come from the outcomes of the organiser's other questions, and for a question
 * with an outcome only from those recorded before it.
 */
import { db } from "@/lib/db";
import type { Actor } from "@/lib/accounts/actor";
import { requireOrganiser } from "@/lib/accounts/users";
import {
  accuracyHistory,
  trackRecord,
  type AccuracyHistory,
  type HistoryEntry,
  type OutcomePair,
  type TrackRecord,
} from "@/lib/blend";
import { usableHistoryEntry } from "@/lib/blend/scoring";
import { jsonSafe, type JsonSafe } from "../panels/json";
import { nextTurn } from "@/lib/work/turn";
import { trackRecordsOf, type OutcomeFigures, type RecordedOutcome } from "./track-record-figures";

export * from "./track-record-figures";

/** Which outcomes count for a question's figures (see the module comment). */
export interface HistoryFilter {
  /** Leave this question out. */
  readonly excludeQuestionId?: string;
  /** Only outcomes recorded strictly before this time. */
  readonly before?: Date;
}

/** The outcomes that count under `filter`, in their order (the in-memory form of {@link loadOutcomes}' filter). */
export function filterOutcomes(outcomes: readonly RecordedOutcome[], filter: HistoryFilter): RecordedOutcome[] {
  return outcomes.filter(
    (r) => (filter.excludeQuestionId === undefined || r.questionId !== filter.excludeQuestionId) && (!filter.before || r.recordedAt.getTime() < filter.before.getTime()),
  );
}

/**
 * The organiser's recorded outcomes, oldest first. Each outcome's figures (every panelist's
 * answer: about 150 kB of JSON at 1,000 panelists) are read and parsed one outcome at a time,
 * with a turn of the event loop before each (lib/work/turn.ts): the SQLite driver answers
 * synchronously, and all of them at once held other requests back for a quarter of a second at
 * 1,000 panelists × 50 questions (issue 13).
 */
export async function loadOutcomes(ownerId: string, filter: HistoryFilter = {}): Promise<RecordedOutcome[]> {
  const rows = await db.resolution.findMany({
    where: {
      ownerId,
      ...(filter.excludeQuestionId ? { questionId: { not: filter.excludeQuestionId } } : {}),
      ...(filter.before ? { resolvedAt: { lt: filter.before } } : {}),
    },
    orderBy: [{ resolvedAt: "asc" }, { id: "asc" }],
    omit: { figures: true, partActuals: true },
    include: { question: { include: { panel: { select: { id: true, title: true } } } } },
  });
  const outcomes: RecordedOutcome[] = [];
  for (const r of rows) {
    await nextTurn();
    const stored = await db.resolution.findUnique({ where: { id: r.id }, select: { figures: true, partActuals: true } });
    if (!stored) continue; // deleted with its panel since the list was read
    outcomes.push({
      questionId: r.questionId,
      panelId: r.question.panel.id,
      panelTitle: r.question.panel.title,
      text: r.question.text,
      unit: r.question.unit,
      recordedAt: r.resolvedAt,
      outcomeValue: r.actual,
      partOutcomes: JSON.parse(stored.partActuals) as RecordedOutcome["partOutcomes"],
      figures: JSON.parse(stored.figures) as OutcomeFigures,
    });
  }
  return outcomes;
}

/** Track records (lib/blend `trackRecord`) of the organiser's roster members. */
export async function trackRecordsFor(ownerId: string, filter: HistoryFilter = {}): Promise<Map<string, { record: TrackRecord; skipped: number }>> {
  return trackRecordsOf(await loadOutcomes(ownerId, filter));
}

/** The questions with an outcome and a baseline, as blend-weight history and accuracy-history entries. */
export function historyOf(outcomes: readonly RecordedOutcome[]): {
  readonly pairs: OutcomePair[];
  readonly entries: HistoryEntry[];
  readonly used: RecordedOutcome[];
  readonly withoutBaseline: number;
  /** Questions with an outcome and a baseline left out because a value is out of range (lib/blend/scoring.ts `usableHistoryEntry`). */
  readonly unusable: number;
} {
  const entry = (r: RecordedOutcome): HistoryEntry => ({
    actual: r.outcomeValue,
    rawPanel: r.figures.rawPanel,
    correctedPanel: r.figures.correctedPanel,
    baseline: r.figures.baseline!,
    blend: r.figures.blend!,
  });
  const withBaseline = outcomes.filter((r) => r.figures.baseline !== null && r.figures.blend !== null);
  const used = withBaseline.filter((r) => usableHistoryEntry(entry(r)));
  return {
    used,
    withoutBaseline: outcomes.length - withBaseline.length,
    unusable: withBaseline.length - used.length,
    // Relative errors (figure / actual against 1), so that questions of different sizes count alike.
    pairs: used.filter((r) => r.outcomeValue !== 0).map((r) => ({ actual: 1, panel: r.figures.correctedPanel / r.outcomeValue, baseline: r.figures.baseline! / r.outcomeValue })),
    entries: used.map(entry),
  };
}

export interface RosterTrackRecordView {
  readonly rosterMemberId: string;
  readonly name: string;
  readonly group: string;
  /** Answers with an outcome left out (a value or actual ≤ 0, or outside the input range). */
  readonly skipped: number;
  readonly record: JsonSafe<TrackRecord>;
}

/**
 * The track record of every member of the organiser's roster, over all the organiser's
 * questions with an outcome (organisers only; their own roster). Members without answers with an outcome
 * have count 0 and bias factor 1.
 */
export async function listTrackRecords(actor: Actor): Promise<RosterTrackRecordView[]> {
  const user = requireOrganiser(actor);
  const members = await db.rosterMember.findMany({ where: { ownerId: user.userId }, orderBy: [{ group: "asc" }, { name: "asc" }] });
  const records = await trackRecordsFor(user.userId);
  return members.map((m) => {
    const r = records.get(m.id);
    return {
      rosterMemberId: m.id,
      name: m.name,
      group: m.group,
      skipped: r?.skipped ?? 0,
      record: jsonSafe(r?.record ?? trackRecord([])),
    };
  });
}

export interface AccuracyHistoryView {
  /** Questions with an outcome in the history (those with a baseline), oldest first. */
  readonly questions: readonly {
    readonly questionId: string;
    readonly panelId: string;
    readonly panelTitle: string;
    readonly text: string;
    readonly unit: string;
    readonly recordedAt: string;
    readonly outcomeValue: number;
    readonly rawPanel: number;
    readonly correctedPanel: number;
    readonly baseline: number;
    readonly blend: number;
  }[];
  /** Questions with an outcome left out because they had no baseline. */
  readonly withoutBaseline: number;
  /** Questions with an outcome left out because a value is outside the input range (stored before that rule). */
  readonly unusable: number;
  /** Accuracy of each figure with its tracking signal; null with no recorded outcome. */
  readonly history: JsonSafe<AccuracyHistory> | null;
  readonly notes: readonly string[];
}

/** The organiser's accuracy history: raw vs corrected vs baseline vs blend (organisers only). */
export async function getAccuracyHistory(actor: Actor): Promise<AccuracyHistoryView> {
  const user = requireOrganiser(actor);
  const h = historyOf(await loadOutcomes(user.userId));
  return {
    questions: h.used.map((r) => ({
      questionId: r.questionId,
      panelId: r.panelId,
      panelTitle: r.panelTitle,
      text: r.text,
      unit: r.unit,
      recordedAt: r.recordedAt.toISOString(),
      outcomeValue: r.outcomeValue,
      rawPanel: r.figures.rawPanel,
      correctedPanel: r.figures.correctedPanel,
      baseline: r.figures.baseline!,
      blend: r.figures.blend!,
    })),
    withoutBaseline: h.withoutBaseline,
    unusable: h.unusable,
    history: h.entries.length > 0 ? jsonSafe(accuracyHistory(h.entries)) : null,
    notes: [
      "Errors are outcome − figure (positive: the figure was too low). MAE, RMSE and ME mix the questions' units; MAPE and sMAPE compare across questions. MASE is not given across questions (their scales differ).",
      "Tracking signal = cumulative relative error / running mean absolute relative error after each question, with relative error (outcome − figure)/|outcome|, so that a large question does not outweigh small ones (a question with an outcome of 0 is left out of it); |TS| > 4 flags a biased figure (±4 is common practice, no authoritative source).",
    ],
  };
}
