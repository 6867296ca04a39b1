/**
 * Triangulation of one question (docs/methods.md §14.7): the panel figure and its
 * distribution, the bias-corrected panel figure, the blend with the baseline and its range,
 * and the departure report. Every figure comes from lib/blend; this file only gathers the
 * inputs and composes the calls.
 *
 * Computed on read, not cached: the inputs are the final answers of the closed rounds, the
 * stored baseline, the question's or panel's weight rule, and the track records derived from
 * the organiser's recorded outcomes (lib/triangulation/track-records.ts). The computation takes a few
 * milliseconds, and computing on read means no cached figure can outlive a changed input.
 *
 * Rules (each stated again in the result's notes):
 * - Panel figure: the final closed round's median of the answers (middle values, read as P50, of
 *   three-point answers) for a shared quantity; the sum of the parts for sum of parts.
 * - Panel distribution, from track records (never from the spread of the answers, which Delphi
 *   rounds narrow by design): three-point answers → each answer's P10–P90 range rescaled by its
 *   panelist's interval hit rate (lib/blend `intervalWidthFactor`), then the linear pool
 *   (shared) or the normal approximation of the total (sum of parts); single values or
 *   single-value parts → the figure's predictive distribution from the log errors of the
 *   corrected panel figures of the organiser's recorded outcomes, with a stated prior when they are few
 *   (lib/blend `panelFromTrackRecord`). A sum of parts therefore always has a range.
 * - Bias correction: each panelist's answer × their shrunk bias factor from their track record
 *   (lib/blend `shrunkBiasFactor`); the corrected figure is the median of the corrected answers
 *   or the sum of the corrected parts; the corrected distribution is built the same way from the
 *   corrected answers. Raw and corrected are always both reported.
 * - Blend: one normal predictive distribution (docs/methods.md §15d), weight by the question's
 *   rule, else the panel's (equal, inverse-MSE from the organiser's past outcomes shrunk
 *   toward equal, or organiser-set); the blend figure
 *   w·panel + (1 − w)·baseline is the median of its normal predictive distribution (Bates &
 *   Granger's combined error variance), so it lies inside the blend's ranges.
 * - Departures: every answer of every closed round (shared quantity only: a part is not
 *   comparable with a baseline of the total) and the panel figure per round, against the
 *   baseline's target-period forecast.
 */
import { db } from "@/lib/db";
import { InvalidInputError, NotFoundError } from "@/lib/errors";
import type { Actor } from "@/lib/accounts/actor";
import {
  DEFAULT_BLEND_LEVELS,
  answerDepartures,
  baselineDistribution,
  blend,
  blendErrorCorrelation,
  blendRangeScale,
  blendWeights,
  correctThreePoint,
  correctedPanelFigure,
  departure,
  departureAcrossRounds,
  distributionQuantile,
  intervalWidthFactor,
  panelErrorScale,
  panelFromParts,
  panelFromThreePoint,
  panelFromTrackRecord,
  shrunkBiasFactor,
  widenThreePoint,
  type BaselineForecast,
  type BiasFactor,
  type BlendInterval,
  type BlendResult,
  type BlendWeights,
  type Departure,
  type DepartureAcrossRounds,
  type Distribution,
  type PanelErrorScale,
  type OutcomePair,
  type WeightSpec,
} from "@/lib/blend";
import type { PanelLegChoice, PanelWeightRule, PanelBlendRuleInput, QuestionBlendRuleInput } from "@/lib/validation/triangulation-inputs";
import { authorisePanel } from "../panels/access";
import { recordAudit } from "../panels/audit";
import { storedTarget, type BaselineTarget } from "./baselines";
import { legWarnings } from "./warnings";
import { loadCalibration, targetPoolMedian } from "./calibration";
import { historyOf, type HistoryFilter } from "./track-records";
import { panelReads, type PanelReads } from "../panels/panel-reads";
import { jsonSafe, type JsonSafe } from "../panels/json";
import { correctionSummary, namesRevealed, withoutHistory, type AnswerWithoutHistory, type CorrectionSummary } from "./report-views";

/** One panelist's final answer in a closed round. */
export interface TriangulationAnswer {
  readonly invitationId: string;
  readonly pseudonym: string;
  readonly value: number;
  readonly low: number | null;
  readonly high: number | null;
}

/** A closed round's final answers. */
export interface TriangulationRound {
  readonly round: number;
  readonly answers: readonly TriangulationAnswer[];
}

