/**
 * The SQLite and PostgreSQL schemas cannot drift apart:
 * 1. prisma/postgres/schema.prisma is exactly what scripts/postgres-schema.mjs derives from the one
 *    source, prisma/schema.prisma;
 * 2. both migration histories have the same migrations, by name, in the same order;
 * 3. each history, applied to an empty database, builds what its schema describes: the catalog
 *    after the migrations equals the catalog after Prisma's own script for the schema
 *    (`prisma migrate diff --from-empty --to-schema-datamodel … --script`), triggers aside;
 * 4. the two migrated databases have the same tables, columns (type, null, default), primary
 *    keys, indexes, foreign keys (with their delete rules) and triggers, read from each
 *    database's own catalog (SQLite pragmas; PostgreSQL pg_catalog and information_schema).
 * Parts 3 (PostgreSQL) and 4 need a PostgreSQL server: TRIANGULATE_TEST_POSTGRES_URL, a role that
 * may create databases (.ci/run starts one); without it they are skipped.
 */
import { spawnSync } from "node:child_process";
import { mkdtempSync, readdirSync, readFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { freshDatabase, openSql, type SqlConnection } from "../harness/sql";
import { migratePostgres } from "../../lib/cli/migrate";
// @ts-expect-error -- a plain .mjs script without type declarations
import { derivePostgresSchema } from "../../scripts/postgres-schema.mjs";

const root = path.resolve(__dirname, "..", "..");
const PG = process.env.TRIANGULATE_TEST_POSTGRES_URL;
const dir = mkdtempSync(path.join(os.tmpdir(), "triangulate-drift-"));
const drops: (() => Promise<void>)[] = [];
afterAll(async () => {
  for (const d of drops) await d();
});

const sqliteMigrations = path.join(root, "prisma", "migrations");
const postgresMigrations = path.join(root, "prisma", "postgres", "migrations");
const folders = (d: string) => readdirSync(d, { withFileTypes: true }).filter((e) => e.isDirectory()).map((e) => e.name).sort();

interface Catalog {
  tables: Record<string, { columns: Record<string, string>; primaryKey: string; indexes: string[]; foreignKeys: string[] }>;
  triggers: string[];
}

const SQLITE_TYPES: Record<string, string> = { TEXT: "text", INTEGER: "int", REAL: "float", DATETIME: "datetime", BOOLEAN: "bool" };
const PG_TYPES: Record<string, string> = { text: "text", integer: "int", "double precision": "float", "timestamp without time zone": "datetime", boolean: "bool" };
const PG_RULES: Record<string, string> = { a: "NO ACTION", r: "RESTRICT", c: "CASCADE", n: "SET NULL", d: "SET DEFAULT" };

/** A default as both catalogs can agree on it: no casts, no quotes' case differences. */
function normalDefault(d: string | null): string {
  return d === null ? "none" : d.replace(/::[a-z ]+(\(\d+\))?/g, "").replace(/^\((.*)\)$/, "$1").toLowerCase();
}

async function catalog(conn: SqlConnection, withTriggers = true): Promise<Catalog> {
  const out: Catalog = { tables: {}, triggers: [] };
  if (conn.dialect === "sqlite") {
    const tables = (await conn.query<{ name: string }>(`SELECT name FROM sqlite_master WHERE type = 'table' AND name NOT LIKE 'sqlite_%' AND name <> '_prisma_migrations'`)).map((t) => t.name);
    for (const t of tables) {
      const cols = await conn.query<{ name: string; type: string; notnull: number; dflt_value: string | null; pk: number }>(`PRAGMA table_info("${t}")`);
      const indexes = await conn.query<{ name: string; unique: number; origin: string }>(`PRAGMA index_list("${t}")`);
      const fks = await conn.query<{ id: number; seq: number; table: string; from: string; to: string; on_delete: string }>(`PRAGMA foreign_key_list("${t}")`);
      const indexList: string[] = [];
      for (const ix of indexes.filter((i) => i.origin !== "pk")) {
        const ixCols = (await conn.query<{ seqno: number; name: string }>(`PRAGMA index_info("${ix.name}")`)).sort((a, b) => a.seqno - b.seqno).map((c) => c.name);
        indexList.push(`${ix.name} ${ix.unique ? "unique " : ""}(${ixCols.join(",")})`);
      }
      const byFk = new Map<number, typeof fks>();
      for (const f of fks) byFk.set(f.id, [...(byFk.get(f.id) ?? []), f]);
      out.tables[t] = {
        columns: Object.fromEntries(cols.map((c) => [c.name, `${SQLITE_TYPES[c.type] ?? c.type} ${c.notnull || c.pk ? "not null" : "null"} default ${normalDefault(c.dflt_value)}`])),
        primaryKey: cols.filter((c) => c.pk > 0).sort((a, b) => a.pk - b.pk).map((c) => c.name).join(","),
        indexes: indexList.sort(),
        foreignKeys: [...byFk.values()].map((f) => `(${f.sort((a, b) => a.seq - b.seq).map((x) => x.from).join(",")}) → ${f[0].table}(${f.map((x) => x.to).join(",")}) on delete ${f[0].on_delete}`).sort(),
      };
    }
    if (withTriggers) out.triggers = (await conn.query<{ tbl_name: string; name: string }>(`SELECT tbl_name, name FROM sqlite_master WHERE type = 'trigger'`)).map((t) => `${t.tbl_name}.${t.name}`).sort();
    return out;
  }
  const cols = await conn.query<{ table_name: string; column_name: string; data_type: string; is_nullable: string; column_default: string | null }>(
    `SELECT table_name, column_name, data_type, is_nullable, column_default FROM information_schema.columns WHERE table_schema = current_schema() AND table_name <> '_prisma_migrations'`,
  );
  for (const c of cols) {
    out.tables[c.table_name] ??= { columns: {}, primaryKey: "", indexes: [], foreignKeys: [] };
    out.tables[c.table_name].columns[c.column_name] = `${PG_TYPES[c.data_type] ?? c.data_type} ${c.is_nullable === "NO" ? "not null" : "null"} default ${normalDefault(c.column_default)}`;
  }
  const indexes = await conn.query<{ tbl: string; name: string; uniq: boolean; prim: boolean; cols: string }>(
    `SELECT t.relname AS tbl, i.relname AS name, ix.indisunique AS uniq, ix.indisprimary AS prim,
            array_to_string(array(SELECT a.attname FROM unnest(ix.indkey) WITH ORDINALITY k(attnum, ord) JOIN pg_attribute a ON a.attrelid = t.oid AND a.attnum = k.attnum ORDER BY k.ord), ',') AS cols
     FROM pg_index ix JOIN pg_class t ON t.oid = ix.indrelid JOIN pg_class i ON i.oid = ix.indexrelid
     WHERE t.relnamespace = current_schema()::regnamespace AND t.relname <> '_prisma_migrations'`,
  );
  for (const ix of indexes) {
    if (ix.prim) out.tables[ix.tbl].primaryKey = ix.cols;
    else out.tables[ix.tbl].indexes.push(`${ix.name} ${ix.uniq ? "unique " : ""}(${ix.cols})`);
  }
  const fks = await conn.query<{ tbl: string; ref: string; del: string; cols: string; refcols: string }>(
    `SELECT t.relname AS tbl, r.relname AS ref, c.confdeltype AS del,
            array_to_string(array(SELECT a.attname FROM unnest(c.conkey) WITH ORDINALITY k(n, o) JOIN pg_attribute a ON a.attrelid = c.conrelid AND a.attnum = k.n ORDER BY k.o), ',') AS cols,
            array_to_string(array(SELECT a.attname FROM unnest(c.confkey) WITH ORDINALITY k(n, o) JOIN pg_attribute a ON a.attrelid = c.confrelid AND a.attnum = k.n ORDER BY k.o), ',') AS refcols
     FROM pg_constraint c JOIN pg_class t ON t.oid = c.conrelid JOIN pg_class r ON r.oid = c.confrelid
     WHERE c.contype = 'f' AND t.relnamespace = current_schema()::regnamespace`,
  );
  for (const f of fks) out.tables[f.tbl].foreignKeys.push(`(${f.cols}) → ${f.ref}(${f.refcols}) on delete ${PG_RULES[f.del]}`);
  for (const t of Object.values(out.tables)) {
    t.indexes.sort();
    t.foreignKeys.sort();
  }
  if (withTriggers) {
    out.triggers = (await conn.query<{ tbl: string; name: string }>(
      `SELECT c.relname AS tbl, g.tgname AS name FROM pg_trigger g JOIN pg_class c ON c.oid = g.tgrelid WHERE NOT g.tgisinternal AND c.relnamespace = current_schema()::regnamespace`,
    ))
      .map((t) => `${t.tbl}.${t.name}`)
      .sort();
  }
  return out;
}

/** A database with the given SQL scripts applied (SQLite: a new file; PostgreSQL: a new database). */
async function databaseFrom(kind: "sqlite" | "postgresql", name: string, scripts: string[]): Promise<SqlConnection> {
  const db = await freshDatabase(kind === "sqlite" ? `file:${dir}/x.db` : PG!, `drift_${name}_${process.pid}`, dir);
  drops.push(db.drop);
  if (kind === "sqlite") {
    const { default: Database } = await import("better-sqlite3");
    const conn = new Database(db.url.slice("file:".length));
    for (const s of scripts) conn.exec(s);
    conn.close();
  } else {
    const conn = await openSql(db.url);
    for (const s of scripts) await conn.query(s);
    await conn.close();
  }
  const conn = await openSql(db.url);
  drops.unshift(() => conn.close());
  return conn;
}

const readScripts = (d: string) => folders(d).map((m) => readFileSync(path.join(d, m, "migration.sql"), "utf8"));

/** Prisma's script that creates `schema` from nothing. */
function schemaScript(schema: string, databaseUrl: string): string {
  const r = spawnSync(path.join(root, "node_modules", ".bin", "prisma"), ["migrate", "diff", "--from-empty", "--to-schema-datamodel", schema, "--script"], {
    cwd: root,
    env: { ...process.env, DATABASE_URL: databaseUrl },
    encoding: "utf8",
  });
  if (r.status !== 0) throw new Error(`prisma migrate diff failed: ${r.stderr}`);
  return r.stdout;
}

describe("one source of truth for both schemas", () => {
  it("the PostgreSQL schema is the one derived from prisma/schema.prisma", () => {
    const derived = derivePostgresSchema(readFileSync(path.join(root, "prisma", "schema.prisma"), "utf8"));
    expect(readFileSync(path.join(root, "prisma", "postgres", "schema.prisma"), "utf8")).toBe(derived);
  });

  it("both migration histories have the same migrations in the same order", () => {
    expect(folders(postgresMigrations)).toEqual(folders(sqliteMigrations));
    expect(folders(sqliteMigrations).length).toBeGreaterThanOrEqual(3);
  });

  it("the SQLite migrations build what prisma/schema.prisma describes", async () => {
    const migrated = await databaseFrom("sqlite", "sqlite_migrated", readScripts(sqliteMigrations));
    const fromSchema = await databaseFrom("sqlite", "sqlite_schema", [schemaScript(path.join(root, "prisma", "schema.prisma"), `file:${dir}/cli.db`)]);
    expect(await catalog(migrated, false)).toEqual(await catalog(fromSchema, false));
    expect(Object.keys((await catalog(migrated)).tables)).toContain("RateLimitWindow");
  });

  it.skipIf(!PG)("the PostgreSQL migrations (applied by triangulate migrate) build what prisma/postgres/schema.prisma describes", async () => {
    const target = await freshDatabase(PG!, `drift_pg_migrated_${process.pid}`, dir);
    drops.push(target.drop);
    expect(await migratePostgres(target.url)).toEqual(folders(postgresMigrations));
    expect(await migratePostgres(target.url)).toEqual([]);
    const migrated = await openSql(target.url);
    drops.unshift(() => migrated.close());
    const fromSchema = await databaseFrom("postgresql", "pg_schema", [schemaScript(path.join(root, "prisma", "postgres", "schema.prisma"), PG!)]);
    expect(await catalog(migrated, false)).toEqual(await catalog(fromSchema, false));
  });

  it.skipIf(!PG)("SQLite and PostgreSQL, each migrated, have the same tables, columns, keys, indexes, foreign keys and triggers", async () => {
    const sqlite = await catalog(await databaseFrom("sqlite", "sqlite_both", readScripts(sqliteMigrations)));
    const postgres = await catalog(await databaseFrom("postgresql", "pg_both", readScripts(postgresMigrations)));
    expect(Object.keys(postgres.tables).sort()).toEqual(Object.keys(sqlite.tables).sort());
    for (const t of Object.keys(sqlite.tables)) expect(postgres.tables[t], t).toEqual(sqlite.tables[t]);
    // PostgreSQL has one more trigger: it also refuses TRUNCATE, which SQLite does not have.
    expect(postgres.triggers.filter((t) => t !== "AuditEvent.AuditEvent_no_truncate")).toEqual(sqlite.triggers);
  });
});
