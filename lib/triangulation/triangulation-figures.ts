/**
 * Triangulation of one question from plain inputs (docs/methods.md §14.7): the panel figure and
 * its distribution, the bias-corrected panel figure, the blend with the baseline and its range,
 * and the departure report. Every figure comes from lib/blend; this file only composes the calls.
 * It imports only the pure core (and calibration-figures.ts, which does too), so that it runs on
 * the worker pool (lib/work/jobs.ts); lib/triangulation/triangulation.ts gathers the inputs.
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
} from "../blend";
import { targetPoolMedian } from "./calibration-figures";

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

/**
 * A question's triangulation with, for the report's movement, the blend figure of the same
 * inputs without the final round (`earlier`: the inputs up to the previous closed round with
 * answers, null without one); computed only when the final blend figure is finite.
 */
export function triangulationWithEarlier(input: TriangulationInput, earlier: TriangulationInput | null): { now: Triangulation; before: number | null } {
  const now = computeTriangulation(input);
  const figure = now.blend?.figure ?? null;
  const before = earlier && figure !== null && Number.isFinite(figure) ? (computeTriangulation(earlier).blend?.figure ?? null) : null;
  return { now, before };
}

/** The blend figure and its central intervals of each question (a panel's report table), null without a blend. */
export function blendsOf(inputs: readonly TriangulationInput[]): ({ figure: number; intervals: readonly BlendInterval[] } | null)[] {
  return inputs.map((input) => {
    const t = computeTriangulation(input);
    return t.blend && t.weights ? { figure: t.blend.figure, intervals: t.blend.intervals } : null;
  });
}
