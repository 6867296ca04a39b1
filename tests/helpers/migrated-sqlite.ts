/**
 * A fresh SQLite file with every migration of prisma/migrations applied in order, and
 * DATABASE_URL pointed at it, for unit tests of services that use lib/db. Import lib/db (or
 * anything that does) only after calling it: lib/db opens the database when first imported.
 */
import { mkdtempSync, readdirSync, readFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import Database from "better-sqlite3";

const migrations = path.join(__dirname, "..", "..", "prisma", "migrations");

/** Creates the database; returns its file. */
export function migratedSqliteDatabase(): string {
  const file = path.join(mkdtempSync(path.join(os.tmpdir(), "triangulate-unit-")), "test.db");
  const conn = new Database(file);
  for (const dir of readdirSync(migrations, { withFileTypes: true }).filter((d) => d.isDirectory()).map((d) => d.name).sort()) {
    conn.exec(readFileSync(path.join(migrations, dir, "migration.sql"), "utf8"));
  }
  conn.close();
  process.env.DATABASE_URL = `file:${file}`;
  delete (globalThis as { triangulateDb?: unknown }).triangulateDb;
  return file;
}