/** Everything {@link computeTriangulation} needs; plain data. */
export interface TriangulationInput {
  readonly aggregation: "shared" | "sum-of-parts";
  readonly answerFormat: "single" | "three-point";
  /** Closed rounds in order; the last is the final round. */
  readonly rounds: readonly TriangulationRound[];
  /** Bias factor per invitation id (missing: no track record, factor 1). */
  readonly factors: Readonly<Record<string, BiasFactor>>;
  /** Interval hits per invitation id: three-point answers with an outcome and how many held the outcome (missing: none). */
  readonly intervalHits?: Readonly<Record<string, { readonly hits: number; readonly count: number }>>;
  /** ln(outcome / corrected panel figure) of the organiser's recorded outcomes (empty: the prior alone). */
  readonly panelLogErrors?: readonly number[];
  /** Recorded outcomes with both legs (relative figures), for the legs' error correlation (empty: the prior). */
  readonly blendHistory?: readonly OutcomePair[];
  /** (outcome − blend)/blend sd of recorded outcomes, for the blend range's scale (empty: scale 1). */
  readonly blendStandardisedErrors?: readonly number[];
  /** The baseline's target-period forecast, or null without a baseline. */
  readonly baseline: BaselineForecast | null;
  /** The weight rule with its inputs. */
  readonly weight: WeightSpec;
  /** Why a stored baseline cannot be used (e.g. an interval of zero width), when `baseline` is null. */
  readonly baselineUnusable?: string;
  /**
   * The panel's leg is Cooke's performance-weighted pool (lib/triangulation/calibration.ts): the weight
   * per invitation id from the panel's calibration questions, or why it cannot be used (then the
   * answers are taken with equal weights). Absent: the panel leg is the equal-weight one.
   */
  readonly performance?: { readonly weights: Readonly<Record<string, number>>; readonly calibrationQuestions: number } | { readonly unavailable: string };
  /** A calibration question (answers P5 / P50 / P95): shown for completeness, not meant to be triangulated. */
  readonly calibration?: boolean;
}

/** A panelist's answer with its correction. */
export interface CorrectedAnswer extends TriangulationAnswer {
  readonly factor: number;
  /** Recorded outcomes behind the factor. */
  readonly nOutcomes: number;
  /** Credibility n/(n + n0) of the factor. */
  readonly credibility: number;
  /** The unshrunk factor exp(mean log ratio). */
  readonly rawFactor: number;
  readonly correctedValue: number;
  readonly correctedLow: number | null;
  readonly correctedHigh: number | null;
  /** Factor applied to the three-point range from the panelist's interval hit rate (1 without history). */
  readonly rangeFactor: number;
  /** The round the answer comes from: the final round, or an earlier one for a carried-forward part. */
  readonly fromRound: number;
}

/** One version of the panel leg (raw or corrected). */
export interface PanelFigureWithRange {
  readonly figure: number;
  /** Central intervals of the panel distribution (80%, 95%). */
  readonly intervals: readonly BlendInterval[];
  readonly distribution: Distribution;
}

export type PanelRule = "three-point pool" | "performance-weighted pool" | "track record" | "sum of parts";

export interface PanelLeg {
  readonly round: number;
  readonly n: number;
  readonly rule: PanelRule;
  /** The log-error scale behind a "track record" range (null for three-point answers). */
  readonly errorScale: PanelErrorScale | null;
  /** How the panel's range was made, in one sentence for the report (also among the notes). */
  readonly rangeHow: string;
  readonly raw: PanelFigureWithRange;
  readonly corrected: PanelFigureWithRange;
  readonly answers: readonly CorrectedAnswer[];
}

export interface AnswerDeparture extends Departure {
  readonly round: number;
  readonly pseudonym: string;
}

export interface DepartureReport {
  /** Every answer of every closed round (shared quantity only). */
  readonly answers: readonly AnswerDeparture[];
  /** The raw panel figure per closed round, and how its departure moved. */
  readonly panel: DepartureAcrossRounds;
  /** The corrected panel figure of the final round. */
  readonly correctedPanel: Departure;
}

export interface Triangulation {
  readonly panel: PanelLeg | null;
  readonly baseline: (BaselineForecast & { readonly sd: number; readonly sdSource: string }) | null;
  readonly weights: BlendWeights | null;
  readonly blend: BlendResult | null;
  /** How the blend's range was made, in one sentence for the report (null without a blend). */
  readonly blendRangeHow: string | null;
  readonly departures: DepartureReport | null;
  readonly notes: readonly string[];
  readonly cautions: readonly string[];
}

