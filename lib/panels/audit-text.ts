/**
 * The audit log in plain words: one sentence per stored event, for people. Raw action ids and
 * detail JSON stay in the JSON API (GET …/audit) for clients. Pure: no database; the caller
 * passes the panel's questions (text and unit) by id.
 *
 * Anonymity (THREATS.md): events name only accounts (organisers) and never a panelist — an
 * invitation is "an invitation", a reveal gives the count and the reason, no pseudonym or name.
 *
 * Update events store the old value beside the new one (`from`); events written before that
 * have no old value and read "set … to X".
 */
import { formatDateTime, formatExact, formatPercent } from "@/lib/ui/format";

export interface AuditEventLike {
  readonly action: string;
  readonly actorName: string | null;
  readonly detail: Record<string, unknown>;
}

export interface AuditQuestion {
  readonly text: string;
  readonly unit: string;
}

/** Action ids stored by earlier versions, read under today's names (with `actual` in the detail as `outcomeValue`). */
const EARLIER_ACTIONS: Readonly<Record<string, string>> = { "question.resolved": "outcome.recorded", "resolution.corrected": "outcome.corrected" };

/** A stored event's action and detail under today's names (events stored before a rename keep their old ones). */
export function todaysForm(action: string, detail: Record<string, unknown>): { action: string; detail: Record<string, unknown> } {
  const now = EARLIER_ACTIONS[action];
  if (now === undefined) return { action, detail };
  const { actual, ...rest } = detail;
  return { action: now, detail: actual === undefined ? rest : { ...rest, outcomeValue: actual } };
}

const QUESTION_FIELDS: Record<string, string> = {
  text: "wording",
  unit: "unit",
  targetPeriod: "target period",
  lowerBound: "lower bound",
  upperBound: "upper bound",
  answerFormat: "answer format",
  aggregation: "aggregation",
  calibration: "calibration flag",
  trueValue: "true value",
};

const PANEL_FIELDS: Record<string, string> = {
  title: "title",
  description: "description",
  consensusMeasure: "consensus measure",
  consensusThreshold: "consensus threshold",
  stabilityThreshold: "stability threshold",
  roundLimit: "round limit",
};

const WORDS: Record<string, string> = {
  single: "single value",
  "three-point": "low / median / high",
  shared: "shared quantity",
  "sum-of-parts": "sum of parts",
  cv: "coefficient of variation",
  "relative-iqr": "relative IQR",
};

/** A stored value in words: numbers in full (formatExact), text quoted, true/false as yes/no, null as "none". */
function shown(value: unknown, field?: string): string {
  if (value === null || value === undefined) return "none";
  if (typeof value === "number") return field === "stabilityThreshold" ? formatPercent(value, 0) : formatExact(value);
  if (typeof value === "boolean") return value ? "yes" : "no";
  if (typeof value === "string") return WORDS[value] ?? `'${value}'`;
  return "a new value";
}

function num(value: unknown): string {
  return typeof value === "number" ? formatExact(value) : "—";
}

/** "the title from 'A' to 'B'", or without an old value (older events) "the title to 'B'". */
function change(label: string, field: string, to: unknown, from: Record<string, unknown> | undefined): string {
  const toText = shown(to, field);
  return from && field in from ? `${label} from ${shown(from[field], field)} to ${toText}` : `${label} to ${toText}`;
}

function changes(detail: Record<string, unknown>, labels: Record<string, string>): string {
  const from = typeof detail.from === "object" && detail.from !== null ? (detail.from as Record<string, unknown>) : undefined;
  const parts = Object.keys(labels)
    .filter((f) => f in detail)
    .map((f) => change(`the ${labels[f]}`, f, detail[f], from));
  return parts.length > 0 ? parts.join("; ") : "nothing";
}

const RULES: Record<string, string> = {
  equal: "equal weights (50/50)",
  "inverse-mse": "inverse-MSE weights",
  organiser: "the organiser's weight",
  panel: "the panel's rule",
};

function rule(name: unknown, panelWeight: unknown): string {
  const words = RULES[String(name)] ?? "another rule";
  return name === "organiser" && typeof panelWeight === "number" ? `${words} of ${formatPercent(panelWeight, 0)} on the panel` : words;
}

const REASON = (d: Record<string, unknown>) => (typeof d.reason === "string" && d.reason !== "" ? ` (reason: ${d.reason})` : "");

/**
 * One event as a sentence, e.g. "Ada Fenwick changed the true value of 'Wren-1 field units'
 * from 410 to 412.". `questions` maps question ids to their text and unit; a question no longer
 * on the panel reads by the text stored in the event, or "a removed question".
 */
