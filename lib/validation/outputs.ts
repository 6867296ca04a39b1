/**
 * zod 4 schemas of what the API returns. They describe the domain services' return types
 * (lib/panels, lib/triangulation, lib/accounts) for the OpenAPI document; tests/app checks responses against
 * the document's shapes through real requests.
 */
import { z } from "zod";
import { AGGREGATIONS, ANSWER_FORMATS, CONSENSUS_MEASURES, USER_ROLES } from "./inputs";

const num = z.number();
const numOrNull = z.number().nullable();
const dateTime = z.string().describe("ISO 8601 date-time");
const dateTimeOrNull = dateTime.nullable();

export const problem = z
  .object({
    type: z.string(),
    title: z.string(),
    status: z.number().int(),
    detail: z.string(),
    instance: z.string().optional(),
    errors: z
      .array(
        z.object({
          field: z.string().describe("dotted path, e.g. questions.0.lowerBound"),
          message: z.string(),
          row: z.number().int().optional().describe("CSV errors: the row (header = 1)"),
          column: z.string().optional().describe("CSV errors: the column name"),
        }),
      )
      .optional(),
  })
  .describe("RFC 9457 problem details");

export const user = z.object({ id: z.string(), email: z.string(), name: z.string(), role: z.enum(USER_ROLES), createdAt: dateTime });

export const apiToken = z.object({ id: z.string(), name: z.string(), createdAt: dateTime, lastUsedAt: dateTimeOrNull, revokedAt: dateTimeOrNull, expiresAt: dateTime });
export const passwordChanged = z.object({ changed: z.literal(true) });
export const issuedApiToken = apiToken.extend({ token: z.string().describe("Shown once; send as 'Authorization: Bearer <token>'.") });

export const question = z.object({
  id: z.string(),
  position: z.number().int(),
  text: z.string(),
  unit: z.string(),
  targetPeriod: z.string(),
  lowerBound: num,
  upperBound: num,
  answerFormat: z.enum(ANSWER_FORMATS),
  aggregation: z.enum(AGGREGATIONS),
  calibration: z.boolean().describe("A calibration question: three-point read as P5 / P50 / P95 (docs/methods.md §21)."),
});

/** A question as organisers and reviewers see it: with a calibration question's true value. */
export const organiserQuestion = question.extend({
  trueValue: numOrNull.describe("Calibration questions: the true value given by the organiser (null: not yet, or not a calibration question)."),
});
export const trueValue = z.object({ questionId: z.string(), trueValue: numOrNull });

export const round = z.object({
  number: z.number().int(),
  status: z.enum(["draft", "open", "closed"]),
  deadline: dateTimeOrNull,
  openedAt: dateTimeOrNull,
  closedAt: dateTimeOrNull,
});

const panelStatus = z.enum(["draft", "running", "finished"]);
const panelRole = z.enum(["owner", "organiser", "reviewer"]);
const rules = {
  consensusMeasure: z.enum(CONSENSUS_MEASURES),
  consensusThreshold: num,
  stabilityThreshold: num,
  roundLimit: z.number().int(),
};

export const panelSummary = z.object({
  id: z.string(),
  title: z.string(),
  status: panelStatus,
  role: panelRole,
  questionCount: z.number().int(),
  currentRound: round.nullable(),
  createdAt: dateTime,
});

export const panel = z.object({
  id: z.string(),
  title: z.string(),
  description: z.string(),
  status: panelStatus,
  role: panelRole,
  ...rules,
  questions: z.array(organiserQuestion),
  rounds: z.array(round),
  createdAt: dateTime,
  updatedAt: dateTime,
});

export const deleted = z.object({ id: z.string(), deleted: z.literal(true) });

export const share = z.object({ email: z.string(), role: z.enum(USER_ROLES) });

export const rosterMember = z.object({ id: z.string(), name: z.string(), email: z.string(), group: z.string(), createdAt: dateTime });