function intervalsOf(d: Distribution): BlendInterval[] {
  return DEFAULT_BLEND_LEVELS.map((level) => {
    const tail = (1 - level / 100) / 2;
    return { level, lower: distributionQuantile(d, tail), upper: distributionQuantile(d, 1 - tail) };
  });
}

function isThreePoint(input: TriangulationInput, answers: readonly { low: number | null; high: number | null }[]): boolean {
  return input.answerFormat === "three-point" && answers.every((a) => a.low !== null && a.high !== null);
}

function panelDistribution(
  input: TriangulationInput,
  answers: readonly { value: number; low: number | null; high: number | null; rangeFactor: number }[],
  figure: number,
  errors: PanelErrorScale,
  performanceWeights: readonly number[] | null = null,
): { distribution: Distribution; rule: PanelRule } {
  if (isThreePoint(input, answers)) {
    const points = answers.map((a) => widenThreePoint({ low: a.low!, mid: a.value, high: a.high! }, a.rangeFactor));
    if (performanceWeights && input.aggregation === "shared") {
      return { distribution: panelFromThreePoint(points, performanceWeights).distribution, rule: "performance-weighted pool" };
    }
    return input.aggregation === "shared"
      ? { distribution: panelFromThreePoint(points).distribution, rule: "three-point pool" }
      : { distribution: panelFromParts(points).distribution, rule: "sum of parts" };
  }
  return { distribution: panelFromTrackRecord(figure, errors, answers.length).distribution, rule: "track record" };
}

/**
 * The triangulation of one question from plain inputs (no I/O; see the module comment).
 * @throws RangeError from lib/blend for inputs it refuses (e.g. an organiser weight outside [0, 1]).
 */
