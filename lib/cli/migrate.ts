/**
 * `triangulate migrate`: brings the database named by DATABASE_URL up to the latest migration.
 *
 * - SQLite: `prisma migrate deploy` on prisma/migrations.
 * - PostgreSQL: the migrations of prisma/postgres/migrations, applied here, because Prisma 6's
 *   migration engine cannot read a PostgreSQL catalog through the driver adapter (it fails on
 *   the `name` column type: prisma/orm issue 27403). Each migration runs in its own transaction
 *   (PostgreSQL's DDL is transactional) and is recorded in `_prisma_migrations`, in the columns
 *   Prisma Migrate itself uses (name, SHA-256 checksum of migration.sql, start and finish times),
 *   so either tool sees the same history. A session advisory lock makes instances that start
 *   together apply each migration once. A recorded migration whose file has changed since is an
 *   error: migrations are never edited after they ship; write a new one.
 */
import { spawnSync } from "node:child_process";
import { createHash, randomUUID } from "node:crypto";
import { readdirSync, readFileSync } from "node:fs";
import path from "node:path";
import pg from "pg";
import { isPostgresUrl } from "../env-db";
import type { CommandIo } from "./main";

const root = path.resolve(path.dirname(new URL(import.meta.url).pathname), "..", "..");
export const POSTGRES_MIGRATIONS = path.join(root, "prisma", "postgres", "migrations");
/** An arbitrary constant naming this app's migration lock among PostgreSQL advisory locks. */
const LOCK_KEY = 7_302_114_859;
const USAGE = "usage: triangulate migrate   (applies the pending migrations to DATABASE_URL)\n";

export interface Migration {
  readonly name: string;
  readonly sql: string;
  readonly checksum: string;
}

/** The migrations in `dir`, in order of their folder names. */
export function readMigrations(dir: string): Migration[] {
  return readdirSync(dir, { withFileTypes: true })
    .filter((d) => d.isDirectory())
    .map((d) => d.name)
    .sort()
    .map((name) => {
      const sql = readFileSync(path.join(dir, name, "migration.sql"), "utf8");
      return { name, sql, checksum: createHash("sha256").update(sql).digest("hex") };
    });
}

/** Applies the pending migrations of `dir` to the PostgreSQL database at `url`; returns their names. */
export async function migratePostgres(url: string, dir = POSTGRES_MIGRATIONS): Promise<string[]> {
  const client = new pg.Client({ connectionString: url });
  await client.connect();
  try {
    await client.query("SELECT pg_advisory_lock($1)", [LOCK_KEY]);
    await client.query(`CREATE TABLE IF NOT EXISTS "_prisma_migrations" (
      "id" VARCHAR(36) PRIMARY KEY NOT NULL,
      "checksum" VARCHAR(64) NOT NULL,
      "finished_at" TIMESTAMPTZ,
      "migration_name" VARCHAR(255) NOT NULL,
      "logs" TEXT,
      "rolled_back_at" TIMESTAMPTZ,
      "started_at" TIMESTAMPTZ NOT NULL DEFAULT now(),
      "applied_steps_count" INTEGER NOT NULL DEFAULT 0
    )`);
    const done = new Map<string, string>(
      (await client.query<{ migration_name: string; checksum: string }>(`SELECT "migration_name", "checksum" FROM "_prisma_migrations" WHERE "finished_at" IS NOT NULL AND "rolled_back_at" IS NULL`)).rows.map(
        (r) => [r.migration_name, r.checksum],
      ),
    );
    const applied: string[] = [];
    for (const m of readMigrations(dir)) {
      const recorded = done.get(m.name);
      if (recorded !== undefined) {
        if (recorded !== m.checksum) throw new Error(`migration ${m.name} was changed after it was applied (checksum ${recorded.slice(0, 12)}… in the database, ${m.checksum.slice(0, 12)}… on disk)`);
        continue;
      }
      await client.query("BEGIN");
      try {
        const started = new Date();
        await client.query(m.sql);
        await client.query(`INSERT INTO "_prisma_migrations" ("id", "checksum", "finished_at", "migration_name", "started_at", "applied_steps_count") VALUES ($1, $2, now(), $3, $4, 1)`, [
          randomUUID(),
          m.checksum,
          m.name,
          started,
        ]);
        await client.query("COMMIT");
      } catch (err) {
        await client.query("ROLLBACK");
        throw new Error(`migration ${m.name} failed: ${(err as Error).message}`);
      }
      applied.push(m.name);
    }
    return applied;
  } finally {
    await client.end();
  }
}

/** The command. */
export async function run(args: string[], io: CommandIo): Promise<number> {
  if (args[0] === "--help" || args[0] === "-h") {
    io.out(USAGE);
    return 0;
  }
  if (args.length > 0) {
    io.err(`triangulate: unknown argument '${args[0]}'\n${USAGE}`);
    return 2;
  }
  const url = process.env.DATABASE_URL;
  if (!isPostgresUrl(url)) {
    const r = spawnSync(path.join(root, "node_modules", ".bin", "prisma"), ["migrate", "deploy", "--schema", path.join(root, "prisma", "schema.prisma")], {
      cwd: root,
      encoding: "utf8",
    });
    if (r.status !== 0) {
      io.err(`triangulate: prisma migrate deploy failed:\n${r.stdout}${r.stderr}`);
      return 1;
    }
    io.out(`${/(\d+ migrations? found[\s\S]*)$/.exec(r.stdout)?.[1]?.trim() ?? "migrated"}\n`);
    return 0;
  }
  try {
    const applied = await migratePostgres(url);
    io.out(applied.length ? `applied ${applied.join(", ")}\n` : "the database is up to date\n");
    return 0;
  } catch (err) {
    io.err(`triangulate: ${(err as Error).message}\n`);
    return 1;
  }
}
