/**
 * Every hand-written SQL statement of the app, one typed function each, for the few statements
 * every panelist request runs (the invitation lookup, the answer insert, the rate-limit
 * counters): they skip Prisma's per-call query compilation, which was most of an answer's cost
 * (bench/load.ts). Everything else goes through the Prisma client (lib/db.ts).
 *
 * Statements use `?` placeholders and double-quoted names, which both databases read alike
 * (lib/sql-text.ts); a dialect-only clause sits behind `run.dialect`. Each function converts
 * what the driver returns (integers as bigint on SQLite; timestamps as text on SQLite, Dates on
 * PostgreSQL) into its row type, and takes timestamps as Dates. tests/db/statements.test.ts runs
 * each on SQLite and PostgreSQL.
 */
import type BetterSqlite3 from "better-sqlite3";
import { createHash } from "node:crypto";
import pg from "pg";
import { numberedPlaceholders, parsePostgresTimestamp, timestampParam } from "./sql-text";

export type Dialect = "sqlite" | "postgresql";

/** Runs one statement on a connection and returns its rows (none for a statement without RETURNING). */
export interface SqlRunner {
  readonly dialect: Dialect;
  rows<T>(text: string, params: readonly unknown[]): Promise<T[]>;
}

const param = (dialect: Dialect) => (p: unknown) => (p instanceof Date ? timestampParam(dialect, p) : p);

/**
 * Statements on a SQLite connection, each prepared once per connection and kept. `open` gives
 * the connection when the statement may run (lib/db.ts: Prisma's own, outside any open
 * interactive transaction).
 */
export function sqliteRunner(open: () => Promise<BetterSqlite3.Database>): SqlRunner {
  const prepared = new WeakMap<BetterSqlite3.Database, Map<string, BetterSqlite3.Statement>>();
  return {
    dialect: "sqlite",
    async rows<T>(text: string, params: readonly unknown[]) {
      const conn = await open();
      let statements = prepared.get(conn);
      if (!statements) prepared.set(conn, (statements = new Map()));
      let stmt = statements.get(text);
      if (!stmt) statements.set(text, (stmt = conn.prepare(text)));
      const args = params.map(param("sqlite"));
      if (stmt.reader) return stmt.all(...args) as T[];
      stmt.run(...args);
      return [];
    },
  };
}

/** PostgreSQL `timestamp` (OID 1114) as UTC, the way Prisma writes it; other types as node-postgres parses them. */
const postgresTypes = {
  getTypeParser: ((oid: number, format?: "text" | "binary") =>
    oid === 1114 ? parsePostgresTimestamp : pg.types.getTypeParser(oid, format)) as typeof pg.types.getTypeParser,
};

/** Statements on a connection of `pool`, each as a named prepared statement (prepared once per connection). */
export function postgresRunner(pool: pg.Pool): SqlRunner {
  const named = new Map<string, { name: string; text: string }>();
  return {
    dialect: "postgresql",
    async rows<T>(text: string, params: readonly unknown[]) {
      let stmt = named.get(text);
      if (!stmt) named.set(text, (stmt = { name: `q${createHash("sha1").update(text).digest("hex").slice(0, 16)}`, text: numberedPlaceholders(text) }));
      return (await pool.query({ ...stmt, values: params.map(param("postgresql")), types: postgresTypes })).rows as T[];
    },
  };
}

const time = (v: Date | string): Date => new Date(v);
const timeOrNull = (v: Date | string | null): Date | null => (v === null ? null : new Date(v));

export interface InvitationRow {
  id: string;
  panelId: string;
  pseudonym: string;
  tokenHash: string;
  expiresAt: Date;
  revokedAt: Date | null;
  lastSeenAt: Date | null;
}

/** What an answer is checked against: the panel's status, the question (if it is the panel's) and the open round (if any). */
export interface AnswerTarget {
  panelStatus: string;
  question: { id: string; answerFormat: string; calibration: boolean; lowerBound: number; upperBound: number; unit: string } | null;
  round: { id: string; number: number; deadline: Date | null } | null;
}

export interface NewAnswerVersion {
  id: string;
  roundId: string;
  questionId: string;
  invitationId: string;
  value: number;
  low: number | null;
  high: number | null;
  rationale: string;
  idempotencyKey: string | null;
  /** Stored as createdAt; the round must be open and its deadline (if any) later than this. */
  at: Date;
}

export interface RateLimitWindowRow {
  windowStart: Date;
  count: number;
}

type Time = Date | string;
type Int = number | bigint;

