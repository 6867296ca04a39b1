/**
 * A panelist's own record ("Your record", /p/<token>/record; docs/methods.md §22): how their past
 * answers turned out, across every panel they were invited to as the same roster member, from the
 * outcomes the organiser recorded.
 *
 * - Outcomes: the same recorded outcomes and the same per-person record as the organiser's track
 *   records (./track-records.ts `loadOutcomes`, `recordsByMember`, lib/blend `trackRecord`):
 *   count, interval hit rate of P10–P90 answers against 80%, mean log ratio, bias factor and its
 *   credibility. The figures equal that person's row of `/api/v1/track-records`.
 * - Calibration questions (issue 18): each counted calibration question (true value given) on a
 *   panel the member was invited to, with the member's latest answer in a closed round; its
 *   P5–P95 range against the nominal 90% (lib/blend `intervalHitRate`, nominal 90%).
 * - Errors over time: one point per outcome, (answer − outcome)/outcome in percent, in the order
 *   the outcomes were recorded, dated; without the question, the answer or the outcome, so that
 *   the page holds no more of the person's answers than the chart needs (THREATS.md: an organiser
 *   who kept the link could otherwise match answers to pseudonyms on earlier panels).
 *
 * Privacy (THREATS.md): reached only with the panelist's own link (a PanelistActor from a valid,
 * unrevoked, unexpired invitation); there is no organiser route to it. The view holds only this
 * roster member's own figures, the titles of panels they were invited to and the questions they
 * answered; no other panelist, pseudonym, name or organiser appears.
 */
import { db } from "@/lib/db";
import type { Actor } from "@/lib/accounts/actor";
import { intervalHitRate, trackRecord, type IntervalHitRate, type AnswerOutcome } from "@/lib/blend";
import { usableRecord } from "@/lib/blend/track-record";
import { biasAdvice, NOMINAL_CALIBRATION_COVERAGE, rangeAdvice, type BiasAdvice, type RangeAdvice } from "@/lib/blend/own-record";
import { authorisePanelist } from "../panels/access";
import { loadOutcomes, recordsByMember } from "./track-records";
import { jsonSafe, type JsonSafe } from "../panels/json";

/** One recorded outcome of the panelist's answers (no question, answer or outcome: see the module comment). */
export interface OwnOutcome {
  readonly recordedAt: string;
  /** (answer − actual)/actual × 100. */
  readonly errorPercent: number;
}

export interface OwnRecord {
  /** Outcomes counted (the track record's count). */
  readonly count: number;
  /** Answers with an outcome left out (a value or outcome ≤ 0 or out of range), as in the track record. */
  readonly skipped: number;
  readonly interval80: IntervalHitRate;
  readonly interval90: IntervalHitRate;
  readonly meanLogRatio: number;
  readonly bias: { readonly factor: number; readonly raw: number; readonly credibility: number; readonly n: number };
  readonly outcomes: readonly OwnOutcome[];
  readonly advice: { readonly ranges80: RangeAdvice; readonly ranges90: RangeAdvice | null; readonly bias: BiasAdvice };
}

/** The panelist's own record (panelists only: their own link). */
export async function getOwnRecord(actor: Actor): Promise<JsonSafe<OwnRecord>> {
  const me = await authorisePanelist(actor);
  const invitation = await db.invitation.findUniqueOrThrow({
    where: { id: me.invitationId },
    select: { rosterMember: { select: { id: true, ownerId: true } } },
  });
  const memberId = invitation.rosterMember.id;
  const recorded = await loadOutcomes(invitation.rosterMember.ownerId);

  // The record exactly as the organiser's track record computes it.
  const mine = recordsByMember(recorded).get(memberId) ?? { records: [], skipped: 0 };
  const record = trackRecord(mine.records);

  // Each outcome on its own, in order, for the chart and the table (same selection, one outcome at a time).
  const outcomes: OwnOutcome[] = [];
  for (const r of recorded) {
    for (const a of recordsByMember([r]).get(memberId)?.records ?? []) {
      if (!usableRecord(a)) continue;
      outcomes.push({ recordedAt: r.recordedAt.toISOString(), errorPercent: ((a.answer - a.actual) / a.actual) * 100 });
    }
  }

  const calibration = await calibrationAnswers(memberId);
  const interval90 = { ...intervalHitRate(calibration), nominal: NOMINAL_CALIBRATION_COVERAGE };
  return jsonSafe({
    count: record.count,
    skipped: mine.skipped + record.skipped,
    interval80: record.intervalHitRate,
    interval90,
    meanLogRatio: record.meanLogRatio,
    bias: { factor: record.bias.factor, raw: record.bias.raw, credibility: record.bias.credibility, n: record.bias.n },
    outcomes,
    advice: {
      ranges80: rangeAdvice(record.intervalHitRate, "80% ranges"),
      ranges90: interval90.count > 0 ? rangeAdvice(interval90, "90% ranges on calibration questions") : null,
      bias: biasAdvice(record.count, record.meanLogRatio),
    },
  });
}

/**
 * The member's P5 / P50 / P95 answers to calibration questions with a true value, on every panel
 * they were invited to: their latest answer in a closed round (as lib/triangulation/calibration.ts reads
 * final answers), with the true value as the outcome. Only panels with no round open or waiting as
 * a draft count (as the practice result, lib/triangulation/practice.ts): while answers can still change, a
 * hit count that moves would hint at a true value.
 */
async function calibrationAnswers(memberId: string): Promise<AnswerOutcome[]> {
  const rows = await db.answer.findMany({
    where: {
      invitation: { rosterMemberId: memberId },
      round: { status: "closed" },
      question: { calibration: true, trueValue: { not: null }, panel: { rounds: { none: { status: { in: ["draft", "open"] } } } } },
      low: { not: null },
      high: { not: null },
    },
    orderBy: [{ round: { number: "asc" } }, { version: "asc" }],
    select: { questionId: true, value: true, low: true, high: true, question: { select: { trueValue: true } } },
  });
  const latest = new Map<string, AnswerOutcome>();
  for (const a of rows) latest.set(a.questionId, { actual: a.question.trueValue!, answer: a.value, low: a.low!, high: a.high! });
  return [...latest.values()];
}
