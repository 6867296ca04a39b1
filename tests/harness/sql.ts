/**
 * Direct SQL access to the app's database, for checks from outside the app (the load run, the
 * fault and API tests): one interface over SQLite (better-sqlite3) and PostgreSQL (node-postgres),
 * chosen by the URL as lib/env-db.ts does.
 *
 * Statements use `?` placeholders (turned into `$1, $2, …` for PostgreSQL) and double-quoted
 * identifiers, which both databases read alike. Whole numbers come back as numbers and
 * timestamps as Date objects on both.
 *
 * A test and bench utility, not a way into the database for the app: it opens its own connection
 * (read-only if asked), runs any check a test needs, clears tables and creates databases. The
 * app's own hand-written statements are the typed functions of lib/db-statements.ts.
 */
import Database from "better-sqlite3";
import pg from "pg";
import { isPostgresUrl } from "../../lib/env-db";
import { numberedPlaceholders, parsePostgresTimestamp, timestampParam } from "../../lib/sql-text";

export type Dialect = "sqlite" | "postgresql";

export interface SqlConnection {
  readonly dialect: Dialect;
  /** Runs one statement; returns its rows (empty for a statement without RETURNING). */
  query<T = Record<string, unknown>>(text: string, params?: readonly unknown[]): Promise<T[]>;
  close(): Promise<void>;
}

export function dialectOf(databaseUrl: string): Dialect {
  if (databaseUrl.startsWith("file:")) return "sqlite";
  const postgres: boolean = isPostgresUrl(databaseUrl); // (a boolean, not the narrowing guard)
  if (postgres) return "postgresql";
  throw new Error(`not a database URL this app uses: ${databaseUrl.split(":")[0]}:`);
}

// SQLite stores Prisma DateTime values as ISO text; these columns come back as Dates.
const TIME_COLUMN = /(At|deadline|windowStart)$/;

export async function openSql(databaseUrl: string, options: { readonly?: boolean } = {}): Promise<SqlConnection> {
  if (dialectOf(databaseUrl) === "sqlite") {
    const conn = new Database(databaseUrl.slice("file:".length), { readonly: options.readonly ?? false, fileMustExist: true });
    return {
      dialect: "sqlite",
      async query<T>(text: string, params: readonly unknown[] = []) {
        const stmt = conn.prepare(text);
        const args = params.map((p) => (p instanceof Date ? timestampParam("sqlite", p) : p));
        if (!stmt.reader) {
          stmt.run(...args);
          return [] as T[];
        }
        const rows = stmt.all(...args) as Record<string, unknown>[];
        for (const row of rows) for (const k of Object.keys(row)) if (TIME_COLUMN.test(k) && typeof row[k] === "string") row[k] = new Date(row[k] as string);
        return rows as T[];
      },
      async close() {
        conn.close();
      },
    };
  }
  const client = new pg.Client({
    connectionString: databaseUrl,
    types: {
      getTypeParser: ((oid: number, format?: "text" | "binary") => {
        if (oid === 20 || oid === 1700) return Number; // int8 (COUNT, SUM), numeric
        if (oid === 1114) return parsePostgresTimestamp; // timestamp(3), stored as UTC by Prisma
        return pg.types.getTypeParser(oid, format);
      }) as typeof pg.types.getTypeParser,
    },
  });
  await client.connect();
  if (options.readonly) await client.query("SET default_transaction_read_only = on");
  return {
    dialect: "postgresql",
    async query<T>(text: string, params: readonly unknown[] = []) {
      const args = params.map((p) => (p instanceof Date ? timestampParam("postgresql", p) : p));
      return (await client.query(numberedPlaceholders(text), args as unknown[])).rows as T[];
    },
    async close() {
      await client.end();
    },
  };
}

/** The app's tables (without Prisma's migration table). */
export async function appTables(conn: SqlConnection): Promise<string[]> {
  const rows =
    conn.dialect === "sqlite"
      ? await conn.query<{ name: string }>(`SELECT name FROM sqlite_master WHERE type = 'table' AND name NOT LIKE 'sqlite_%' AND name <> '_prisma_migrations'`)
      : await conn.query<{ name: string }>(`SELECT table_name AS name FROM information_schema.tables WHERE table_schema = current_schema() AND table_type = 'BASE TABLE' AND table_name <> '_prisma_migrations'`);
  return rows.map((r) => r.name).sort();
}

/**
 * Deletes every row of every app table, so the next app test file starts from an empty database.
 * The audit log is append-only (migration 0002_audit_append_only): its triggers are set aside
 * for the clean-up and put back as they were.
 */
export async function clearAllTables(conn: SqlConnection): Promise<void> {
  const tables = await appTables(conn);
  if (conn.dialect === "postgresql") {
    await conn.query("BEGIN");
    await conn.query(`ALTER TABLE "AuditEvent" DISABLE TRIGGER USER`);
    await conn.query(`TRUNCATE ${tables.map((t) => `"${t}"`).join(", ")} CASCADE`);
    await conn.query(`ALTER TABLE "AuditEvent" ENABLE TRIGGER USER`);
    await conn.query("COMMIT");
    return;
  }
  const triggers = await conn.query<{ name: string; sql: string }>(`SELECT name, sql FROM sqlite_master WHERE type = 'trigger' AND tbl_name = 'AuditEvent'`);
  await conn.query("PRAGMA foreign_keys = OFF");
  await conn.query("BEGIN");
  for (const t of triggers) await conn.query(`DROP TRIGGER "${t.name}"`);
  for (const t of tables) await conn.query(`DELETE FROM "${t}"`);
  for (const t of triggers) await conn.query(t.sql);
  await conn.query("COMMIT");
}

/**
 * A new, empty database of the same kind as `like`: a SQLite file in `dir` (named `name`.db),
 * or, on PostgreSQL, `CREATE DATABASE name` on the server of `like` (its role needs CREATEDB).
 * Returns its URL and a function that removes it.
 */
export async function freshDatabase(like: string, name: string, dir: string): Promise<{ url: string; drop(): Promise<void> }> {
  if (!/^[a-z][a-z0-9_]*$/.test(name)) throw new Error(`database name must be lower-case letters, digits and _: ${name}`);
  if (dialectOf(like) === "sqlite") {
    const { rmSync } = await import("node:fs");
    const file = `${dir}/${name}.db`;
    return { url: `file:${file}`, drop: async () => rmSync(file, { force: true }) };
  }
  const admin = await openSql(like);
  try {
    await admin.query(`CREATE DATABASE "${name}"`);
  } finally {
    await admin.close();
  }
  const url = new URL(like);
  url.pathname = `/${name}`;
  return {
    url: url.toString(),
    async drop() {
      const conn = await openSql(like);
      try {
        await conn.query(`DROP DATABASE IF EXISTS "${name}" WITH (FORCE)`);
      } finally {
        await conn.close();
      }
    },
  };
}
