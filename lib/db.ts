import { PrismaBetterSQLite3 } from "@prisma/adapter-better-sqlite3";
import { PrismaPg } from "@prisma/adapter-pg";
import { PrismaClient } from "./generated/prisma/client";
import { PrismaClient as PostgresPrismaClient } from "./generated/prisma-pg/client";
import { appPrismaClient, type AppPrismaClient } from "./prisma-client";
import type { SqlDriverAdapter, Transaction } from "@prisma/driver-adapter-utils";
import type BetterSqlite3 from "better-sqlite3";
import pg from "pg";
import { postgresRunner, sqliteRunner, statementsOn, type Dialect, type Statements } from "./db-statements";
import { ensureDatabaseFile, isPostgresUrl } from "./env-db";
import { env } from "./env";

/** A database connection: the Prisma client and the hand-written statements (lib/db-statements.ts) on the same connection. */
export interface Database {
  readonly dialect: Dialect;
  readonly prisma: AppPrismaClient;
  readonly statements: Statements;
}

/** Which database `url` names: PostgreSQL for `postgresql://…`, else the SQLite file. */
export function dialectOf(url: string | undefined): Dialect {
  return isPostgresUrl(url) ? "postgresql" : "sqlite";
}

/** Which database this process talks to: DATABASE_URL naming PostgreSQL, else the SQLite file. */
export const dialect: Dialect = dialectOf(process.env.DATABASE_URL);

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

/** The SQLite connection Prisma opened, and the interactive transaction open on it. */
interface SqliteConnection {
  /** better-sqlite3's connection inside Prisma's adapter; set when Prisma connects. */
  client?: BetterSqlite3.Database;
  /** Settles when the interactive transaction open on the connection ends; null when none is open. */
  openTransaction: Promise<void> | null;
}

/**
 * A connection to `url` (DATABASE_URL's form). PostgreSQL goes through a connection pool
 * (node-postgres) of TRIANGULATE_PG_POOL connections (default 10). Either client has the one
 * type {@link AppPrismaClient} (lib/prisma-client.ts).
 */
export function connectDatabase(url: string | undefined): Database {
  if (dialectOf(url) === "postgresql") {
    const pool = new pg.Pool({ connectionString: url, max: env().TRIANGULATE_PG_POOL });
    // disposeExternalPool: $disconnect (the CLI commands end with it) also closes the pool.
    const prisma = appPrismaClient(new PostgresPrismaClient({ adapter: new PrismaPg(pool, { disposeExternalPool: true }) }));
    return { dialect: "postgresql", prisma, statements: statementsOn(postgresRunner(pool)) };
  }
  const conn: SqliteConnection = { openTransaction: null };
  const factory = new PrismaBetterSQLite3({ url: `file:${ensureDatabaseFile({ ...process.env, DATABASE_URL: url })}`, timeout: 5000 });
  const connect = factory.connect.bind(factory);
  factory.connect = async () => {
    const adapter = await connect();
    await adapter.executeScript(connectionPragmas().map((p) => `PRAGMA ${p};`).join("\n"));
    conn.client = (adapter as SqlDriverAdapter & { client: BetterSqlite3.Database }).client;
    holdOutsideStatements(adapter, conn);
    return adapter;
  };
  const prisma = new PrismaClient({ adapter: factory });
  // The statements run on Prisma's own connection (SQLite allows one writer), outside any open transaction.
  const statements = statementsOn(
    sqliteRunner(async () => {
      if (!conn.client) await prisma.$connect();
      await outsideTransactions(conn);
      return conn.client!;
    }),
  );
  return { dialect: "sqlite", prisma, statements };
}

async function outsideTransactions(conn: SqliteConnection): Promise<void> {
  while (conn.openTransaction) await conn.openTransaction;
}

/**
 * SQLite has one connection per process, so an interactive transaction (BEGIN … COMMIT across
 * awaits) spans every statement that runs on it meanwhile. Prisma's adapter serialises
 * transactions among themselves, not the statements of other requests: one of them, say an
 * acknowledged answer, would become part of the open transaction and vanish if it rolled back.
 * So statements from outside wait until the open transaction has ended
 * (tests/db/sqlite-connection.test.ts). A transaction's own statements go through its own object
 * and are not held. What this relies on in the adapter (and in how Prisma calls it) is pinned by
 * the same test file, so an upgrade that changes it fails there.
 */
function holdOutsideStatements(adapter: SqlDriverAdapter, conn: { openTransaction: Promise<void> | null }): void {
  for (const method of ["queryRaw", "executeRaw"] as const) {
    const run = adapter[method].bind(adapter) as (q: never) => Promise<never>;
    (adapter as unknown as Record<string, unknown>)[method] = async (query: never) => {
      await outsideTransactions(conn);
      return run(query);
    };
  }
  const start = adapter.startTransaction.bind(adapter);
  adapter.startTransaction = async (isolationLevel) => {
    const tx: Transaction = await start(isolationLevel);
    let ended!: () => void;
    conn.openTransaction = new Promise((resolve) => (ended = resolve));
    const finish = () => {
      conn.openTransaction = null;
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
 * The process's one connection (DATABASE_URL, checked by lib/env.ts), kept on globalThis so that
 * the dev server's module reloads and the route modules the production server loads twice share
 * it, with its prepared statements and its transaction gate.
 */
const shared: Database = ((globalThis as unknown as { triangulateDb?: Database }).triangulateDb ??= (env(), connectDatabase(process.env.DATABASE_URL)));

/** The one Prisma client of the process. Inside `db.$transaction(async (tx) => …)` use `tx` only. */
export const db: AppPrismaClient = shared.prisma;

/** The hand-written statements of the hot panelist path (lib/db-statements.ts), on the same connection as {@link db}. */
export const statements: Statements = shared.statements;

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
