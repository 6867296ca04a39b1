/**
 * zod 4 schemas of what clients send: request bodies and path parameters. The route table
 * (lib/http/routes.ts) validates requests with them and generates the OpenAPI document from
 * them; the domain services take their parsed (`z.infer`) types. Pages' server actions
 * `safeParse` form data with the same schemas.
 */
import { z } from "zod";
import { MAX_QUESTIONS_PER_PANEL } from "./limits";
import { API_TOKEN_DEFAULT_DAYS, API_TOKEN_MAX_DAYS } from "../accounts/tokens";
import { numberProblem } from "./numbers";

export const ANSWER_FORMATS = ["single", "three-point"] as const;
export const AGGREGATIONS = ["shared", "sum-of-parts"] as const;
export const CONSENSUS_MEASURES = ["relative-iqr", "cv"] as const;
export const USER_ROLES = ["organiser", "reviewer"] as const;

const text = (max: number) => z.string().trim().min(1, "must not be empty").max(max, `at most ${max} characters`);
const id = z.string().min(1, "must not be empty").max(64, "must be an identifier of at most 64 characters").describe("identifier");
/** A value a client gives (an answer, a bound, an outcome, a history value): the rule in ./numbers.ts. */
export const usableNumber = z.number().superRefine((v, ctx) => {
  const problem = numberProblem(v);
  if (problem) ctx.addIssue({ code: "custom", message: problem });
});
const finite = usableNumber;
/** The e-mail a panel is shared with (kept whether or not an account has it, lib/panels/panels.ts). */
const shareEmail = z.email("must be an e-mail address").max(200);

const questionFields = {
  text: text(500).describe("The question as panelists read it."),
  unit: text(40).describe("Unit of the answer, e.g. 'units' or 'EUR'."),
  targetPeriod: text(60).describe("The period the estimate is for, e.g. 'first 12 months after launch'."),
  lowerBound: finite.describe("Lowest plausible answer; answers below it are refused."),
  upperBound: finite.describe("Highest plausible answer; answers above it are refused."),
  answerFormat: z.enum(ANSWER_FORMATS).describe("single value, or low / median / high read as P10 / P50 / P90"),
  aggregation: z.enum(AGGREGATIONS).describe("shared quantity (panel figure: median) or sum of parts (panel figure: total)"),
  calibration: z
    .boolean()
    .optional()
    .describe("A calibration question (Cooke's classical model, docs/methods.md §21): its true value is known to the organiser; asked as three-point with a shared quantity, the low / median / high read as P5 / P50 / P95. Default false."),
  trueValue: finite
    .nullable()
    .optional()
    .describe("Calibration questions: the true value (may also be given later, PUT …/true-value); never shown to panelists."),
};

/** What a calibration question must be (the question as it will be stored: new, or merged with its update). */
export function calibrationProblems(q: {
  readonly answerFormat: string;
  readonly aggregation: string;
  readonly calibration?: boolean;
  readonly trueValue?: number | null;
}): { field: string; message: string }[] {
  const out: { field: string; message: string }[] = [];
  if (q.calibration && (q.answerFormat !== "three-point" || q.aggregation !== "shared")) {
    out.push({ field: "calibration", message: "a calibration question is asked as three-point (5th, 50th and 95th percentiles) with a shared quantity" });
  }
  if (!q.calibration && q.trueValue !== undefined && q.trueValue !== null) {
    out.push({ field: "trueValue", message: "only a calibration question has a true value" });
  }
  return out;
}

/** A new question. The lower plausible bound must be below the upper one; a calibration question is three-point and shared. */
export const questionInput = z
  .object(questionFields)
  .refine((q) => q.lowerBound < q.upperBound, { path: ["lowerBound"], message: "lower bound must be below the upper bound" })
  .superRefine((q, ctx) => {
    for (const p of calibrationProblems(q)) ctx.addIssue({ code: "custom", path: [p.field], message: p.message });
  });
export type QuestionInput = z.infer<typeof questionInput>;

/** Changes to a question (the bound order is checked against the merged question). */
export const questionUpdate = z.object(questionFields).partial();
export type QuestionUpdate = z.infer<typeof questionUpdate>;

const ruleFields = {
  consensusMeasure: z.enum(CONSENSUS_MEASURES).describe("relative IQR (IQR / |median|) or coefficient of variation"),
  consensusThreshold: z.number().positive("must be above 0").max(10, "at most 10").describe("Consensus when the measure is at or under this."),
  stabilityThreshold: z
    .number()
    .positive("must be above 0")
    .max(1, "at most 1 (100%)")
    .describe("Stable when median and IQR change by at most this fraction between rounds."),
  roundLimit: z.number().int("must be a whole number").min(1, "at least 1").max(10, "at most 10").describe("Maximum number of rounds."),
};

/** A new panel, optionally with its questions; omitted rules take their defaults. */
export const panelCreate = z.object({
  title: text(200),
  description: z.string().trim().max(4000).default(""),
  consensusMeasure: ruleFields.consensusMeasure.optional(),
  consensusThreshold: ruleFields.consensusThreshold.optional(),
  stabilityThreshold: ruleFields.stabilityThreshold.optional(),
  roundLimit: ruleFields.roundLimit.optional(),
  questions: z.array(questionInput).max(MAX_QUESTIONS_PER_PANEL, `at most ${MAX_QUESTIONS_PER_PANEL} questions on a panel`).default([]),
});
export type PanelCreate = z.infer<typeof panelCreate>;

/** Changes to a panel's title, description or stopping rules. */
export const panelUpdate = z.object({ title: text(200), description: z.string().trim().max(4000), ...ruleFields }).partial();
export type PanelUpdate = z.infer<typeof panelUpdate>;

