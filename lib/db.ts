import { PrismaBetterSQLite3 } from "@prisma/adapter-better-sqlite3";
import { PrismaPg } from "@prisma/adapter-pg";
import { PrismaClient } from "./generated/prisma/client";
import { PrismaClient as PostgresPrismaClient } from "./generated/prisma-pg/client";
import type { SqlDriverAdapter, Transaction } from "@prisma/driver-adapter-utils";
import type BetterSqlite3 from "better-sqlite3";
import { createHash } from "node:crypto";
import pg from "pg";
import { ensureDatabaseFile, isPostgresUrl } from "./env-db";
import { env } from "./env";
import { numberedPlaceholders, parsePostgresTimestamp, timestampParam } from "./sql-text";

/**
 * The one Prisma client of the process and what hangs on its connection: the SQLite connection
 * with its prepared statements and the open-transaction gate, or the PostgreSQL pool. Kept on
 * globalThis, so that the dev server's module reloads reuse them.
 */
interface Connection {
  prisma?: PrismaClient;
  sqlite?: { adapter: SqlDriverAdapter & { client: BetterSqlite3.Database }; statements: Map<string, BetterSqlite3.Statement> };
  /** Settles when the interactive transaction open on the SQLite connection ends; null when none is open. */
  openTransaction: Promise<void> | null;
  postgresPool?: pg.Pool;
  /** Statement text → its PostgreSQL form: a prepared-statement name and `$n` placeholders. */
  postgresStatements: Map<string, { name: string; text: string }>;
}
const shared: Connection = ((globalThis as unknown as { triangulateDb?: Connection }).triangulateDb ??= { openTransaction: null, postgresStatements: new Map() });

/** Which database this process talks to: DATABASE_URL naming PostgreSQL, else the SQLite file. */
export const dialect: "sqlite" | "postgresql" = isPostgresUrl(process.env.DATABASE_URL) ? "postgresql" : "sqlite";

/** A timestamp as a parameter of {@link sqlRows} on this process's database (lib/sql-text.ts). */
export function sqlTime(d: Date): string {
  return timestampParam(dialect, d);
}

/**
 * Connection settings, run once on the connection when Prisma opens it:
 * - `journal_mode = WAL`: readers do not block the writer; a commit is one append to the
 *   write-ahead log. (Persistent in the file; set again harmlessly.)
 * - `synchronous = NORMAL` (default) or `FULL` (TRIANGULATE_SQLITE_SYNCHRONOUS, lib/env.ts).
 *   Under WAL, a commit with NORMAL has written the transaction to the log file with write(2)
 *   before it returns, so it sits in the OS page cache and survives the app process being killed
 *   (SIGKILL, out-of-memory, a crash): every acknowledged answer is kept (tests/app/fault.test.ts).
 *   What NORMAL does not fsync at each commit is lost only when the whole machine stops (power
 *   cut, kernel crash): then the last commits since the last checkpoint may be missing, but the
 *   database stays consistent. FULL fsyncs the log at every commit and keeps those too, at the
 *   price of one fsync per write (3.5 ms on the development machine, during which the single
 *   connection blocks: it caps writes near 280/s). better-sqlite3 is compiled with
 *   SQLITE_DEFAULT_WAL_SYNCHRONOUS=1 (NORMAL), so the setting is stated explicitly either way.
 * - `busy_timeout = 5000`: another process (the backup command, the admin CLI) holding the write
 *   lock makes a writer wait up to 5 s instead of failing at once with SQLITE_BUSY.
 * - `foreign_keys = ON`: better-sqlite3's default, stated so it does not depend on the build.
 */
export function connectionPragmas(): string[] {
  return ["journal_mode = WAL", `synchronous = ${env().TRIANGULATE_SQLITE_SYNCHRONOUS}`, "busy_timeout = 5000", "foreign_keys = ON"];
}

/**
 * The client for DATABASE_URL. PostgreSQL goes through a connection pool (node-postgres) of
 * TRIANGULATE_PG_POOL connections (default 10) per app instance. Both generated clients come
 * from the same models (scripts/postgres-schema.mjs), so the PostgreSQL one is used under the
 * SQLite one's type.
 */
function createClient(): PrismaClient {
  const { DATABASE_URL, TRIANGULATE_PG_POOL } = env();
  if (dialect === "postgresql") {
    shared.postgresPool = new pg.Pool({ connectionString: DATABASE_URL, max: TRIANGULATE_PG_POOL });
    // disposeExternalPool: $disconnect (the CLI commands end with it) also closes the pool.
    return new PostgresPrismaClient({ adapter: new PrismaPg(shared.postgresPool, { disposeExternalPool: true }) }) as unknown as PrismaClient;
  }
  const factory = new PrismaBetterSQLite3({ url: `file:${ensureDatabaseFile()}`, timeout: 5000 });
  const connect = factory.connect.bind(factory);
  factory.connect = async () => {
    const adapter = await connect();
    await adapter.executeScript(connectionPragmas().map((p) => `PRAGMA ${p};`).join("\n"));
    shared.sqlite = { adapter: adapter as SqlDriverAdapter & { client: BetterSqlite3.Database }, statements: new Map() };
    holdOutsideStatements(adapter);
    return adapter;
  };
  return new PrismaClient({ adapter: factory });
}

