/**
 * zod 4 schemas of what the triangulation routes return (issue 4), for the OpenAPI document.
 * They describe the services' return types in lib/triangulation (baselines, triangulation,
 * outcome, track-records, report). Numbers that are undefined for the data (e.g. a percent
 * of a zero baseline) are null.
 */
import { z } from "zod";
import { AGGREGATIONS, ANSWER_FORMATS } from "./inputs";
import { convergence } from "./outputs";
import { PANEL_LEGS } from "./triangulation-inputs";

const num = z.number();
const n0 = z.number().nullable();
const dateTime = z.string().describe("ISO 8601 date-time");
const loose = z.record(z.string(), z.unknown());
const interval = z.object({ level: num, lower: n0, upper: n0 });
const weightRule = z.enum(["equal", "inverse-mse", "organiser"]);

export const baselineTarget = z
  .object({
    step: z.number().int().describe("value: steps to the target period; total, average: the last period b of periods firstPeriod..b"),
    firstPeriod: z.number().int().describe("total, average: the first period a of periods a..step (1: the next period); value: equal to step"),
    quantity: z.enum(["value", "total", "average"]),
    period: z.enum(["month", "quarter", "year", "week", "day", "other"]).describe("what one history row is"),
    label: z.string().describe("plain words, e.g. total of the next 12 months, total of months 4 to 15 after the history"),
    how: z.string().nullable().describe("how the total's distribution was made"),
    mean: n0,
    lower80: n0,
    upper80: n0,
    lower95: n0,
    upper95: n0,
  })
  .describe("Forecast of the quantity the question asks for");

const simulated = z.object({ mean: num, lower: z.record(z.string(), num), upper: z.record(z.string(), num) });
const launchResult = z.object({
  analogues: z.array(
    z.object({
      name: z.string(),
      periods: z.number().int(),
      p: num,
      q: num,
      m: num,
      se: z.object({ p: n0, q: n0, m: n0 }).describe("standard errors (null when the fit cannot separate the parameters)"),
      peak: num.describe("the fitted peak period, ln(q/p)/(p + q)"),
      values: z.array(num).describe("its adoptions per period as given"),
      fitted: z.array(num).describe("the fitted Bass curve m·(F(t) − F(t−1))"),
      notes: z.array(z.string()),
    }),
  ),
  p: simulated,
  q: simulated,
  market: z.object({ median: num, sigmaLog: num, low: num, high: num, how: z.string(), questionId: z.string().nullable().optional() }),
  draws: z.number().int(),
});

export const baselineResult = z
  .object({
    method: z.string(),
    parameters: z.record(z.string(), n0),
    season: z.number().int(),
    horizon: z.number().int(),
    levels: z.array(num),
    forecast: z.array(z.object({ step: z.number().int(), mean: n0, lower: z.record(z.string(), n0), upper: z.record(z.string(), n0) })),
    fitted: z.array(n0),
    accuracy: z.object({ insample: z.object({ mae: n0, rmse: n0, mape: n0, smape: n0, mase: n0 }) }),
    candidates: z.array(z.object({ method: z.string(), mase: n0, error: z.string().optional() })).optional().describe("rolling-origin holdout MASE per method (automatic selection)"),
    combination: z.array(z.object({ method: z.string(), parameters: z.record(z.string(), n0) })).optional(),
    total: z
      .object({
        from: z.number().int().optional().describe("first period summed (absent in results stored before windows: 1)"),
        to: z.number().int().optional().describe("last period summed (the horizon)"),
        mean: n0,
        lower: z.record(z.string(), n0),
        upper: z.record(z.string(), n0),
        how: z.string(),
      })
      .optional()
      .describe("the total over periods from..to after the history (total and average quantities; docs/methods.md §10)"),
    launch: launchResult.optional().describe("a launch baseline: the analogues' Bass fits, p and q carried over, the market potential (docs/methods.md §19)"),
    notes: z.array(z.string()),
  })
  .describe("lib/forecast/baseline.ts result");