/** Share a panel with an e-mail, as co-organiser or reviewer; the account with that e-mail (now or later) gets the access. */
export const shareInput = z.object({ email: shareEmail, role: z.enum(USER_ROLES) });
export type ShareInput = z.infer<typeof shareInput>;

/** A person on the organiser's expert roster. */
export const rosterMemberInput = z.object({
  name: text(120),
  email: z.email("must be an e-mail address").max(200),
  group: z.string().trim().max(40).default("").describe("e.g. sales, engineering, operations"),
});
export type RosterMemberInput = z.infer<typeof rosterMemberInput>;
export const rosterMemberUpdate = z.object({ name: text(120), email: z.email("must be an e-mail address").max(200), group: z.string().trim().max(40) }).partial();
export type RosterMemberUpdate = z.infer<typeof rosterMemberUpdate>;

/** Invite roster members to a panel. */
export const invitationCreate = z.object({
  rosterMemberIds: z.array(id).min(1, "choose at least one roster member").max(200),
  expiresInDays: z.number().int().min(1).max(365).default(30).describe("Days until the links expire."),
  send: z.boolean().default(false).describe("E-mail each person their link (to the panel's outbox when no SMTP server is configured)."),
});
export type InvitationCreate = z.infer<typeof invitationCreate>;
export const invitationReissue = z.object({
  expiresInDays: z.number().int().min(1).max(365).default(30),
  send: z.boolean().default(false).describe("E-mail the person their new link (to the outbox without an SMTP server)."),
});

/** Which e-mail to send for the open round: the notice to everyone, or a reminder to those who have not answered. */
export const noticeInput = z.object({
  kind: z.enum(["round-opened", "reminder"], { error: 'must be "round-opened" or "reminder"' }),
});
export type InvitationReissue = z.infer<typeof invitationReissue>;

const deadline = z.iso
  .datetime({ offset: true, message: "must be an ISO 8601 date-time, e.g. 2026-12-31T17:00:00Z" })
  .describe("When the round closes by itself (ISO 8601).");

/** Open a draft round, optionally with a deadline. */
export const roundOpen = z.object({ deadline: deadline.optional() });
export type RoundOpen = z.infer<typeof roundOpen>;

/** Create the next round after the last one closed; `open: true` opens it at once. */
export const nextRoundInput = z.object({ deadline: deadline.optional(), open: z.boolean().default(false) });
export type NextRoundInput = z.infer<typeof nextRoundInput>;

/** The true value of a calibration question (null clears it); organisers may give it before, during or after the rounds. */
export const trueValueInput = z.object({
  trueValue: finite.nullable().describe("The true value, in the question's unit; null clears it. Never shown to panelists."),
});
export type TrueValueInput = z.infer<typeof trueValueInput>;

/** A panelist's answer to one question in the open round. */
export const answerInput = z.object({
  questionId: id,
  value: finite.describe("The single value, or the median estimate (P50) of a three-point answer."),
  low: finite.optional().describe("Three-point answers: the low value (P10; P5 on a calibration question)."),
  high: finite.optional().describe("Three-point answers: the high value (P90; P95 on a calibration question)."),
  rationale: z.string().trim().max(2000, "at most 2000 characters").default(""),
});
export type AnswerInput = z.infer<typeof answerInput>;

/** A personal API token's label and lifetime (lib/accounts/tokens.ts: default and maximum). */
export const apiTokenCreate = z.object({
  name: text(80),
  expiresInDays: z
    .number()
    .int("must be a whole number")
    .min(1, "at least 1")
    .max(API_TOKEN_MAX_DAYS, `at most ${API_TOKEN_MAX_DAYS}`)
    .optional()
    .describe(`Days until the token expires (default ${API_TOKEN_DEFAULT_DAYS}).`),
});
export type ApiTokenCreate = z.infer<typeof apiTokenCreate>;

const password = z.string().min(12, "at least 12 characters").max(200, "at most 200 characters");

/** The first organiser (only while none exists). */
export const setupInput = z.object({
  email: z.email("must be an e-mail address").max(200),
  name: text(120),
  password,
});
export type SetupInput = z.infer<typeof setupInput>;

/** A password change: the current password and the new one. */
export const passwordChange = z.object({ currentPassword: z.string().min(1, "required").max(200, "at most 200 characters"), newPassword: password });
export type PasswordChange = z.infer<typeof passwordChange>;

/** The Idempotency-Key request header. */
export const idempotencyKey = z.string().min(1).max(200).regex(/^[\x21-\x7e]+$/, "printable ASCII without spaces");

/** The message for a path's round part that is not a round number ("abc", "0", "1.5"). */
const ROUND_NUMBER = "round must be a round number such as 2";

export const params = {
  panelId: z.object({ panelId: id }),
  question: z.object({ panelId: id, questionId: id }),
  round: z.object({
    panelId: id,
    roundNumber: z.coerce
      .number({ error: ROUND_NUMBER })
      .int(ROUND_NUMBER)
      .positive(ROUND_NUMBER),
  }),
  invitation: z.object({ panelId: id, invitationId: id }),
  outboxMessage: z.object({ panelId: id, messageId: id }),
  share: z.object({ panelId: id, email: shareEmail }),
  member: z.object({ memberId: id }),
  token: z.object({ tokenId: id }),
};

/** Why the organiser reveals identities (kept in the audit log). */
export const revealInput = z.object({ reason: text(500).describe("Why the identities are needed; kept in the audit log.") });
export type RevealInput = z.infer<typeof revealInput>;