export function computeTriangulation(input: TriangulationInput): Triangulation {
  const notes: string[] = [];
  const cautions: string[] = [
    "Every figure here is uncertain: read the ranges, not only the points. The figures support a decision; they do not make it.",
  ];
  if (input.calibration) {
    cautions.push("This is a calibration question: its answers are the 5th, 50th and 95th percentiles and its true value scores the panelists (the report's performance weights). The panel range below reads them as P10 / P90; it takes no baseline or outcome.");
  }
  const mode = input.aggregation === "shared" ? "shared-quantity" : "sum-of-parts";
  const final = input.rounds.at(-1);
  let panel: PanelLeg | null = null;
  if (final && final.answers.length > 0) {
    // Sum of parts: a panelist who did not answer in the final round keeps their latest earlier
    // part, or the total would silently lose a territory.
    const finalAnswers: (TriangulationAnswer & { fromRound: number })[] = final.answers.map((a) => ({ ...a, fromRound: final.round }));
    if (input.aggregation === "sum-of-parts") {
      const seen = new Set(final.answers.map((a) => a.invitationId));
      for (const r of [...input.rounds].reverse().slice(1)) {
        for (const a of r.answers) {
          if (seen.has(a.invitationId)) continue;
          seen.add(a.invitationId);
          finalAnswers.push({ ...a, fromRound: r.round });
        }
      }
    }
    const carried = finalAnswers.filter((a) => a.fromRound !== final.round).length;
    const answers: CorrectedAnswer[] = finalAnswers.map((a) => {
      const f = input.factors[a.invitationId] ?? shrunkBiasFactor(0, 0);
      const h = input.intervalHits?.[a.invitationId] ?? { hits: 0, count: 0 };
      const tp = a.low !== null && a.high !== null ? correctThreePoint({ low: a.low, mid: a.value, high: a.high }, f.factor) : null;
      return {
        ...a,
        factor: f.factor,
        nOutcomes: f.n,
        credibility: f.credibility,
        rawFactor: f.raw,
        correctedValue: a.value * f.factor,
        correctedLow: tp ? tp.low : null,
        correctedHigh: tp ? tp.high : null,
        rangeFactor: intervalWidthFactor(h.hits, h.count).factor,
      };
    });
    // Cooke's performance-weighted pool as the panel leg (three-point shared questions only).
    let perfWeights: number[] | null = null;
    let perfUnavailable: string | null = null;
    if (input.performance) {
      if ("unavailable" in input.performance) perfUnavailable = input.performance.unavailable;
      else if (!(input.aggregation === "shared" && isThreePoint(input, answers))) perfUnavailable = "only three-point questions with a shared quantity give percentiles to weigh.";
      else {
        const w = answers.map((a) => (input.performance as { weights: Readonly<Record<string, number>> }).weights[a.invitationId] ?? 0);
        if (w.some((x) => x > 0)) perfWeights = w;
        else perfUnavailable = "no panelist with a performance weight above 0 answered this question in the final round.";
      }
    }
    const equalFig = correctedPanelFigure(answers.map((a) => ({ answer: a.value, factor: a.factor })), mode);
    const fig = perfWeights
      ? {
          raw: targetPoolMedian(answers.map((a) => ({ low: a.low!, mid: a.value, high: a.high! })), perfWeights),
          corrected: targetPoolMedian(answers.map((a) => ({ low: a.correctedLow!, mid: a.correctedValue, high: a.correctedHigh! })), perfWeights),
        }
      : equalFig;
    const errorScale = panelErrorScale(input.panelLogErrors ?? []);
    const rawD = panelDistribution(input, answers, fig.raw, errorScale, perfWeights);
    const corrD = panelDistribution(
      input,
      answers.map((a) => ({ value: a.correctedValue, low: a.correctedLow, high: a.correctedHigh, rangeFactor: a.rangeFactor })),
      fig.corrected,
      errorScale,
      perfWeights,
    );
    const rescaled = answers.filter((a) => a.rangeFactor !== 1).length;
    const fromHits = `each answer's P10–P90 range rescaled by Φ⁻¹(0.9)/Φ⁻¹((1 + ĥ)/2), ĥ its panelist's interval hit rate shrunk toward 80% with weight 5 (${rescaled} of ${answers.length} panelists have one)`;
    const e = errorScale;
    const rangeHow = {
      "three-point pool": `Panel range: the equal-weight linear pool (Stone 1961) of the three-point answers, each read as P10/P50/P90 of a two-piece normal, ${fromHits}.`,
      "performance-weighted pool": `Panel range: the linear pool of the three-point answers with Cooke's performance weights from ${input.performance && "calibrationQuestions" in input.performance ? input.performance.calibrationQuestions : 0} calibration questions (docs/methods.md §21), each answer read as P10/P50/P90 of a two-piece normal, ${fromHits}.`,
      "sum of parts": `Panel range: the total of the parts as a normal with the summed means and variances of the three-point parts (parts taken as independent), ${fromHits}.`,
      "track record": `Panel range: from the track record, not from the spread of the answers. Log errors ln(outcome / corrected panel figure) of ${e.n} recorded outcome${e.n === 1 ? "" : "s"} pooled with a prior scale of ${e.priorScale} worth ${e.priorStrength} questions give a scale of ${e.scale.toPrecision(3)}; the range is figure × exp(±t·scale) with t the Student t quantile on ${e.df} degrees of freedom (Gelman et al. 2013, §2.6).`,
    }[rawD.rule];
    panel = {
      round: final.round,
      n: answers.length,
      rule: rawD.rule,
      errorScale: rawD.rule === "track record" ? errorScale : null,
      rangeHow,
      raw: { figure: fig.raw, intervals: intervalsOf(rawD.distribution), distribution: rawD.distribution },
      corrected: { figure: fig.corrected, intervals: intervalsOf(corrD.distribution), distribution: corrD.distribution },
      answers,
    };
    notes.push(
      perfWeights
        ? `Panel figure: the median (P50) of Cooke's performance-weighted pool of the ${answers.length} final answers of round ${final.round}, each read as P10/P50/P90 with a distribution uniform between them on the answers' range widened by 10% (docs/methods.md §21); ${perfWeights.filter((w) => w > 0).length} of them carry weight. The equal-weight median would be ${equalFig.raw.toPrecision(6)}.`
        : input.aggregation === "shared"
          ? `Panel figure: the median (Hyndman & Fan type 7) of the ${answers.length} final answers of round ${final.round}${input.answerFormat === "three-point" ? " (their middle values, read as P50)" : ""}.`
          : `Panel figure: the sum of the ${answers.length} parts of the final answers (round ${final.round}).`,
    );
    if (perfUnavailable) {
      const msg = `The panel leg is set to the performance-weighted pool, but it cannot be used here: ${perfUnavailable} The answers are taken with equal weights.`;
      notes.push(msg);
      cautions.push(msg);
    }
    if (carried > 0) {
      const msg = `${carried} of the ${answers.length} parts come from an earlier round: those panelists did not answer in round ${final.round}, so their latest part was kept.`;
      notes.push(msg);
      cautions.push(msg);
    }
    notes.push(rangeHow);
    if (rawD.rule === "track record" && e.n < e.priorStrength) {
      cautions.push(`The panel's range rests mostly on a default prior (typical error ${Math.round(100 * e.priorScale)}%): only ${e.n} recorded outcome${e.n === 1 ? "" : "s"} show how far the panel figure has been from outcomes.`);
    }
    if (rawD.rule === "sum of parts") cautions.push("The parts are treated as independent; if the territories' errors move together, the total's range is wider than shown.");
    const corrected = answers.filter((a) => a.nOutcomes > 0).length;
    notes.push(
      corrected === 0
        ? "Bias correction: no panelist has a recorded outcome yet, so every factor is 1 and the corrected figure equals the raw one."
        : `Bias correction: ${corrected} of ${answers.length} panelists have a track record; each answer × exp(Z·mean log ratio) with Z = n/(n + 5) (shrinkage toward 1 with few recorded outcomes; Bühlmann-style credibility, the constant 5 is a judgement call).`,
    );
    if (input.aggregation === "sum-of-parts") notes.push("Corrected total: the sum of the corrected parts.");
  } else {
    notes.push("No closed round has answers yet, so there is no panel figure.");
  }

  let baselineOut: Triangulation["baseline"] = null;
  let weights: BlendWeights | null = null;
  let blended: BlendResult | null = null;
  let blendRangeHow: string | null = null;
  let departures: DepartureReport | null = null;
  if (input.baseline) {
    const bd = baselineDistribution(input.baseline);
    baselineOut = { ...input.baseline, sd: bd.distribution.sd, sdSource: bd.sdSource };
    notes.push(`Baseline distribution: a normal with the point forecast as mean and sd ${bd.distribution.sd.toPrecision(4)} implied by its ${bd.sdSource}.`);
    if (panel) {
      weights = blendWeights(input.weight);
      const rho = blendErrorCorrelation(input.blendHistory ?? []);
      const scale = blendRangeScale(input.blendStandardisedErrors ?? []);
      blended = blend({
        errorCorrelation: rho.rho,
        rangeScale: scale.scale,
        panelFigure: panel.corrected.figure,
        baselineFigure: input.baseline.mean,
        panelDistribution: panel.corrected.distribution,
        baselineDistribution: bd.distribution,
        panelWeight: weights.panel,
      });
      blendRangeHow =
        `Blend range: one normal centred on the blended figure, sd √(w²σp² + (1−w)²σb² + 2w(1−w)ρσpσb) = ${blended.distribution.sd.toPrecision(4)} ` +
        `(Bates & Granger 1969), from the panel's range (σp = ${blended.panelSd.toPrecision(4)}) and the baseline's (σb = ${blended.baselineSd.toPrecision(4)}) ` +
        `with the legs' error correlation ρ = ${rho.rho.toPrecision(3)} (${rho.credibility > 0 ? `${rho.n} recorded outcomes, shrunk toward the prior 0.5` : "the stated prior 0.5"})` +
        (scale.n > 0 ? ` and × ${scale.scale.toPrecision(3)} from how often ${scale.n} past blends' ranges held` : "") +
        "; not the mixture of the two legs, which would be too wide (docs/methods.md §15d).";
      if (weights.applied === "inverse-mse") {
        notes.push("Inverse-MSE weights use relative errors, (outcome − figure)/outcome, over the organiser's recorded outcomes with a baseline, so that questions of different sizes count alike; the MSEs quoted are of those relative errors.");
      }
      notes.push(
        `Blend: ${weights.panel.toPrecision(3)} × corrected panel figure + ${weights.baseline.toPrecision(3)} × baseline (Bates & Granger 1969); the figure is the median of the blend's distribution, a normal with sd √(w²σp² + (1−w)²σb² + 2w(1−w)ρσpσb) = ${blended.distribution.sd.toPrecision(4)}, ` +
          `σp = ${blended.panelSd.toPrecision(4)} and σb = ${blended.baselineSd.toPrecision(4)} implied by each leg's 80% range, ρ = ${rho.rho.toPrecision(3)} ` +
          (rho.credibility > 0
            ? `(errors of ${rho.n} recorded outcomes, correlation ${rho.historyRho.toPrecision(3)}, shrunk toward 0.5 with credibility ${rho.credibility.toPrecision(3)}). `
            : "(the stated prior: no recorded outcomes with both legs yet). ") +
          (scale.n > 0
            ? `The sd is × ${scale.scale.toPrecision(3)}: the 80th percentile of |standardised error| of ${scale.n} blends with a recorded outcome over Φ⁻¹(0.9) is ${scale.historyScale.toPrecision(3)}, shrunk toward 1 with credibility ${scale.credibility.toPrecision(3)}. `
            : "No blend with a recorded outcome yet to check the range against, so it is used as computed. ") +
          weights.reason,
      );
      const answersOut: AnswerDeparture[] = [];
      if (input.aggregation === "shared") {
        for (const r of input.rounds) {
          if (r.answers.length === 0) continue;
          const ds = answerDepartures(r.answers.map((a) => a.value), input.baseline);
          ds.forEach((d, i) => answersOut.push({ ...d, round: r.round, pseudonym: r.answers[i].pseudonym }));
        }
      } else {
        notes.push("Departures of single parts are not shown: a part is not comparable with the baseline of the total.");
      }
      const rounds = input.rounds.filter((r) => r.answers.length > 0);
      const figures = rounds.map((r) => correctedPanelFigure(r.answers.map((a) => ({ answer: a.value, factor: 1 })), mode).raw);
      const across = departureAcrossRounds(figures, input.baseline);
      departures = {
        answers: answersOut,
        panel: { ...across, rounds: across.rounds.map((d, i) => ({ ...d, round: rounds[i].round })) },
        correctedPanel: departure(panel.corrected.figure, input.baseline),
      };
      notes.push("Departure: difference = figure − baseline; percent of the baseline; z = difference / baseline sd; percentile = 100·Φ(z); flags from the same normal (outside 80% when the percentile is below 10 or above 90, outside 95% below 2.5 or above 97.5).");
      const z = departures.correctedPanel.z;
      if (Math.abs(z) > 1.96) {
        cautions.push(`The corrected panel figure lies ${Math.abs(z).toFixed(1)} baseline standard errors ${z > 0 ? "above" : "below"} the baseline: judgment and statistics disagree; the report's inputs show why each says what it says.`);
      }
    }
  } else if (input.baselineUnusable) {
    notes.push(`The baseline cannot be blended: ${input.baselineUnusable}`);
    cautions.push(`The baseline cannot be blended: ${input.baselineUnusable}`);
  } else {
    notes.push("No baseline is attached, so there is no blend and no departure report.");
  }
  return { panel, baseline: baselineOut, weights, blend: blended, blendRangeHow, departures, notes, cautions };
}