export const baselinePreview = z.object({
  source: z.enum(["csv", "values", "launch"]),
  valueColumn: z.string(),
  explanatoryColumns: z.array(z.string()),
  ignoredColumns: z.array(z.string()),
  rows: z.array(z.object({ row: z.number().int(), value: n0, scaled: n0, x: z.record(z.string(), n0) })),
  futureRows: z.array(z.object({ step: z.number().int(), x: z.record(z.string(), num) })),
  observations: z.number().int(),
  missing: z.number().int(),
  scaleFactor: num,
});

export const baseline = z.object({
  questionId: z.string(),
  source: z.enum(["csv", "values", "launch"]),
  valueColumn: z.string(),
  analogue: z.object({ scaleFactor: num, note: z.string() }).nullable(),
  season: z.number().int(),
  requestedMethod: z.string(),
  horizon: z.number().int(),
  target: baselineTarget,
  result: baselineResult,
  preview: baselinePreview,
  stored: z.boolean(),
  createdAt: dateTime.nullable(),
  updatedAt: dateTime.nullable(),
});

export const blendRule = z.object({ rule: weightRule, panelWeight: n0 });
export const questionBlendRule = blendRule.extend({ from: z.enum(["question", "panel"]) });
export const panelBlendRule = blendRule.extend({
  panelLeg: z.enum(PANEL_LEGS).describe("The panel leg of three-point shared questions: equal, or performance (Cooke's performance-weighted pool; used only when the panel has scored calibration questions)"),
});

const departureFields = {
  value: num,
  baseline: num,
  difference: num,
  percent: n0,
  z: n0,
  percentile: n0,
  outside80: z.boolean(),
  outside95: z.boolean(),
  sd: num,
  sdSource: z.string(),
};
const departure = z.object(departureFields);
export const departures = z.object({
  answers: z.array(z.object({ ...departureFields, round: z.number().int(), pseudonym: z.string() })),
  panel: z.object({
    rounds: z.array(z.object({ ...departureFields, round: z.number().int(), differenceChange: n0, zChange: n0, closer: z.boolean().nullable() })),
    totalZChange: n0,
  }),
  correctedPanel: departure,
});

const ownAnswerFields = {
  value: num,
  low: n0,
  high: n0,
  fromRound: z.number().int().describe("the round the answer comes from (an earlier one: a part carried forward)"),
};

/** Figures from the panelist's history across panels: only for an organiser who revealed the names. */
const historyFields = {
  factor: n0,
  nOutcomes: z.number().int(),
  credibility: n0,
  rawFactor: n0,
  correctedValue: n0,
  correctedLow: n0,
  correctedHigh: n0,
};

const correctedAnswerFields = { ...ownAnswerFields, ...historyFields };

const weights = z.object({
  requested: z.string(),
  applied: z.string(),
  panel: num,
  baseline: num,
  nOutcomes: z.number().int(),
  msePanel: n0,
  mseBaseline: n0,
  errorCorrelation: n0,
  unconstrainedPanel: n0,
  expectedMse: n0,
  reason: z.string(),
});

export const triangulation = z.object({
  questionId: z.string(),
  weightRule: questionBlendRule,
  panel: z
    .object({
      round: z.number().int(),
      n: z.number().int(),
      rule: z.string(),
      raw: z.object({ figure: n0, intervals: z.array(interval), distribution: loose }),
      corrected: z.object({ figure: n0, intervals: z.array(interval), distribution: loose }),
      answers: z
        .array(z.object({ pseudonym: z.string(), ...ownAnswerFields, ...z.object(historyFields).partial().shape }))
        .describe("the history fields (factor … correctedHigh) only when namesShown"),
      correction: z
        .object({ panelistsWithRecord: z.number().int(), meanFactor: n0 })
        .describe("the bias correction as one aggregate: panelists with a track record, mean factor applied"),
    })
    .nullable(),
  namesShown: z.boolean().describe("whether per-person figures are shown: an organiser of the panel after the audited reveal"),
  baseline: z.object({ mean: num, lower80: num.optional(), upper80: num.optional(), lower95: num.optional(), upper95: num.optional(), sd: n0, sdSource: z.string() }).nullable(),
  weights: weights.nullable(),
  blend: z.object({ panelWeight: num, figure: n0, mean: n0, median: n0, intervals: z.array(interval), distribution: loose }).nullable(),
  departures: departures.nullable(),
  notes: z.array(z.string()),
  cautions: z.array(z.string()),
  warnings: z.array(z.string()).describe("plain messages: a leg outside the question's plausible range, or the legs an order of magnitude apart"),
});

