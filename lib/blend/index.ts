/**
 * lib/blend: the triangulation core — blend weights, the panel's and the baseline's
 * distributions and their mixture, departures from the baseline, track records and bias
 * factors, and scoring once the outcome is known. Pure TypeScript: no framework, database or validation
 * library; relative imports only (lib/stats, lib/forecast/accuracy); plain objects in and out.
 *
 * ## Policy for empty input, NaN and out-of-range values (applies to every exported function)
 * - **NaN and ±Infinity** in any numeric input (a scalar, an array entry or a field of a
 *   record) throw a `RangeError` whose message names the function, the field and, for an
 *   array, the index. Nothing is skipped silently: the caller decides what a missing answer
 *   means before calling. (The one exception is `trackingAlarm`, whose input is a tracking-
 *   signal series that is NaN by definition while the MAD is 0; NaN never breaches.)
 * - **Empty arrays** of answers, values, parts or components throw a `RangeError`.
 *   **The history of outcomes** that drives a decision may be empty, because thin history is an
 *   expected state with a stated fallback: `inverseMseWeights` / `optimalWeights` fall back
 *   to equal weights with the reason, `trackRecord` and `intervalHitRate` give count 0, NaN
 *   measures, bias factor 1 and no Theil decomposition.
 * - **Out-of-range values** throw a `RangeError` saying what to fix: a weight outside [0, 1],
 *   a probability outside [0, 1], a negative standard deviation (or a baseline sd of 0), a
 *   three-point answer with low > mid or mid > high, an interval with lower ≥ upper, a
 *   non-positive actual or answer where a log ratio is needed, a bias factor ≤ 0.
 * - A statistic that is **undefined for valid input** is returned as NaN and documented on
 *   its function (percent departure when the baseline is 0; MAPE with an actual of 0; Theil's
 *   proportions when the MSE is 0; Bates–Granger weights when every weight is equally good).
 *
 * ## Sources (docs/methods.md §15a, §15c, §17), and how far they were checked
 * - M. Stone (1961), "The opinion pool", Ann. Math. Statist. 32(4), 1339–1342,
 *   doi:10.1214/aoms/1177704873 — read on Project Euclid (abstract: the pooled density
 *   Σ λ_i p_i with λ_i ≥ 0, Σ λ_i = 1).
 * - R. C. Blattberg and S. J. Hoch (1990), "Database models and managerial intuition: 50% model
 *   + 50% manager", Management Science 36, 887–899 — citation seen in a review in the
 *   International Journal of Forecasting 7 (1991) 251–254; the issue number 8 is from memory.
 * - H. Bühlmann (1967), credibility Z = n/(n + K): the form and year seen in secondary accounts
 *   of credibility theory; the journal details (ASTIN Bulletin 4(3), 199–207) are from memory.
 * - A. Gelman, J. B. Carlin, H. S. Stern, D. B. Dunson, A. Vehtari and D. B. Rubin (2013),
 *   Bayesian Data Analysis, 3rd ed., CRC Press, §2.6 (normal with known mean, unknown variance;
 *   scaled inverse-χ² prior) — from memory, section number not checked.
 * - R. Ranjan and T. Gneiting (2010), "Combining probability forecasts", JRSS B 72(1), 71–91
 *   (a linear pool of calibrated forecasts is over-dispersed) — from memory; the project's
 *   simulated panel study (`npm run bench:blend`) showed the effect on the blend.
 * - J. Smith and K. F. Wallis (2009), "A simple explanation of the forecast combination puzzle",
 *   Oxford Bulletin of Economics and Statistics 71(3), 331–355 — from memory.
 * - Split normal (Gibbons & Mylroie 1973; John 1982): named from memory for contrast only; the
 *   three-point fitting rule in `distribution.ts` is this project's own and stated in full there.
 */
export {
  EQUAL_PANEL_WEIGHT,
  MIN_OUTCOMES_FOR_WEIGHTS,
  MIN_OUTCOMES_FOR_CORRELATION,
  PRIOR_ERROR_CORRELATION,
  WEIGHT_PRIOR_SD,
  weightCredibility,
  blendErrorCorrelation,
  batesGrangerWeights,
  equalWeights,
  organiserWeights,
  inverseMseWeights,
  optimalWeights,
  blendWeights,
  type WeightRule,
  type WeightSpec,
  type OutcomePair,
  type BlendWeights,
  type BatesGrangerOptimum,
  type ErrorCorrelation,
  type HistoryWeightOptions,
} from "./weights";
export {
  THREE_POINT_PROBABILITIES,
  normalDistribution,
  threePointDistribution,
  panelFromThreePoint,
  panelFromSpread,
  panelFromParts,
  baselineDistribution,
  distributionCdf,
  distributionDensity,
  distributionMean,
  distributionVariance,
  componentQuantile,
  type NormalComponent,
  type TwoPieceNormalComponent,
  type Component,
  type Mixture,
  type Distribution,
  type ThreePointAnswer,
  type BaselineForecast,
  type BaselineSdSource,
  type BaselineDistribution,
  type PanelDistribution,
  type PanelDistributionRule,
} from "./distribution";
export {
  PANEL_LOG_ERROR_PRIOR,
  panelErrorScale,
  panelFromTrackRecord,
  intervalWidthFactor,
  widenThreePoint,
  blendRangeScale,
  type RangeScale,
  type PanelErrorScale,
  type IntervalWidthFactor,
} from "./panel-range";
export {
  DEFAULT_BLEND_LEVELS,
  linearPool,
  blendDistribution,
  distributionQuantile,
  distributionSummary,
  blend,
  type PoolPart,
  type DistributionSummary,
  type BlendInput,
  type BlendResult,
  type BlendInterval,
} from "./mixture";
export {
  departure,
  answerDepartures,
  departureAcrossRounds,
  type Departure,
  type RoundDeparture,
  type DepartureAcrossRounds,
} from "./departure";
export {
  BIAS_PRIOR_STRENGTH,
  MIN_OUTCOMES_FOR_THEIL,
  NOMINAL_INTERVAL_COVERAGE,
  theilDecomposition,
  meanLogRatio,
  shrunkBiasFactor,
  intervalHitRate,
  trackRecord,
  correctAnswer,
  correctThreePoint,
  correctedPanelFigure,
  type AnswerOutcome,
  type TheilDecomposition,
  type BiasFactor,
  type IntervalHitRate,
  type TrackRecord,
  type TrackRecordOptions,
  type AggregationMode,
  type AnswerWithFactor,
  type CorrectedPanelFigure,
} from "./track-record";
export {
  TRACKING_SIGNAL_LIMIT,
  scoreFigure,
  scoreOutcome,
  trackingAlarm,
  accuracyHistory,
  type FigureScore,
  type ScoreOptions,
  type OutcomeFigures,
  type OutcomeScores,
  type TrackingAlarm,
  type HistoryEntry,
  type FigureHistory,
  type AccuracyHistory,
} from "./scoring";