/** The weight rule that applies to a question, with the organiser's weight for that rule. */
export function effectiveRule(
  panel: { blendRule: string; blendPanelWeight: number | null },
  question: { blendRule: string | null; blendPanelWeight: number | null },
): { rule: PanelWeightRule; panelWeight: number | null; from: "question" | "panel" } {
  if (question.blendRule) return { rule: question.blendRule as PanelWeightRule, panelWeight: question.blendPanelWeight, from: "question" };
  return { rule: panel.blendRule as PanelWeightRule, panelWeight: panel.blendPanelWeight, from: "panel" };
}

function weightSpec(rule: PanelWeightRule, panelWeight: number | null, history: readonly OutcomePair[]): WeightSpec {
  if (rule === "organiser" && panelWeight !== null) return { rule: "organiser", panelWeight };
  if (rule === "inverse-mse") return { rule: "inverse-mse", history };
  return { rule: "equal" };
}

/** A question's stored inputs, loaded for {@link computeTriangulation}, with what else the report shows. */
export interface LoadedTriangulation {
  readonly input: TriangulationInput;
  readonly question: {
    id: string;
    text: string;
    unit: string;
    targetPeriod: string;
    lowerBound: number;
    upperBound: number;
    aggregation: "shared" | "sum-of-parts";
    answerFormat: "single" | "three-point";
    calibration: boolean;
  };
  /** The panel's choice of panel leg (equal, or the performance-weighted pool). */
  readonly panelLeg: "equal" | "performance";
  readonly ownerId: string;
  readonly rule: ReturnType<typeof effectiveRule>;
  readonly baselineTarget: BaselineTarget | null;
  /** invitation id → roster member id. */
  readonly members: ReadonlyMap<string, string>;
  /** Roster members with a track-record note: answers skipped. */
  readonly recordedAt: Date | null;
}