const figureScore = z.object({
  label: z.string(),
  forecast: num,
  outcomeValue: num,
  error: num,
  absoluteError: num,
  percentError: n0,
  absolutePercentError: n0,
  symmetricPercentError: n0,
  scaledError: n0.describe("|error| / the baseline history's in-sample naive MAE (null without a baseline)"),
});

export const outcome = z.object({
  questionId: z.string(),
  outcomeValue: num,
  note: z.string(),
  parts: z.array(z.object({ pseudonym: z.string(), outcomeValue: num })),
  recordedAt: dateTime,
  correctedAt: dateTime.nullable(),
  figures: z.object({
    round: z.number().int(),
    aggregation: z.enum(AGGREGATIONS),
    answerFormat: z.enum(ANSWER_FORMATS),
    rawPanel: num,
    correctedPanel: num,
    baseline: n0,
    blend: n0,
    panelWeight: n0,
    weightRule: z.string().nullable(),
    baselineSeason: z.number().int(),
    panelists: z.array(z.object({ pseudonym: z.string(), value: num, low: n0, high: n0 })),
  }),
  scores: z.object({
    outcomeValue: num,
    rawPanel: figureScore,
    correctedPanel: figureScore,
    baseline: figureScore.nullable(),
    blend: figureScore.nullable(),
    panelists: z.array(figureScore),
  }),
});

const theil = z.object({ n: num, mse: n0, um: n0, ur: n0, ud: n0, us: n0, uc: n0, r: n0 }).nullable();
const trackRecordFields = {
  count: z.number().int(),
  meanError: n0,
  meanLogRatio: n0,
  mape: n0,
  theil,
  theilNote: z.string(),
};

export const rosterTrackRecord = z.object({
  rosterMemberId: z.string(),
  name: z.string(),
  group: z.string(),
  skipped: z.number().int().describe("Answers with an outcome left out: a value or outcome ≤ 0, or outside the accepted range"),
  record: z.object({
    ...trackRecordFields,
    intervalHitRate: z.object({ count: z.number().int(), hits: z.number().int(), rate: n0, nominal: num }),
    bias: z.object({ n: z.number().int(), priorStrength: num, meanLogRatio: n0, credibility: n0, raw: n0, factor: n0 }),
  }),
});

const figureHistory = z.object({
  accuracy: z.record(z.string(), n0).describe("ME, MAE, MSE, RMSE, MPE, MAPE, sMAPE, MASE, tracking signal"),
  trackingSignal: z.array(n0),
  alarm: z.object({ firstBreach: z.number().int().nullable(), value: n0, limit: num }),
});

export const accuracyHistory = z.object({
  questions: z.array(
    z.object({
      questionId: z.string(),
      panelId: z.string(),
      panelTitle: z.string(),
      text: z.string(),
      unit: z.string(),
      recordedAt: dateTime,
      outcomeValue: num,
      rawPanel: num,
      correctedPanel: num,
      baseline: num,
      blend: num,
    }),
  ),
  withoutBaseline: z.number().int(),
  unusable: z.number().int().describe("Questions with an outcome left out because a stored value is outside the accepted range"),
  history: z.object({ n: z.number().int(), rawPanel: figureHistory, correctedPanel: figureHistory, baseline: figureHistory, blend: figureHistory }).nullable(),
  notes: z.array(z.string()),
});