/** PostgreSQL `timestamp` (OID 1114) as UTC, the way Prisma writes it; other types as node-postgres parses them. */
const postgresTypes = {
  getTypeParser: ((oid: number, format?: "text" | "binary") =>
    oid === 1114 ? parsePostgresTimestamp : pg.types.getTypeParser(oid, format)) as typeof pg.types.getTypeParser,
};

async function outsideTransactions(): Promise<void> {
  while (shared.openTransaction) await shared.openTransaction;
}

/**
 * SQLite has one connection per process, so an interactive transaction (BEGIN … COMMIT across
 * awaits) spans every statement that runs on it meanwhile. Prisma's adapter serialises
 * transactions among themselves, not the statements of other requests: one of them, say an
 * acknowledged answer, would become part of the open transaction and vanish if it rolled back.
 * So statements from outside wait until the open transaction has ended
 * (tests/db/sqlite-connection.test.ts). A transaction's own statements go through its own object
 * and are not held.
 */
function holdOutsideStatements(adapter: SqlDriverAdapter): void {
  for (const method of ["queryRaw", "executeRaw"] as const) {
    const run = adapter[method].bind(adapter) as (q: never) => Promise<never>;
    (adapter as unknown as Record<string, unknown>)[method] = async (query: never) => {
      await outsideTransactions();
      return run(query);
    };
  }
  const start = adapter.startTransaction.bind(adapter);
  adapter.startTransaction = async (isolationLevel) => {
    const tx: Transaction = await start(isolationLevel);
    let ended!: () => void;
    shared.openTransaction = new Promise((resolve) => (ended = resolve));
    const finish = () => {
      shared.openTransaction = null;
      ended();
    };
    for (const method of ["commit", "rollback"] as const) {
      const end = tx[method].bind(tx);
      tx[method] = async () => {
        try {
          return await end();
        } finally {
          finish();
        }
      };
    }
    return tx;
  };
}

/**
 * Runs one statement (`?` placeholders, double-quoted names; lib/sql-text.ts) and returns its
 * rows. On SQLite it runs directly on Prisma's own connection, with the statement prepared once
 * and kept, outside any open transaction; on PostgreSQL, on a connection of Prisma's own pool as
 * a named prepared statement: no query compilation, no per-call preparation. This
 * is for the few statements every panelist request runs (bench/load.ts profiles them); the rest
 * of the app uses the Prisma client. Integers come back as bigint on SQLite and as numbers (or, for
 * bigint results such as COUNT, text) on PostgreSQL, timestamps as text on SQLite and as Dates on
 * PostgreSQL: callers convert. Pass timestamps as {@link sqlTime}.
 */
export async function sqlRows<T = Record<string, unknown>>(text: string, params: readonly unknown[] = []): Promise<T[]> {
  if (dialect === "postgresql") {
    let stmt = shared.postgresStatements.get(text);
    if (!stmt) {
      stmt = { name: `q${createHash("sha1").update(text).digest("hex").slice(0, 16)}`, text: numberedPlaceholders(text) };
      shared.postgresStatements.set(text, stmt);
    }
    return (await shared.postgresPool!.query({ ...stmt, values: params as unknown[], types: postgresTypes })).rows as T[];
  }
  if (!shared.sqlite) await db.$connect();
  const conn = shared.sqlite!;
  await outsideTransactions();
  let stmt = conn.statements.get(text);
  if (!stmt) {
    stmt = conn.adapter.client.prepare(text);
    conn.statements.set(text, stmt);
  }
  if (stmt.reader) return stmt.all(...params) as T[];
  stmt.run(...params);
  return [];
}

export const db: PrismaClient = (shared.prisma ??= createClient());

/** The Prisma error code of `err` ("P2002"…), if it has one. */
function prismaCode(err: unknown): string | undefined {
  return typeof err === "object" && err !== null ? (err as { code?: string }).code : undefined;
}

/** True when `err` is Prisma's unique-constraint violation (P2002): another writer got there first. */
export function isUniqueViolation(err: unknown): boolean {
  return prismaCode(err) === "P2002";
}

/**
 * True when `err` is Prisma's P2034: a serializable transaction was aborted because a concurrent
 * one conflicted with it (PostgreSQL SQLSTATE 40001) or deadlocked.
 */
export function isSerializationFailure(err: unknown): boolean {
  return prismaCode(err) === "P2034";
}
