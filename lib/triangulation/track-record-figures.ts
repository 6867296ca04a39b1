/**
 * Track records from recorded outcomes, core imports only, so that they are computed on the
 * worker pool (lib/work/jobs.ts; issue 13: the records of every roster member, once per question
 * with an outcome, held the request thread for tens of milliseconds each). The rules are those of
 * lib/triangulation/track-records.ts (module comment), which loads the outcomes and re-exports
 * these. Empty input gives an empty map; a member whose every answer is left out has a record of
 * count 0 (lib/blend `trackRecord`).
 */
import { trackRecord, type AnswerOutcome, type TrackRecord } from "../blend";

/** One panelist's final answer as it stood when the outcome was recorded. */
export interface PanelistFigureAtOutcome {
  readonly invitationId: string;
  readonly rosterMemberId: string;
  readonly pseudonym: string;
  readonly value: number;
  readonly low: number | null;
  readonly high: number | null;
  /** The bias factor applied to this answer in the corrected panel figure. */
  readonly factor: number;
}

/** The figures of a question when its outcome was recorded (stored as JSON in the Resolution table's figures column). */
export interface OutcomeFigures {
  readonly round: number;
  readonly aggregation: "shared" | "sum-of-parts";
  readonly answerFormat: "single" | "three-point";
  readonly rawPanel: number;
  readonly correctedPanel: number;
  readonly baseline: number | null;
  readonly blend: number | null;
  /** The blend's combined sd before its range scale (lib/blend `blend`), for the blend range's track record (absent in outcomes stored before it was kept). */
  readonly blendSd?: number | null;
  readonly panelWeight: number | null;
  readonly weightRule: string | null;
  readonly panelists: readonly PanelistFigureAtOutcome[];
  /** The baseline's history as used (scaled), for the MASE scale of the scores. */
  readonly baselineTraining: readonly number[];
  readonly baselineSeason: number;
}

/** A stored outcome (a row of the `Resolution` table), parsed. */
export interface RecordedOutcome {
  readonly questionId: string;
  readonly panelId: string;
  readonly panelTitle: string;
  readonly text: string;
  readonly unit: string;
  readonly recordedAt: Date;
  readonly outcomeValue: number;
  readonly partOutcomes: readonly { readonly invitationId: string; readonly actual: number }[];
  readonly figures: OutcomeFigures;
}

/** What the track records read of a recorded outcome. */
export type ScoredOutcome = Pick<RecordedOutcome, "outcomeValue" | "partOutcomes" | "figures">;

/** Each roster member's answers with an outcome (see the module comment for what is left out). */
export function recordsByMember(outcomes: readonly ScoredOutcome[]): Map<string, { records: AnswerOutcome[]; skipped: number }> {
  const out = new Map<string, { records: AnswerOutcome[]; skipped: number }>();
  for (const r of outcomes) {
    // Each part's outcome by invitation (the first, as a search of the list would find it).
    const parts = new Map<string, number>();
    for (const x of r.partOutcomes) if (!parts.has(x.invitationId)) parts.set(x.invitationId, x.actual);
    for (const p of r.figures.panelists) {
      const entry = out.get(p.rosterMemberId) ?? { records: [], skipped: 0 };
      out.set(p.rosterMemberId, entry);
      const actual = r.figures.aggregation === "shared" ? r.outcomeValue : parts.get(p.invitationId);
      if (actual === undefined) continue;
      if (!(actual > 0) || !(p.value > 0)) {
        entry.skipped++;
        continue;
      }
      const threePoint = r.figures.answerFormat === "three-point" && p.low !== null && p.high !== null;
      entry.records.push(threePoint ? { actual, answer: p.value, low: p.low!, high: p.high! } : { actual, answer: p.value });
    }
  }
  return out;
}

/** Track records (lib/blend `trackRecord`) per roster member from the given outcomes. */
export function trackRecordsOf(outcomes: readonly ScoredOutcome[]): Map<string, { record: TrackRecord; skipped: number }> {
  const out = new Map<string, { record: TrackRecord; skipped: number }>();
  for (const [id, { records, skipped }] of recordsByMember(outcomes)) {
    const record = trackRecord(records);
    out.set(id, { record, skipped: skipped + record.skipped });
  }
  return out;
}

let lastText: string | null = null;
let lastParsed: readonly ScoredOutcome[] = [];

/**
 * {@link trackRecordsOf} the outcomes at positions `keep` (all when null) of `text`, a JSON array
 * of recorded outcomes. A request sends its outcomes as one text, which crosses to the worker
 * thread as one copy (the outcomes' objects, every panelist's figures, were cloned one by one for
 * each question); the last text parsed is kept, as a request sends the same text for each of its
 * questions. Positions outside the array are ignored.
 */
export function trackRecordsOfText(text: string, keep: readonly number[] | null): Map<string, { record: TrackRecord; skipped: number }> {
  if (text !== lastText) {
    lastParsed = JSON.parse(text) as ScoredOutcome[];
    lastText = text;
  }
  const all = lastParsed;
  return trackRecordsOf(keep === null ? all : keep.flatMap((i) => (i >= 0 && i < all.length ? [all[i]] : [])));
}