const blendMovement = z
  .object({
    fromRound: z.number().int().describe("the closed round before the latest one with answers"),
    toRound: z.number().int().describe("the latest closed round with answers"),
    previousFigure: num.describe("the blended figure from the answers up to fromRound, with today's baseline, weight rule and track records"),
    change: num.describe("today's blended figure minus previousFigure"),
  })
  .describe("how the blended figure moved since the previous closed round; null without a blend or with fewer than two closed rounds with answers");

const panelist = { pseudonym: z.string(), name: z.string().nullable().describe("only for an organiser who revealed identities") };

const poolScore = z.object({
  binCounts: z.array(z.number().int()).describe("true values at or below P5, P5–P50, P50–P95, above P95"),
  calibration: num,
  information: num,
  combined: num.describe("calibration × information"),
});
const pooledPercentiles = z.object({ p5: num, p10: num, p50: num, p90: num, p95: num });
export const targetPools = z.object({
  questionId: z.string(),
  text: z.string(),
  unit: z.string(),
  answers: z.number().int().describe("panelists whose answers are pooled with equal weights"),
  equal: pooledPercentiles.nullable(),
  performance: pooledPercentiles.nullable(),
  note: z.string().nullable().describe("why a pool is missing"),
});
const calibrationFields = {
  calibrationQuestions: z.number().int(),
  counted: z.number().int().describe("calibration questions with a true value and answers"),
  waiting: z.string().nullable().describe("why nothing is scored yet"),
  panelists: z
    .array(
      z.object({
        pseudonym: z.string(),
        answered: z.number().int(),
        scored: z.boolean(),
        binCounts: z.array(z.number().int()).nullable(),
        calibration: n0,
        information: n0,
        combined: n0,
        weight: n0.describe("weight in the performance-weighted pool"),
      }),
    )
    .describe("under pseudonyms only; every figure from this panel's calibration questions"),
  pools: z.object({ equal: poolScore, performance: poolScore.extend({ cutoff: n0 }) }).nullable().describe("each pool scored on the calibration questions (in sample)"),
  outOfSample: z
    .object({ questions: z.number().int(), equal: poolScore, performance: poolScore, weightingHelped: z.boolean() })
    .nullable()
    .describe("each calibration question left out in turn"),
  verdict: z.string().describe("the out-of-sample comparison in one plain sentence"),
  method: z.array(z.string()),
};
/** The panel's performance weights (Cooke's classical model, docs/methods.md §21). */
export const calibrationReport = z.object({ ...calibrationFields, targets: z.array(targetPools) });

