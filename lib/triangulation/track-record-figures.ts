/**
 * Track records from recorded outcomes, core imports only, so that they are computed on the
 * worker pool (lib/work/jobs.ts; issue 13: the records of every roster member, once per question
 * with an outcome, held the request thread for tens of milliseconds each). The rules are those of
 * lib/triangulation/track-records.ts (module comment), which loads the outcomes and re-exports
 * these. Empty input gives an empty map; a member whose every answer is left out has a record of
 * count 0 (lib/blend `trackRecord`).
 */
import { trackRecord, type AnswerOutcome, type TrackRecord } from "@/lib/blend";

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

/** Each roster member's answers with an outcome (see the module comment for what is left out). */
export function recordsByMember(outcomes: readonly RecordedOutcome[]): Map<string, { records: AnswerOutcome[]; skipped: number }> {
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
export function trackRecordsOf(outcomes: readonly RecordedOutcome[]): Map<string, { record: TrackRecord; skipped: number }> {
  const out = new Map<string, { record: TrackRecord; skipped: number }>();
  for (const [id, { records, skipped }] of recordsByMember(outcomes)) {
    const record = trackRecord(records);
    out.set(id, { record, skipped: skipped + record.skipped });
  }
  return out;
}