/**
 * Loads a question's inputs (no access check: callers authorise, which also closes overdue
 * rounds, lib/panels/access.ts). `reads` shares the reads of one request across its questions
 * (lib/panels/panel-reads.ts).
 */
export async function loadTriangulation(panelId: string, questionId: string, reads: PanelReads = panelReads()): Promise<LoadedTriangulation> {
  const q = await db.question.findFirst({
    where: { id: questionId, panelId },
    include: { panel: true, baseline: true, resolution: { select: { resolvedAt: true } } },
  });
  if (!q) throw new NotFoundError("The question");
  const rounds = await db.round.findMany({ where: { panelId, status: "closed" }, orderBy: { number: "asc" } });
  const invitations = await reads.invitations(panelId);
  const members = new Map(invitations.map((i) => [i.id, i.rosterMemberId]));
  const roundInputs: TriangulationRound[] = [];
  for (const r of rounds) {
    const answers = await reads.finalAnswers(r.id, questionId);
    roundInputs.push({ round: r.number, answers: answers.map((a) => ({ invitationId: a.invitationId, pseudonym: a.pseudonym, value: a.value, low: a.low, high: a.high })) });
  }
  while (roundInputs.length > 0 && roundInputs.at(-1)!.answers.length === 0) roundInputs.pop();
  const recordedAt = q.resolution?.resolvedAt ?? null;
  const filter: HistoryFilter = { excludeQuestionId: questionId, ...(recordedAt ? { before: recordedAt } : {}) };
  const records = await reads.trackRecords(q.panel.ownerId, filter);
  const factors: Record<string, BiasFactor> = {};
  const intervalHits: Record<string, { hits: number; count: number }> = {};
  for (const [invitationId, memberId] of members) {
    const r = records.get(memberId);
    if (r) {
      factors[invitationId] = r.record.bias;
      intervalHits[invitationId] = { hits: r.record.intervalHitRate.hits, count: r.record.intervalHitRate.count };
    }
  }
  const rule = effectiveRule(q.panel, q);
  const outcomes = await reads.outcomes(q.panel.ownerId, filter);
  const pairs = historyOf(outcomes).pairs;
  const history = rule.rule === "inverse-mse" ? pairs : [];
  const blendStandardisedErrors = outcomes
    .filter((r) => r.figures.blend !== null && (r.figures.blendSd ?? 0) > 0)
    .map((r) => (r.outcomeValue - r.figures.blend!) / r.figures.blendSd!);
  const panelLogErrors = outcomes.filter((r) => r.outcomeValue > 0 && r.figures.correctedPanel > 0).map((r) => Math.log(r.outcomeValue / r.figures.correctedPanel));
  const target = q.baseline ? storedTarget(q.baseline) : null;
  let baseline: BaselineForecast | null = null;
  if (target && target.mean !== null) {
    const b: { mean: number; lower80?: number; upper80?: number; lower95?: number; upper95?: number } = { mean: target.mean };
    if (target.lower80 !== null && target.upper80 !== null && target.lower80 < target.upper80) {
      b.lower80 = target.lower80;
      b.upper80 = target.upper80;
    }
    if (target.lower95 !== null && target.upper95 !== null && target.lower95 < target.upper95) {
      b.lower95 = target.lower95;
      b.upper95 = target.upper95;
    }
    if (b.lower80 !== undefined || b.lower95 !== undefined) baseline = b;
  }
  const baselineUnusable =
    target && !baseline
      ? target.mean === null
        ? "its forecast for the target period is undefined."
        : "its prediction interval has no width (e.g. a constant history), so it gives no range to blend or to measure departures against."
      : undefined;
  const aggregation = q.aggregation === "sum-of-parts" ? "sum-of-parts" : "shared";
  const answerFormat = q.answerFormat === "three-point" ? "three-point" : "single";
  let performance: TriangulationInput["performance"];
  if (q.panel.panelLeg === "performance" && !q.calibration) {
    const c = await loadCalibration(panelId, reads);
    if (c.report.calibrationQuestions === 0) performance = undefined;
    else if (c.weights.size === 0) performance = { unavailable: c.report.waiting ?? "no panelist has been scored on the calibration questions yet." };
    else performance = { weights: Object.fromEntries(c.weights), calibrationQuestions: c.report.counted };
  }
  return {
    input: {
      aggregation,
      answerFormat,
      rounds: roundInputs,
      factors,
      intervalHits,
      panelLogErrors,
      blendHistory: pairs,
      blendStandardisedErrors,
      baseline,
      weight: weightSpec(rule.rule, rule.panelWeight, history),
      ...(baselineUnusable ? { baselineUnusable } : {}),
      ...(performance ? { performance } : {}),
      ...(q.calibration ? { calibration: true } : {}),
    },
    question: { id: q.id, text: q.text, unit: q.unit, targetPeriod: q.targetPeriod, lowerBound: q.lowerBound, upperBound: q.upperBound, aggregation, answerFormat, calibration: q.calibration },
    panelLeg: q.panel.panelLeg === "performance" ? "performance" : "equal",
    ownerId: q.panel.ownerId,
    rule,
    baselineTarget: target,
    members,
    recordedAt,
  };
}