export const invitation = z.object({
  id: z.string(),
  rosterMemberId: z.string(),
  name: z.string(),
  email: z.string(),
  group: z.string(),
  status: z.enum(["active", "revoked", "expired"]),
  expiresAt: dateTime,
  createdAt: dateTime,
});
export const issuedInvitation = invitation.extend({
  token: z.string().describe("Shown once: the panelist's secret (Bearer token on the API)."),
  link: z.string().describe("Path of the panelist's page: /p/<token>"),
  delivery: z.enum(["sent", "outbox", "failed"]).optional().describe("With send: true — sent by SMTP, or kept in the panel's outbox."),
});

export const deliveryReport = z.object({
  kind: z.enum(["round-opened", "reminder"]),
  roundNumber: z.number().int(),
  recipients: z.number().int().describe("People written to (reminders: those who have not answered every question)."),
  sent: z.number().int(),
  outbox: z.number().int().describe("Kept in the panel's outbox (no SMTP server, or refused by it)."),
  failed: z.number().int().describe("Reminders the SMTP server refused (never kept in the outbox)."),
});

export const outboxMessage = z.object({
  id: z.string(),
  kind: z.string(),
  to: z.string(),
  subject: z.string(),
  body: z.string(),
  reason: z.string().describe("Why it was not sent."),
  createdAt: dateTime,
});

export const progress = z.object({
  round: round.nullable(),
  questionCount: z.number().int(),
  invited: z.number().int(),
  answeredAll: z.number().int(),
  answeredSome: z.number().int(),
  panelists: z.array(z.object({ pseudonym: z.string(), questionsAnswered: z.number().int(), lastAnswerAt: dateTimeOrNull })),
});

export const identity = z.object({ pseudonym: z.string(), name: z.string(), email: z.string(), group: z.string() });

const summaryFigures = z
  .object({
    n: num,
    mean: numOrNull,
    sd: numOrNull,
    cv: numOrNull,
    min: numOrNull,
    max: numOrNull,
    q1: numOrNull,
    median: numOrNull,
    q3: numOrNull,
    iqr: numOrNull,
    relativeIqr: numOrNull,
  })
  .describe("Quartiles by Hyndman & Fan (1996) type 7; sd with divisor n − 1; null where undefined");

export const questionStatistics = z.object({
  questionId: z.string(),
  roundNumber: z.number().int(),
  text: z.string(),
  unit: z.string(),
  answerFormat: z.enum(ANSWER_FORMATS),
  aggregation: z.enum(AGGREGATIONS),
  n: z.number().int(),
  values: summaryFigures.nullable().describe("single values, or median estimates (P50) of three-point answers"),
  lows: summaryFigures.nullable(),
  highs: summaryFigures.nullable(),
  pooled: z
    .object({ n: num, p10: num, p25: num, p50: num, p75: num, p90: num, mean: num, sd: num })
    .nullable()
    .describe("linear opinion pool of the three-point answers (lib/blend panelFromThreePoint)"),
  sumOfParts: z
    .object({ total: num, parts: z.array(z.object({ pseudonym: z.string(), value: num, share: numOrNull })) })
    .nullable(),
});

export const roundStatistics = z.object({ round, questions: z.array(questionStatistics) });

export const roundAnswers = z.object({
  round,
  questions: z.array(
    z.object({
      questionId: z.string(),
      answers: z.array(
        z.object({ pseudonym: z.string(), value: num, low: numOrNull, high: numOrNull, rationale: z.string(), version: z.number().int(), answeredAt: dateTime }),
      ),
    }),
  ),
});

const verdicts = z.object({
  questionId: z.string(),
  consensus: z.object({ applicable: z.boolean(), measure: z.enum(CONSENSUS_MEASURES), value: numOrNull, threshold: num, met: z.boolean() }),
  stability: z.object({
    applicable: z.boolean(),
    distributionChange: numOrNull,
    medianChange: numOrNull,
    iqrChange: numOrNull,
    totalChange: numOrNull,
    threshold: num,
    met: z.boolean(),
  }),
  settled: z.boolean(),
});

