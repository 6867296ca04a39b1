/**
 * The hand-written statements (lib/db-statements.ts) on a fresh, migrated SQLite database and,
 * when TRIANGULATE_TEST_POSTGRES_URL names a PostgreSQL role that may create databases, on a
 * fresh PostgreSQL database: each through the connection the app builds (connectDatabase in
 * lib/db.ts), with the fixtures written and the results read back through the Prisma client of
 * the same connection. So each expected value is what Prisma itself stored or reads, and the
 * statements' rules (versions 1, 2, …; a used idempotency key or a closed round writes nothing;
 * a window that started at or before the expiry restarts at 1) are those the statements state.
 */
import { mkdtempSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { freshDatabase } from "../harness/sql";
import { migratePostgres } from "../../lib/cli/migrate";
import { migratedSqliteDatabase } from "../helpers/migrated-sqlite";
import type { Database } from "../../lib/db";

const PG = process.env.TRIANGULATE_TEST_POSTGRES_URL;
const cleanups: (() => Promise<void>)[] = [];
afterAll(async () => {
  for (const c of cleanups.reverse()) await c();
});

/** A connection the way the app makes one, to a new migrated database of the given kind. */
async function open(kind: "sqlite" | "postgresql"): Promise<Database> {
  // Sets DATABASE_URL to a fresh SQLite file, so importing lib/db opens nothing else.
  const file = migratedSqliteDatabase();
  const { connectDatabase } = await import("../../lib/db");
  if (kind === "sqlite") {
    const conn = connectDatabase(`file:${file}`);
    cleanups.push(() => conn.prisma.$disconnect());
    return conn;
  }
  const target = await freshDatabase(PG!, `statements_${process.pid}`, mkdtempSync(path.join(os.tmpdir(), "triangulate-statements-")));
  cleanups.push(target.drop);
  await migratePostgres(target.url);
  const conn = connectDatabase(target.url);
  cleanups.push(() => conn.prisma.$disconnect());
  return conn;
}

const kinds: ("sqlite" | "postgresql")[] = PG ? ["sqlite", "postgresql"] : ["sqlite"];

describe.each(kinds)("hand-written statements on %s", (kind) => {
  let conn: Database;
  let ids: { panelId: string; questionId: string; roundId: string; invitationId: string };
  const deadline = new Date("2031-05-06T07:08:09.123Z");
  const expiresAt = new Date("2031-06-01T00:00:00.456Z");

  beforeAll(async () => {
    conn = await open(kind);
    const { prisma } = conn;
    const owner = await prisma.user.create({ data: { email: "organiser@quillmoor.example", name: "Organiser", passwordHash: "x" } });
    const panel = await prisma.panel.create({
      data: { ownerId: owner.id, title: "Wren-2 sensor demand", status: "running", consensusThreshold: 0.25, stabilityThreshold: 0.15, roundLimit: 3 },
    });
    const question = await prisma.question.create({
      data: { panelId: panel.id, position: 1, text: "Wren-2 units shipped in 2031", unit: "units", targetPeriod: "2031", lowerBound: 0, upperBound: 50000.5, answerFormat: "three-point", aggregation: "shared", calibration: true },
    });
    const round = await prisma.round.create({ data: { panelId: panel.id, number: 1, status: "open", deadline, openedAt: new Date() } });
    const member = await prisma.rosterMember.create({ data: { ownerId: owner.id, name: "Panelist", email: "panelist@quillmoor.example" } });
    const invitation = await prisma.invitation.create({ data: { panelId: panel.id, rosterMemberId: member.id, pseudonym: "P-01", tokenHash: "hash-1", expiresAt } });
    ids = { panelId: panel.id, questionId: question.id, roundId: round.id, invitationId: invitation.id };
  }, 60_000);

  it("invitationByTokenHash reads the invitation as Prisma stored it; touchInvitation sets lastSeenAt", async () => {
    expect(await conn.statements.invitationByTokenHash("hash-1")).toEqual({
      id: ids.invitationId,
      panelId: ids.panelId,
      pseudonym: "P-01",
      tokenHash: "hash-1",
      expiresAt,
      revokedAt: null,
      lastSeenAt: null,
    });
    expect(await conn.statements.invitationByTokenHash("no-such-hash")).toBeUndefined();
    const seen = new Date("2030-01-02T03:04:05.678Z");
    await conn.statements.touchInvitation(ids.invitationId, seen);
    expect((await conn.prisma.invitation.findUniqueOrThrow({ where: { id: ids.invitationId } })).lastSeenAt).toEqual(seen);
    expect((await conn.statements.invitationByTokenHash("hash-1"))?.lastSeenAt).toEqual(seen);
  });

  it("answerTarget gives the panel's status, its question and its open round", async () => {
    expect(await conn.statements.answerTarget(ids.panelId, ids.questionId)).toEqual({
      panelStatus: "running",
      question: { id: ids.questionId, answerFormat: "three-point", calibration: true, lowerBound: 0, upperBound: 50000.5, unit: "units" },
      round: { id: ids.roundId, number: 1, deadline },
    });
    expect((await conn.statements.answerTarget(ids.panelId, "another-panels-question"))?.question).toBeNull();
    expect(await conn.statements.answerTarget("no-such-panel", ids.questionId)).toBeUndefined();
  });

  it("insertAnswerVersion writes versions 1, 2, … before the deadline, nothing for a used key or after the deadline", async () => {
    const at = new Date("2030-02-03T04:05:06.789Z");
    const answer = (id: string, key: string | null, when = at) => ({
      id,
      roundId: ids.roundId,
      questionId: ids.questionId,
      invitationId: ids.invitationId,
      value: 1200.25,
      low: 900,
      high: null,
      rationale: "from the 2030 orders",
      idempotencyKey: key,
      at: when,
    });
    expect(await conn.statements.insertAnswerVersion(answer("a1", "key-1"))).toBe(1);
    expect(await conn.statements.insertAnswerVersion(answer("a2", null))).toBe(2);
    expect(await conn.statements.insertAnswerVersion(answer("a3", "key-1"))).toBeNull();
    // The deadline itself is too late (`deadline > at`).
    expect(await conn.statements.insertAnswerVersion(answer("a4", null, deadline))).toBeNull();
    const stored = await conn.prisma.answer.findMany({ where: { invitationId: ids.invitationId }, orderBy: { version: "asc" } });
    expect(stored.map((a) => [a.id, a.version, a.value, a.low, a.high, a.rationale, a.idempotencyKey, a.createdAt])).toEqual([
      ["a1", 1, 1200.25, 900, null, "from the 2030 orders", "key-1", at],
      ["a2", 2, 1200.25, 900, null, "from the 2030 orders", null, at],
    ]);
  });

  it("insertAnswerVersion writes nothing once the round is closed, and answerTarget then finds no open round", async () => {
    const round2 = await conn.prisma.round.create({ data: { panelId: ids.panelId, number: 2, status: "closed" } });
    const at = new Date("2030-03-01T00:00:00.000Z");
    const a = { id: "b1", roundId: round2.id, questionId: ids.questionId, invitationId: ids.invitationId, value: 1, low: null, high: null, rationale: "", idempotencyKey: null, at };
    expect(await conn.statements.insertAnswerVersion(a)).toBeNull();
    await conn.prisma.round.update({ where: { id: ids.roundId }, data: { status: "closed", closedAt: at } });
    expect((await conn.statements.answerTarget(ids.panelId, ids.questionId))?.round).toBeNull();
  });

  it("countRateLimitHit counts hits in a window and restarts one that started at or before the expiry; rateLimitWindow reads it", async () => {
    const t0 = new Date("2030-04-05T06:07:08.009Z");
    const later = (ms: number) => new Date(t0.getTime() + ms);
    // A window written by Prisma, so the statements compare against Prisma's timestamp format.
    await conn.prisma.rateLimitWindow.create({ data: { key: "k", windowStart: t0, count: 1 } });
    expect(await conn.statements.countRateLimitHit("k", later(1000), later(-1))).toEqual({ windowStart: t0, count: 2 });
    expect(await conn.statements.countRateLimitHit("k", later(2000), t0)).toEqual({ windowStart: later(2000), count: 1 });
    expect(await conn.statements.countRateLimitHit("new-key", t0, later(-60_000))).toEqual({ windowStart: t0, count: 1 });
    expect(await conn.statements.rateLimitWindow("k")).toEqual({ windowStart: later(2000), count: 1 });
    expect(await conn.prisma.rateLimitWindow.findUnique({ where: { key: "k" } })).toEqual({ key: "k", windowStart: later(2000), count: 1 });
    expect(await conn.statements.rateLimitWindow("no-such-key")).toBeUndefined();
  });
});