/**
 * {@link Triangulation} as JSON (non-finite numbers as null), with the rule that chose the
 * weight. Answers carry pseudonyms only: invitation ids would let an organiser match pseudonyms
 * to the invitation list (names) without the audited reveal. While names are hidden, answers
 * also carry nothing from the panelist's history (see lib/triangulation/report-views.ts).
 */
export type TriangulationView = Omit<JsonSafe<Triangulation>, "panel"> & {
  readonly panel:
    | (Omit<JsonSafe<PanelLeg>, "answers"> & {
        /** Per-person correction figures only when names are shown (lib/triangulation/report-views.ts). */
        readonly answers: (Omit<JsonSafe<CorrectedAnswer>, "invitationId"> | AnswerWithoutHistory)[];
        readonly correction: JsonSafe<CorrectionSummary>;
      })
    | null;
  readonly questionId: string;
  readonly weightRule: { readonly rule: PanelWeightRule; readonly panelWeight: number | null; readonly from: "question" | "panel" };
  readonly namesShown: boolean;
  /** Plain messages: a leg outside the question's plausible range, legs an order of magnitude apart (lib/triangulation/warnings.ts). */
  readonly warnings: readonly string[];
};

/** The triangulation of a question (organisers and reviewers of the panel). */
export async function getTriangulation(actor: Actor, panelId: string, questionId: string, reads?: PanelReads): Promise<TriangulationView> {
  const access = await authorisePanel(actor, panelId, "read");
  const loaded = await loadTriangulation(panelId, questionId, reads);
  const computed = computeTriangulation(loaded.input);
  const t = jsonSafe(computed);
  const namesShown = await namesRevealed(actor, panelId, access.canManage);
  const panel = t.panel
    ? {
        ...t.panel,
        answers: t.panel.answers.map(({ invitationId: _hidden, ...a }) => (namesShown ? a : withoutHistory(a))),
        correction: jsonSafe(correctionSummary(computed.panel!.answers)),
      }
    : null;
  const warnings = legWarnings(loaded.question, loaded.baselineTarget, computed.panel?.corrected.figure ?? null);
  return { ...t, panel, questionId, weightRule: loaded.rule, namesShown, warnings };
}

