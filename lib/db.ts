import { PrismaBetterSQLite3 } from "@prisma/adapter-better-sqlite3";
import { PrismaPg } from "@prisma/adapter-pg";
import { PrismaClient } from "./generated/prisma/client";
import { PrismaClient as PostgresPrismaClient } from "./generated/prisma-pg/client";
import { ensureDatabaseFile, isPostgresUrl } from "./env-db";
import { env } from "./env";

/** The one Prisma client of the process (kept on globalThis so dev reloads reuse it). */
const globalForPrisma = globalThis as unknown as { prisma?: PrismaClient };

/** Which database this process talks to: DATABASE_URL naming PostgreSQL, else the SQLite file. */
export const dialect: "sqlite" | "postgresql" = isPostgresUrl(process.env.DATABASE_URL) ? "postgresql" : "sqlite";

/**
 * A timestamp as a raw-query parameter: a Date for PostgreSQL (a `timestamp(3)` column); for
 * SQLite, the ISO text with `+00:00` that the better-sqlite3 adapter stores for Prisma DateTime
 * fields, so comparisons in SQL are between strings of one format.
 */
export function sqlTime(d: Date): Date | string {
  return dialect === "postgresql" ? d : d.toISOString().replace("Z", "+00:00");
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
    const adapter = new PrismaPg({ connectionString: DATABASE_URL, max: TRIANGULATE_PG_POOL });
    return new PostgresPrismaClient({ adapter }) as unknown as PrismaClient;
  }
  const factory = new PrismaBetterSQLite3({ url: `file:${ensureDatabaseFile()}`, timeout: 5000 });
  const connect = factory.connect.bind(factory);
  factory.connect = async () => {
    const adapter = await connect();
    await adapter.executeScript(connectionPragmas().map((p) => `PRAGMA ${p};`).join("\n"));
    return adapter;
  };
  return new PrismaClient({ adapter: factory });
}

export const db: PrismaClient = globalForPrisma.prisma ?? createClient();
if (process.env.NODE_ENV !== "production") globalForPrisma.prisma = db;
