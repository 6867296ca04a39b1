/**
 * E-mail to panelists: invitations (with the private link, sent when the invitation is created
 * or re-issued, the only times the token exists in clear), the notice that a round is open (to
 * every panelist with a working link) and reminders (only to those who have not answered every
 * question of the open round). Texts: lib/mail/messages.ts; sending: lib/mail/smtp.ts.
 *
 * Without an SMTP server every invitation and notice goes to the panel's outbox (table
 * "OutboxMessage"), where the organiser copies or downloads it; a message the server refuses
 * goes there too. Reminders are never kept in the outbox: it would show the organiser whom
 * they are for, that is who has not answered, which with the live progress by pseudonym could
 * tie a name to a pseudonym. So reminders need SMTP, and the organiser learns only how many went.
 */
import { db } from "@/lib/db";
import { ConflictError, NotFoundError } from "@/lib/errors";
import type { Actor } from "@/lib/accounts/actor";
import { invitationMessage, reminderMessage, roundOpenedMessage, type Message, type Recipient } from "@/lib/mail/messages";
import { sendMail, smtpConfigured } from "@/lib/mail/smtp";
import { authorisePanel } from "./access";
import { recordAudit } from "./audit";

export type NoticeKind = "round-opened" | "reminder";
export type Delivery = "sent" | "outbox" | "failed";

export interface DeliveryReport {
  readonly kind: NoticeKind;
  readonly roundNumber: number;
  /** People written to. */
  readonly recipients: number;
  /** Accepted by the SMTP server. */
  readonly sent: number;
  /** Kept in the outbox (no SMTP server, or refused by it). */
  readonly outbox: number;
  /** Reminders the SMTP server refused (not kept, see the module comment). */
  readonly failed: number;
}

export interface OutboxMessageView {
  readonly id: string;
  readonly kind: string;
  readonly to: string;
  readonly subject: string;
  readonly body: string;
  readonly reason: string;
  readonly createdAt: string;
}

const NO_SMTP = "no SMTP server is configured (SMTP_URL)";

/** Sends each message, or keeps it in the outbox (reminders excepted); the delivery of each, in order. */
export async function deliver(panelId: string, messages: readonly Message[]): Promise<Delivery[]> {
  const out: Delivery[] = [];
  for (const m of messages) {
    const problem = smtpConfigured() ? await sendMail(m) : NO_SMTP;
    if (problem === null) out.push("sent");
    else if (m.kind === "reminder") out.push("failed");
    else {
      await db.outboxMessage.create({ data: { panelId, kind: m.kind, to: m.to, subject: m.subject, body: m.text, reason: problem } });
      out.push("outbox");
    }
  }
  return out;
}

/**
 * E-mails each newly issued invitation its private link. Called by the invitation service right
 * after the tokens exist. @param site the site's address, e.g. https://triangulate.example
 */
export async function mailInvitations(
  panelId: string,
  panelTitle: string,
  site: string,
  issued: readonly (Recipient & { link: string; expiresAt: string })[],
): Promise<Delivery[]> {
  return deliver(panelId, issued.map((i) => invitationMessage(i, panelTitle, `${site}${i.link}`, i.expiresAt)));
}

/**
 * Sends the round-opened notice (every panelist whose link works) or a reminder (those among
 * them who have not answered every question) for the open round.
 * @throws ConflictError round-not-open when no round is open; smtp-required for a reminder
 *   without an SMTP server
 */
export async function sendNotices(actor: Actor, panelId: string, input: { kind: NoticeKind }): Promise<DeliveryReport> {
  const access = await authorisePanel(actor, panelId, "manage");
  const round = await db.round.findFirst({ where: { panelId, status: "open" } });
  if (!round) throw new ConflictError("round-not-open", "No round is open.");
  if (input.kind === "reminder" && !smtpConfigured()) {
    throw new ConflictError("smtp-required", "Reminders need an SMTP server (SMTP_URL): in the outbox you would see who has not answered. Send the round-opened notice to everyone instead.");
  }
  const now = new Date();
  const [invitations, questionCount] = await Promise.all([
    db.invitation.findMany({ where: { panelId, revokedAt: null, expiresAt: { gt: now } }, include: { rosterMember: true }, orderBy: { createdAt: "asc" } }),
    db.question.count({ where: { panelId } }),
  ]);
  let people = invitations;
  if (input.kind === "reminder") {
    const answered = await db.answer.groupBy({ by: ["invitationId", "questionId"], where: { roundId: round.id } });
    const count = new Map<string, number>();
    for (const a of answered) count.set(a.invitationId, (count.get(a.invitationId) ?? 0) + 1);
    people = invitations.filter((i) => (count.get(i.id) ?? 0) < questionCount);
  }
  const title = access.panel.title;
  const compose = input.kind === "reminder" ? reminderMessage : roundOpenedMessage;
  const deliveries = await deliver(panelId, people.map((i) => compose(i.rosterMember, title, round.number, round.deadline)));
  const report: DeliveryReport = {
    kind: input.kind,
    roundNumber: round.number,
    recipients: people.length,
    sent: deliveries.filter((d) => d === "sent").length,
    outbox: deliveries.filter((d) => d === "outbox").length,
    failed: deliveries.filter((d) => d === "failed").length,
  };
  await db.$transaction((tx) => recordAudit(tx, { actorId: access.actor.userId, panelId, action: `messages.${input.kind}`, detail: { ...report } }));
  return report;
}

/** The panel's outbox, newest first (organisers of the panel). */
export async function listOutbox(actor: Actor, panelId: string): Promise<OutboxMessageView[]> {
  await authorisePanel(actor, panelId, "manage");
  const rows = await db.outboxMessage.findMany({ where: { panelId }, orderBy: [{ createdAt: "desc" }, { id: "asc" }] });
  return rows.map((r) => ({ id: r.id, kind: r.kind, to: r.to, subject: r.subject, body: r.body, reason: r.reason, createdAt: r.createdAt.toISOString() }));
}

/** Deletes a message from the outbox once the organiser has sent it (it may hold a private link). */
export async function deleteOutboxMessage(actor: Actor, panelId: string, messageId: string): Promise<{ id: string; deleted: true }> {
  await authorisePanel(actor, panelId, "manage");
  const { count } = await db.outboxMessage.deleteMany({ where: { id: messageId, panelId } });
  if (count === 0) throw new NotFoundError("The message");
  return { id: messageId, deleted: true };
}
