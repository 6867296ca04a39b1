/**
 * The audit log (AuditEvent): opening and closing rounds, editing questions, revealing
 * identities, invitations, sharing. Append-only; written in the same transaction as the
 * action it records.
 */
import type { Prisma } from "@/lib/generated/prisma/client";
import { db } from "@/lib/db";
import type { Actor } from "@/lib/accounts/actor";
import { authorisePanel } from "./access";
import { auditSentence, todaysForm } from "./audit-text";

type Tx = Prisma.TransactionClient;

/** Appends one audit event. `actorId` null means the system (a deadline closing a round). */
export async function recordAudit(
  tx: Tx,
  event: { actorId: string | null; panelId: string | null; action: string; detail?: Record<string, unknown> },
): Promise<void> {
  await tx.auditEvent.create({
    data: { actorId: event.actorId, panelId: event.panelId, action: event.action, detail: JSON.stringify(event.detail ?? {}) },
  });
}

export interface AuditEventView {
  readonly id: string;
  readonly action: string;
  readonly actorName: string | null;
  readonly detail: Record<string, unknown>;
  readonly createdAt: string;
  /** The event in plain words for people (lib/panels/audit-text.ts). */
  readonly sentence: string;
}

/** A panel's audit log, newest first (organisers of the panel only). */
export async function listAuditEvents(actor: Actor, panelId: string): Promise<AuditEventView[]> {
  await authorisePanel(actor, panelId, "manage");
  const [rows, questions] = await Promise.all([
    db.auditEvent.findMany({
      where: { panelId },
      orderBy: { createdAt: "desc" },
      include: { actor: { select: { name: true } } },
    }),
    db.question.findMany({ where: { panelId }, select: { id: true, text: true, unit: true } }),
  ]);
  const byId = new Map(questions.map((q) => [q.id, q]));
  return rows.map((r) => {
    const event = { ...todaysForm(r.action, JSON.parse(r.detail) as Record<string, unknown>), actorName: r.actor?.name ?? null };
    return { id: r.id, ...event, createdAt: r.createdAt.toISOString(), sentence: auditSentence(event, byId) };
  });
}
