/**
 * Performance weights on a panel (Cooke's classical model, docs/methods.md §21): from each
 * panelist's final answers to the panel's calibration questions and the true values the organiser
 * gave, the core (lib/blend/classical-model.ts) gives each panelist's calibration and information
 * score and weight, the equal-weight and the performance-weighted pool of every target question,
 * and the leave-one-calibration-question-out comparison of the two pools.
 *
 * Rules (each stated again in the result's `method`):
 * - A panelist's final answer to a question is their latest answer in a closed round.
 * - Calibration questions count once their true value is given; a panelist is scored only when
 *   they answered every counted calibration question (the model compares panelists on the same
 *   questions). Answers to calibration questions are the 5th, 50th and 95th percentiles.
 * - Background: on each question's intrinsic range (the percentiles and the true value, widened by
 *   10% each side), uniform, or log-uniform when the values are all above 0 and span two orders of
 *   magnitude or more (`backgroundFor`).
 * - Target questions: the panel's three-point shared-quantity questions that are not calibration
 *   questions, answered as P10 / P50 / P90; each panelist's minimum-information distribution
 *   through those levels on the answers' intrinsic range, pooled with equal weights (everyone who
 *   answered) and with the performance weights (scored panelists only). Single-value and
 *   sum-of-parts questions carry no percentiles to pool and are listed with that reason.
 *
 * Panelists appear under their pseudonyms only. Every figure here comes from this panel's own
 * answers and true values, never from a panelist's history on other panels (THREATS.md, the
 * anonymity rule), so it may stand next to a pseudonym.
 */
import { db } from "@/lib/db";
import type { Actor } from "@/lib/accounts/actor";
import { runJob } from "@/lib/work/pool";
import { computeCalibration, type CalibrationData, type CalibrationReport, type FinalAnswer } from "./calibration-figures";
import { authorisePanel } from "../panels/access";
import { panelReads, type PanelReads } from "../panels/panel-reads";
import { jsonSafe, type JsonSafe } from "../panels/json";

export * from "./calibration-figures";

/** One computation per panel per request: the report page asks for it once per question. Keyed on the request's reads, so nothing outlives the request. */
const perRequest = new WeakMap<PanelReads, Map<string, Promise<CalibrationData>>>();

/**
 * The panel's calibration data from each panelist's latest answer in a closed round, per question
 * (no access check: callers authorise). Computed once per `reads` (one request).
 */
export function loadCalibration(panelId: string, reads: PanelReads = panelReads()): Promise<CalibrationData> {
  let kept = perRequest.get(reads);
  if (!kept) {
    kept = new Map();
    perRequest.set(reads, kept);
  }
  let p = kept.get(panelId);
  if (!p) {
    p = readCalibration(panelId, reads);
    kept.set(panelId, p);
  }
  return p;
}

async function readCalibration(panelId: string, reads: PanelReads): Promise<CalibrationData> {
  // Overdue rounds were closed by the caller's authorisation (lib/panels/access.ts).
  const questions = await db.question.findMany({
    where: { panelId },
    orderBy: { position: "asc" },
    select: { id: true, text: true, unit: true, answerFormat: true, aggregation: true, calibration: true, trueValue: true },
  });
  if (!questions.some((q) => q.calibration)) return computeCalibration(questions, new Map());
  // On the worker pool: at 300 panelists × 10 calibration questions the scoring takes about a second.
  return runJob("calibration", { questions, answers: await closedFinalAnswers(panelId, questions.map((q) => q.id), reads) });
}

/** Each panelist's latest answer in a closed round to each of these questions of the panel (question id → answers): the final answers the scores use. */
export async function closedFinalAnswers(panelId: string, questionIds: readonly string[], reads: PanelReads): Promise<Map<string, FinalAnswer[]>> {
  const rounds = await db.round.findMany({ where: { panelId, status: "closed" }, orderBy: { number: "asc" }, select: { id: true } });
  const answers = new Map<string, FinalAnswer[]>();
  for (const id of questionIds) {
    const latest = new Map<string, FinalAnswer>();
    for (const r of rounds) {
      for (const a of await reads.finalAnswers(r.id, id)) {
        latest.set(a.invitationId, { invitationId: a.invitationId, pseudonym: a.pseudonym, value: a.value, low: a.low, high: a.high });
      }
    }
    answers.set(id, [...latest.values()]);
  }
  return answers;
}

/** The panel's performance weights and pools (organisers and reviewers of the panel); `calibrationQuestions` 0 and nothing else on a panel without calibration questions. */
export async function getCalibration(actor: Actor, panelId: string, reads?: PanelReads): Promise<JsonSafe<CalibrationReport>> {
  await authorisePanel(actor, panelId, "read");
  return jsonSafe((await loadCalibration(panelId, reads)).report);
}