export const convergence = z.object({
  rules: z.object(rules),
  questions: z.array(
    z.object({
      questionId: z.string(),
      text: z.string(),
      unit: z.string(),
      aggregation: z.enum(AGGREGATIONS),
      rounds: z.array(
        z.object({ round: z.number().int(), n: z.number().int(), median: numOrNull, q1: numOrNull, q3: numOrNull, iqr: numOrNull, relativeIqr: numOrNull, cv: numOrNull, total: numOrNull }),
      ),
    }),
  ),
  evaluation: z
    .object({
      roundNumber: z.number().int(),
      questions: z.array(verdicts),
      roundLimit: z.object({ limit: z.number().int(), roundNumber: z.number().int(), met: z.boolean() }),
      recommendation: z.enum(["stop", "another-round"]),
      reasons: z.array(z.string()),
    })
    .nullable(),
});

const ruleDefault = z.object({ value: z.union([num, z.string()]), source: z.string(), verified: z.boolean(), note: z.string() });
export const ruleDefaults = z.object({
  consensusMeasure: ruleDefault,
  consensusThreshold: z.object({ cv: ruleDefault, "relative-iqr": ruleDefault }),
  stabilityThreshold: ruleDefault,
  roundLimit: ruleDefault,
});

export const answer = z.object({
  questionId: z.string(),
  roundNumber: z.number().int(),
  version: z.number().int(),
  value: num,
  low: numOrNull,
  high: numOrNull,
  rationale: z.string(),
  answeredAt: dateTime,
});
export const answerStored = z.object({ answer, replayed: z.boolean().describe("true when the Idempotency-Key had already stored this answer") });

export const panelistPanel = z.object({
  panel: z.object({ title: z.string(), description: z.string(), status: panelStatus }),
  pseudonym: z.string(),
  round: round.nullable(),
  acceptingAnswers: z.boolean(),
  questions: z.array(
    question.extend({
      rationaleRequired: z.boolean(),
      rationaleReason: z.string().nullable(),
      answer: answer.nullable(),
      versions: z.array(answer),
      previousAnswer: answer.nullable().describe("The panelist's final answer in the previous round (to keep or revise); null in round 1."),
    }),
  ),
});

export const feedback = z.object({
  round: z.number().int().nullable(),
  finished: z.boolean().describe("The panel is finished: no further round."),
  questions: z.array(
    z.object({
      questionId: z.string(),
      text: z.string(),
      unit: z.string(),
      answerFormat: z.enum(ANSWER_FORMATS),
      aggregation: z.enum(AGGREGATIONS),
      n: z.number().int(),
      median: numOrNull,
      q1: numOrNull,
      q3: numOrNull,
      min: numOrNull,
      max: numOrNull,
      pooled: z.object({ p10: num, p50: num, p90: num }).nullable(),
      total: numOrNull,
      histogram: z.array(z.object({ lower: num, upper: num, count: z.number().int() })),
      myAnswer: z.object({ value: num, low: numOrNull, high: numOrNull }).nullable(),
      myPosition: z.enum(["below-iqr", "within-iqr", "above-iqr"]).nullable(),
      explanationRequested: z.boolean(),
      rationales: z.array(z.object({ value: num, rationale: z.string() })),
      rationaleCount: z.number().int(),
    }),
  ),
  practice: z
    .object({
      questions: z.array(
        z.object({
          questionId: z.string(),
          text: z.string(),
          unit: z.string(),
          trueValue: num,
          myAnswer: z.object({ low: num, value: num, high: num }).nullable(),
          inside: z.boolean().nullable(),
        }),
      ),
      hits: z.object({ count: z.number().int(), hits: z.number().int(), rate: numOrNull, nominal: num }),
      scored: z.boolean(),
      binCounts: z.array(z.number().int()).nullable(),
      calibration: numOrNull,
      information: numOrNull,
      sentence: z.string(),
    })
    .nullable()
    .describe("A practice set (every question a calibration question with its true value) once its last round has closed: the panelist's own result; null on any other panel."),
});

export const auditEvent = z.object({
  id: z.string(),
  action: z.string().describe("The event's id for clients, e.g. question.true-value"),
  actorName: z.string().nullable(),
  detail: z.record(z.string(), z.unknown()).describe("The event's stored detail; update events carry the old value (from, fromRule) since it was added, older ones do not"),
  createdAt: dateTime,
  sentence: z.string().describe("The event in plain words, as the panel page shows it; names no panelist"),
});
export const finished = z.object({ id: z.string(), status: z.literal("finished") });
