#!/usr/bin/env node
// `npm run migration -- NAME`: after editing prisma/schema.prisma (the one source of truth),
// writes the PostgreSQL copy of the schema and the next migration for both databases, each the
// difference between the schema at git HEAD and the edited one, as Prisma renders it:
//   prisma/migrations/<nnnn>_NAME/migration.sql            (SQLite)
//   prisma/postgres/migrations/<nnnn>_NAME/migration.sql   (PostgreSQL)
// Prisma's CLI opens the database of prisma.config.ts's adapter even for a diff of two schema
// files, so the PostgreSQL half needs a reachable server: TRIANGULATE_TEST_POSTGRES_URL.
// Raw-SQL migrations (triggers) are written by hand, in both folders, under the same name.
// tests/db/schema-drift.test.ts then checks that the two histories build the same database.
import { spawnSync } from "node:child_process";
import { mkdirSync, mkdtempSync, readdirSync, readFileSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { derivePostgresSchema, postgresFile, sourceFile } from "./postgres-schema.mjs";

const root = path.resolve(path.dirname(new URL(import.meta.url).pathname), "..");
const name = process.argv[2];
if (!name || !/^[a-z][a-z0-9_]*$/.test(name)) {
  console.error("usage: npm run migration -- NAME   (lower-case letters, digits and _)");
  process.exit(2);
}
const pg = process.env.TRIANGULATE_TEST_POSTGRES_URL;
if (!pg) {
  console.error("set TRIANGULATE_TEST_POSTGRES_URL to a PostgreSQL server (Prisma's CLI needs one to render the PostgreSQL migration)");
  process.exit(2);
}

const tmp = mkdtempSync(path.join(os.tmpdir(), "triangulate-migration-"));
const head = spawnSync("git", ["show", "HEAD:prisma/schema.prisma"], { cwd: root, encoding: "utf8" });
if (head.status !== 0) throw new Error(head.stderr);
writeFileSync(path.join(tmp, "prev.prisma"), head.stdout);
writeFileSync(path.join(tmp, "prev-pg.prisma"), derivePostgresSchema(head.stdout));
writeFileSync(postgresFile, derivePostgresSchema(readFileSync(sourceFile, "utf8")));

function diff(from, to, databaseUrl) {
  const r = spawnSync(path.join(root, "node_modules", ".bin", "prisma"), ["migrate", "diff", "--from-schema-datamodel", from, "--to-schema-datamodel", to, "--script"], {
    cwd: root,
    env: { ...process.env, DATABASE_URL: databaseUrl },
    encoding: "utf8",
  });
  if (r.status !== 0) throw new Error(`prisma migrate diff failed:\n${r.stderr}`);
  return r.stdout;
}

const existing = readdirSync(path.join(root, "prisma", "migrations")).filter((d) => /^\d{4}_/.test(d));
const folder = `${String(Math.max(0, ...existing.map((d) => Number(d.slice(0, 4)))) + 1).padStart(4, "0")}_${name}`;
const outputs = [
  [path.join(root, "prisma", "migrations", folder), diff(path.join(tmp, "prev.prisma"), sourceFile, `file:${path.join(tmp, "cli.db")}`)],
  [path.join(root, "prisma", "postgres", "migrations", folder), diff(path.join(tmp, "prev-pg.prisma"), postgresFile, pg)],
];
for (const [dir, sql] of outputs) {
  mkdirSync(dir, { recursive: true });
  writeFileSync(path.join(dir, "migration.sql"), sql);
  console.log(`wrote ${path.relative(root, dir)}/migration.sql`);
}
console.log("next: npm run postinstall (regenerates both clients), then npx vitest run tests/db");
