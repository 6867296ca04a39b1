/**
 * A practice set (issue 18; docs/methods.md §21–§22): a panel whose questions are all calibration
 * questions with their true values given. Once its last round has closed, each panelist's own
 * feedback (their private link only) shows, per question, the true value, their own P5 / P50 / P95
 * and whether the true value fell inside [P5, P95], with their own calibration and information
 * score — the figures of their pseudonym in the organiser's performance-weights report
 * (./calibration.ts `loadCalibration`, one computation), not recomputed here.
 *
 * Rules:
 * - A practice set: at least one question, every question a calibration question, every true
 *   value given. Any other panel has no practice result (null): nothing changes there.
 * - Shown only when the panel's latest round is closed (no round open or waiting as a draft), so
 *   that no true value reaches a panelist while an answer can still be given or changed.
 * - Inside: P5 ≤ true value ≤ P95 (lib/blend `intervalHitRate`, nominal 90%), the count the
 *   panelist's own record uses (./own-record.ts).
 *
 * Privacy (THREATS.md): only this panelist's own answers and scores; no other panelist's answers,
 * pseudonyms or scores. The information score depends on every panelist's answers through each
 * question's intrinsic range (§21), as in the organiser's report.
 */
import { db } from "@/lib/db";
import type { Actor } from "@/lib/accounts/actor";
import { intervalHitRate, type IntervalHitRate } from "@/lib/blend";
import { NOMINAL_CALIBRATION_COVERAGE, rangeAdvice } from "@/lib/blend/own-record";
import { authorisePanelist } from "../panels/access";
import { closedFinalAnswers, loadCalibration } from "./calibration";
import { panelReads } from "../panels/panel-reads";

export interface PracticeQuestion {
  readonly questionId: string;
  readonly text: string;
  readonly unit: string;
  readonly trueValue: number;
  /** The panelist's final answer (P5, P50, P95); null when they did not answer. */
  readonly myAnswer: { readonly low: number; readonly value: number; readonly high: number } | null;
  /** P5 ≤ true value ≤ P95; null when they did not answer. */
  readonly inside: boolean | null;
}

export interface PracticeResult {
  readonly questions: readonly PracticeQuestion[];
  /** True values inside the panelist's [P5, P95] ranges, against the nominal 90%. */
  readonly hits: IntervalHitRate;
  /** Scored only when every practice question was answered (as in the organiser's report). */
  readonly scored: boolean;
  readonly binCounts: readonly number[] | null;
  readonly calibration: number | null;
  readonly information: number | null;
  /** The result in plain words. */
  readonly sentence: string;
}

const fmt = (x: number) => x.toPrecision(2);

/**
 * The panelist's practice result, or null when their panel is not a practice set or its latest
 * round is not closed yet (panelists only: their own link).
 */
export async function getPracticeResult(actor: Actor): Promise<PracticeResult | null> {
  const me = await authorisePanelist(actor);
  const questions = await db.question.findMany({
    where: { panelId: me.panelId },
    orderBy: { position: "asc" },
    select: { id: true, text: true, unit: true, calibration: true, trueValue: true },
  });
  if (questions.length === 0 || questions.some((q) => !q.calibration || q.trueValue === null)) return null;
  const latest = await db.round.findFirst({ where: { panelId: me.panelId }, orderBy: { number: "desc" }, select: { status: true } });
  if (latest?.status !== "closed") return null;

  const reads = panelReads();
  const answers = await closedFinalAnswers(
    me.panelId,
    questions.map((q) => q.id),
    reads,
  );
  let pseudonym: string | null = null;
  const rows: PracticeQuestion[] = questions.map((q) => {
    const mine = (answers.get(q.id) ?? []).find((a) => a.invitationId === me.invitationId && a.low !== null && a.high !== null);
    if (mine) pseudonym = mine.pseudonym;
    const trueValue = q.trueValue!;
    const myAnswer = mine ? { low: mine.low!, value: mine.value, high: mine.high! } : null;
    return { questionId: q.id, text: q.text, unit: q.unit, trueValue, myAnswer, inside: myAnswer ? trueValue >= myAnswer.low && trueValue <= myAnswer.high : null };
  });
  const hits = {
    ...intervalHitRate(rows.flatMap((r) => (r.myAnswer ? [{ actual: r.trueValue, answer: r.myAnswer.value, low: r.myAnswer.low, high: r.myAnswer.high }] : []))),
    nominal: NOMINAL_CALIBRATION_COVERAGE,
  };
  const { report } = await loadCalibration(me.panelId, reads);
  const own = pseudonym === null ? undefined : report.panelists.find((p) => p.pseudonym === pseudonym);
  const scored = own?.scored === true && own.calibration !== null && own.information !== null;

  const n = questions.length;
  const parts = [
    hits.count === 0
      ? `You answered none of the ${n} practice questions, so there is nothing to score.`
      : `${hits.hits} of ${hits.count} true values fell inside your 90% ranges (5th to 95th percentile); ranges of that width hold about ${fmt(NOMINAL_CALIBRATION_COVERAGE * hits.count)} of ${hits.count}.`,
  ];
  if (hits.count > 0) {
    const advice = rangeAdvice(hits, "90% ranges");
    parts.push(
      advice.verdict === "too-narrow"
        ? "That is too few: widen your ranges."
        : advice.verdict === "too-wide"
          ? "That is more than the stated 90%: you may narrow your ranges."
          : advice.verdict === "as-stated"
            ? "That is in line with 90%."
            : "Too few questions to say whether your ranges are too narrow or too wide.",
    );
  }
  if (scored) {
    parts.push(
      `Your calibration score is ${fmt(own!.calibration!)} (0 to 1, higher is better: how likely true values spread this far from 5%, 45%, 45%, 5% over your four parts — below P5, P5 to P50, P50 to P95, above P95 — are for someone whose percentiles are right) and your information score ${fmt(own!.information!)} (higher for narrower ranges).`,
    );
  } else if (hits.count > 0) {
    parts.push(hits.count < n ? `Scores need an answer to every one of the ${n} practice questions.` : "Your scores cannot be computed on these questions (an answer and the true value all the same number).");
  }
  return {
    questions: rows,
    hits,
    scored,
    binCounts: scored ? own!.binCounts : null,
    calibration: scored ? own!.calibration : null,
    information: scored ? own!.information : null,
    sentence: parts.join(" "),
  };
}