export function auditSentence(event: AuditEventLike, questions: ReadonlyMap<string, AuditQuestion>): string {
  const d = event.detail;
  const who = event.actorName ?? "The system";
  const q = typeof d.questionId === "string" ? questions.get(d.questionId) : undefined;
  const qText = q ? `'${q.text}'` : typeof d.text === "string" ? `'${d.text}'` : "a removed question";
  const unit = q ? ` ${q.unit}` : "";
  const round = typeof d.round === "number" ? d.round : "?";
  switch (event.action) {
    case "panel.created":
      return `${who} created the panel ${shown(d.title)}.`;
    case "panel.updated":
      return `${who} changed ${changes(d, PANEL_FIELDS)}.`;
    case "panel.deleted":
      return `${who} deleted the panel ${shown(d.title)}.`;
    case "panel.finished":
      return `${who} finished the panel.`;
    case "panel.shared":
      return `${who} shared the panel with ${String(d.email)} as ${d.role === "organiser" ? "co-organiser" : "reviewer"}.`;
    case "panel.unshared":
      return `${who} stopped sharing the panel with ${String(d.email)}.`;
    case "panel.blend-rule": {
      const leg = d.panelLeg === "performance" ? "; panel leg of three-point questions: performance weights" : d.panelLeg === "equal" ? "; panel leg of three-point questions: equal weights" : "";
      return "fromRule" in d
        ? `${who} changed the blend rule from ${rule(d.fromRule, d.fromPanelWeight)} to ${rule(d.rule, d.panelWeight)}${leg}.`
        : `${who} set the blend rule to ${rule(d.rule, d.panelWeight)}${leg}.`;
    }
    case "question.blend-rule": {
      if ("fromRule" in d) return `${who} changed the blend rule of ${qText} from ${rule(d.fromRule, d.fromPanelWeight)} to ${rule(d.rule, d.panelWeight)}.`;
      return d.rule === "panel" ? `${who} set the blend rule of ${qText} back to the panel's rule.` : `${who} set the blend rule of ${qText} to ${rule(d.rule, d.panelWeight)}.`;
    }
    case "question.created":
      return `${who} added the question ${qText}.`;
    case "question.updated":
      return `${who} changed the question ${qText}: ${changes(d, QUESTION_FIELDS)}.`;
    case "question.deleted":
      return `${who} deleted the question ${qText}.`;
    case "question.true-value": {
      const had = "from" in d && d.from !== null && d.from !== undefined;
      if (d.trueValue === null) return `${who} cleared the true value of ${qText}${had ? ` (was ${num(d.from)})` : ""}.`;
      return had ? `${who} changed the true value of ${qText} from ${num(d.from)} to ${num(d.trueValue)}.` : `${who} set the true value of ${qText} to ${num(d.trueValue)}.`;
    }
    case "outcome.recorded":
      return `${who} recorded the outcome of ${qText}: ${num(d.outcomeValue)}${unit}.`;
    case "outcome.corrected":
      return `${who} corrected the outcome of ${qText} from ${num(d.from)} to ${num(d.to)}${unit}${REASON(d)}.`;
    case "baseline.attached":
      return `${who} attached a baseline forecast to ${qText}.`;
    case "baseline.replaced":
      return `${who} replaced the baseline forecast of ${qText}.`;
    case "baseline.removed":
      return `${who} removed the baseline forecast of ${qText}.`;
    case "round.created":
      return `${who} prepared round ${round} (not yet open).`;
    case "round.opened":
      return `${who} opened round ${round}${typeof d.deadline === "string" ? `, closing ${formatDateTime(d.deadline)}` : ""}.`;
    case "round.closed":
      return d.by === "deadline" ? `Round ${round} closed at its deadline.` : `${who} closed round ${round}.`;
    case "identities.revealed":
      return `${who} revealed the names behind ${typeof d.count === "number" ? d.count : "the"} pseudonym${d.count === 1 ? "" : "s"}${REASON(d)}.`;
    case "invitation.created":
      return `${who} invited ${typeof d.count === "number" ? d.count : "some"} panelist${d.count === 1 ? "" : "s"}.`;
    case "invitation.revoked":
      return `${who} withdrew an invitation.`;
    case "invitation.reissued":
      return `${who} sent a new link for an invitation.`;
    case "messages.round-opened":
    case "messages.reminder": {
      const what = event.action === "messages.reminder" ? "a reminder" : "the round-opened message";
      return `${who} sent ${what} for round ${num(d.roundNumber)} to ${num(d.recipients)} panelist${d.recipients === 1 ? "" : "s"} (${num(d.sent)} sent, ${num(d.outbox)} in the outbox, ${num(d.failed)} failed).`;
    }
    default:
      return `${who} made a change to the panel.`;
  }
}