export const questionReport = z.object({
  generatedAt: dateTime,
  summary: z.string().describe("the sentence the report leads with: the figure, its 80% range, the outcome if recorded, and the main disagreement"),
  panel: z.object({ id: z.string(), title: z.string(), status: z.string() }),
  question: z.object({
    id: z.string(),
    text: z.string(),
    unit: z.string(),
    targetPeriod: z.string(),
    lowerBound: num,
    upperBound: num,
    aggregation: z.enum(AGGREGATIONS),
    answerFormat: z.enum(ANSWER_FORMATS),
    calibration: z.boolean().describe("a calibration question (answers read as P5 / P50 / P95)"),
  }),
  viewer: z.object({ role: z.enum(["owner", "organiser", "reviewer"]), namesShown: z.boolean() }),
  blend: z
    .object({
      figure: n0,
      median: n0,
      mean: n0,
      intervals: z.array(interval),
      panelWeight: n0,
      baselineWeight: n0,
      ruleRequested: z.string(),
      ruleApplied: z.string(),
      ruleFrom: z.enum(["question", "panel"]),
      reason: z.string(),
      outcomesBehindWeight: n0,
      msePanel: n0,
      mseBaseline: n0,
      rangeHow: z.string().describe("how the blend's range was made"),
    })
    .nullable(),
  legs: z.object({
    panel: z
      .object({
        round: z.number().int(),
        n: z.number().int(),
        rule: z.string(),
        raw: z.object({ figure: n0, intervals: z.array(interval) }),
        corrected: z.object({ figure: n0, intervals: z.array(interval) }),
        rangeHow: z.string().describe("how the panel's range was made: the track record with its stated prior, or the three-point pool"),
      })
      .nullable(),
    baseline: z
      .object({
        method: z.string(),
        requestedMethod: z.string(),
        parameters: z.record(z.string(), n0),
        season: z.number().int(),
        horizon: z.number().int(),
        target: z.object({ mean: n0, lower80: n0, upper80: n0, lower95: n0, upper95: n0, label: z.string().describe("what the baseline answers, e.g. total of the next 12 months") }),
        sd: n0,
        sdSource: z.string().nullable(),
        holdout: z.object({ chosenMase: n0, candidates: z.array(z.object({ method: z.string(), mase: n0, error: z.string().optional() })) }),
        insample: z.record(z.string(), n0),
        source: z.string(),
        observations: z.number().int(),
        analogue: z.object({ scaleFactor: num, note: z.string() }).nullable(),
        notes: z.array(z.string()),
        rangeHow: z.string().describe("how the baseline's range was made: the fitted model's own prediction interval"),
      })
      .nullable(),
    trackRecord: z.object({
      panelistsWithRecord: z.number().int(),
      meanFactor: n0.describe("mean bias factor applied to the final answers (1 for a panelist without a record)"),
      panelists: z.array(
        z.object({
          ...panelist,
          ...trackRecordFields,
          biasFactor: n0,
          unshrunkFactor: n0,
          credibility: n0,
          intervalHits: z.number().int(),
          intervalCount: z.number().int(),
          intervalHitRate: n0,
        }),
      ),
    }),
  }),
  convergence: z.object({
    rounds: convergence.shape.questions.element.shape.rounds,
    verdict: loose.nullable(),
    recommendation: z.enum(["stop", "another-round"]).nullable(),
    reasons: z.array(z.string()),
  }),
  departures: departures.nullable(),
  biasCorrection: z.array(z.object({ ...panelist, ...correctedAnswerFields })).describe("empty unless viewer.namesShown"),
  outcome: outcome.nullable(),
  movement: blendMovement.nullable(),
  distributions: z.object({ panelRaw: loose.nullable(), panelCorrected: loose.nullable(), baseline: loose.nullable(), blend: loose.nullable() }).describe("lib/blend distributions behind the ranges, for charts"),
  performanceWeights: z
    .object({
      ...calibrationFields,
      panelLeg: z.enum(PANEL_LEGS).describe("the panel leg of the blend chosen for the panel"),
      thisQuestion: targetPools.nullable().describe("this question's two pools (null for a calibration question)"),
    })
    .nullable()
    .describe("Cooke's classical model on the panel's calibration questions; null on a panel without calibration questions"),
  methodNotes: z.array(z.string()),
  inputs: z.array(z.string()),
  warnings: z.array(z.string()).describe("plain messages, also at the head of cautions: a leg outside the question's plausible range, or the legs an order of magnitude apart"),
  cautions: z.array(z.string()),
});

export const csvText = z.string().describe("CSV (RFC 4180): section,item,measure,value,unit; cells that could run as spreadsheet formulas start with an apostrophe");

export const portfolioRow = z.object({
  panelId: z.string(),
  panelTitle: z.string(),
  panelStatus: z.string(),
  role: z.enum(["owner", "organiser", "reviewer"]),
  questionId: z.string(),
  questionText: z.string(),
  unit: z.string(),
  targetPeriod: z.string(),
  aggregation: z.enum(AGGREGATIONS),
  figure: n0.describe("the blended figure (as the question's report); null without a blend"),
  lower80: n0,
  upper80: n0,
  convergence: z.enum(["no-closed-round", "not-settled", "settled"]).describe("the stopping rules' verdict after the latest closed round: settled when the answers are stable"),
  latestRound: z.number().int().nullable().describe("the latest closed round with answers"),
  outcome: n0.describe("the recorded outcome value; null while none is recorded"),
  outcomeRecordedAt: dateTime.nullable(),
  movement: blendMovement.nullable(),
});

export const portfolio = z.object({
  generatedAt: dateTime,
  movementRule: z.string().describe("how the change column is computed, in plain words"),
  rows: z.array(portfolioRow),
});