/** The typed statements on `run`'s connection. */
export function statementsOn(run: SqlRunner) {
  return {
    /** The invitation whose token hash is `tokenHash` (unique), if any. */
    async invitationByTokenHash(tokenHash: string): Promise<InvitationRow | undefined> {
      const [r] = await run.rows<{ id: string; panelId: string; pseudonym: string; tokenHash: string; expiresAt: Time; revokedAt: Time | null; lastSeenAt: Time | null }>(
        `SELECT "id", "panelId", "pseudonym", "tokenHash", "expiresAt", "revokedAt", "lastSeenAt" FROM "Invitation" WHERE "tokenHash" = ?`,
        [tokenHash],
      );
      return r && { ...r, expiresAt: time(r.expiresAt), revokedAt: timeOrNull(r.revokedAt), lastSeenAt: timeOrNull(r.lastSeenAt) };
    },

    /** Sets the invitation's lastSeenAt. */
    async touchInvitation(id: string, at: Date): Promise<void> {
      await run.rows(`UPDATE "Invitation" SET "lastSeenAt" = ? WHERE "id" = ?`, [at, id]);
    },

    /** One statement for the panel's status, the question and the open round (a panel has at most one); undefined when the panel is gone. */
    async answerTarget(panelId: string, questionId: string): Promise<AnswerTarget | undefined> {
      const [r] = await run.rows<{
        panelStatus: string;
        questionId: string | null;
        answerFormat: string;
        calibration: boolean | Int;
        lowerBound: number;
        upperBound: number;
        unit: string;
        roundId: string | null;
        roundNumber: Int | null;
        deadline: Time | null;
      }>(
        `SELECT p."status" AS "panelStatus", q."id" AS "questionId", q."answerFormat", q."calibration", q."lowerBound", q."upperBound", q."unit",
                r."id" AS "roundId", r."number" AS "roundNumber", r."deadline"
         FROM "Panel" p
         LEFT JOIN "Question" q ON q."panelId" = p."id" AND q."id" = ?
         LEFT JOIN "Round" r ON r."panelId" = p."id" AND r."status" = 'open'
         WHERE p."id" = ?
         LIMIT 1`,
        [questionId, panelId],
      );
      if (!r) return undefined;
      return {
        panelStatus: r.panelStatus,
        question:
          r.questionId === null
            ? null
            : { id: r.questionId, answerFormat: r.answerFormat, calibration: Boolean(r.calibration), lowerBound: Number(r.lowerBound), upperBound: Number(r.upperBound), unit: r.unit },
        round: r.roundId === null ? null : { id: r.roundId, number: Number(r.roundNumber), deadline: timeOrNull(r.deadline) },
      };
    },

    /**
     * One atomic INSERT … SELECT: the row is written only if the round is still open and before
     * its deadline, with version = 1 + the highest stored version of this answer, and not at all
     * if the idempotency key was used already (ON CONFLICT DO NOTHING). On PostgreSQL it locks
     * the round row (FOR SHARE), so a close waits for it (lib/panels/answers.ts explains).
     * Returns the version written, or null when nothing was written.
     */
    async insertAnswerVersion(a: NewAnswerVersion): Promise<number | null> {
      const rows = await run.rows<{ version: Int }>(
        `INSERT INTO "Answer" ("id", "roundId", "questionId", "invitationId", "version", "value", "low", "high", "rationale", "idempotencyKey", "createdAt")
         SELECT ?, r."id", ?, ?,
                COALESCE((SELECT MAX(a."version") FROM "Answer" a WHERE a."roundId" = r."id" AND a."questionId" = ? AND a."invitationId" = ?), 0) + 1,
                ?, ?, ?, ?, ?, ?
         FROM "Round" r
         WHERE r."id" = ? AND r."status" = 'open' AND (r."deadline" IS NULL OR r."deadline" > ?)
         ${run.dialect === "postgresql" ? "FOR SHARE OF r" : ""}
         ON CONFLICT DO NOTHING
         RETURNING "version"`,
        [a.id, a.questionId, a.invitationId, a.questionId, a.invitationId, a.value, a.low, a.high, a.rationale, a.idempotencyKey, a.at, a.roundId, a.at],
      );
      return rows.length === 1 ? Number(rows[0].version) : null;
    },

    /** The rate-limit window of `key`, if any. */
    async rateLimitWindow(key: string): Promise<RateLimitWindowRow | undefined> {
      const [w] = await run.rows<{ windowStart: Time; count: Int }>(`SELECT "windowStart", "count" FROM "RateLimitWindow" WHERE "key" = ?`, [key]);
      return w && { windowStart: time(w.windowStart), count: Number(w.count) };
    },

    /**
     * Counts one hit of `key` at `at` in one statement: a new key, or a window that started at or
     * before `expiredAt`, starts a window at `at` with count 1; otherwise the count goes up by one
     * (SET expressions read the row as it was before the update). Returns the window after the hit.
     */
    async countRateLimitHit(key: string, at: Date, expiredAt: Date): Promise<RateLimitWindowRow> {
      const [w] = await run.rows<{ windowStart: Time; count: Int }>(
        `INSERT INTO "RateLimitWindow" ("key", "windowStart", "count") VALUES (?, ?, 1)
         ON CONFLICT ("key") DO UPDATE SET
           "count" = CASE WHEN "RateLimitWindow"."windowStart" <= ? THEN 1 ELSE "RateLimitWindow"."count" + 1 END,
           "windowStart" = CASE WHEN "RateLimitWindow"."windowStart" <= ? THEN ? ELSE "RateLimitWindow"."windowStart" END
         RETURNING "windowStart", "count"`,
        [key, at, expiredAt, expiredAt, at],
      );
      return { windowStart: time(w.windowStart), count: Number(w.count) };
    },
  };
}

export type Statements = ReturnType<typeof statementsOn>;