/** Sets the panel's blend weight rule (organisers; audited). */
export async function setPanelBlendRule(
  actor: Actor,
  panelId: string,
  input: PanelBlendRuleInput,
): Promise<{ rule: PanelWeightRule; panelWeight: number | null; panelLeg: PanelLegChoice }> {
  const access = await authorisePanel(actor, panelId, "manage");
  const panelWeight = input.rule === "organiser" ? input.panelWeight! : null;
  const panelLeg: PanelLegChoice = input.panelLeg ?? (access.panel.panelLeg === "performance" ? "performance" : "equal");
  await db.$transaction(async (tx) => {
    await tx.panel.update({ where: { id: panelId }, data: { blendRule: input.rule, blendPanelWeight: panelWeight, panelLeg } });
    await recordAudit(tx, { actorId: access.actor.userId, panelId, action: "panel.blend-rule", detail: { fromRule: access.panel.blendRule, fromPanelWeight: access.panel.blendPanelWeight, rule: input.rule, panelWeight, panelLeg } });
  });
  return { rule: input.rule, panelWeight, panelLeg };
}

/** Sets one question's blend weight rule, or hands it back to the panel's (organisers; audited). */
export async function setQuestionBlendRule(
  actor: Actor,
  panelId: string,
  questionId: string,
  input: QuestionBlendRuleInput,
): Promise<{ rule: PanelWeightRule; panelWeight: number | null; from: "question" | "panel" }> {
  const access = await authorisePanel(actor, panelId, "manage");
  const q = await db.question.findFirst({ where: { id: questionId, panelId } });
  if (!q) throw new NotFoundError("The question");
  if (input.rule === "organiser" && input.panelWeight === undefined) throw new InvalidInputError([{ field: "panelWeight", message: "the organiser rule needs a panel weight" }]);
  const rule = input.rule === "panel" ? null : input.rule;
  const panelWeight = input.rule === "organiser" ? input.panelWeight! : null;
  await db.$transaction(async (tx) => {
    await tx.question.update({ where: { id: questionId }, data: { blendRule: rule, blendPanelWeight: panelWeight } });
    await recordAudit(tx, { actorId: access.actor.userId, panelId, action: "question.blend-rule", detail: { questionId, fromRule: q.blendRule ?? "panel", fromPanelWeight: q.blendPanelWeight, rule: input.rule, panelWeight } });
  });
  return effectiveRule(access.panel, { blendRule: rule, blendPanelWeight: panelWeight });
}
