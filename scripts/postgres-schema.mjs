#!/usr/bin/env node
// The PostgreSQL schema is derived from the one source of truth, prisma/schema.prisma (SQLite):
// the models are copied verbatim; only the datasource provider and the generated client's folder
// change. Run `node scripts/postgres-schema.mjs` after editing prisma/schema.prisma (it rewrites
// prisma/postgres/schema.prisma), or with `--check` to fail when the committed copy is stale.
// tests/db/schema-drift.test.ts runs the check and compares both migration histories.
import { readFileSync, writeFileSync } from "node:fs";
import path from "node:path";

const root = path.resolve(path.dirname(new URL(import.meta.url).pathname), "..");
export const sourceFile = path.join(root, "prisma", "schema.prisma");
export const postgresFile = path.join(root, "prisma", "postgres", "schema.prisma");

/** Replaces exactly one occurrence of `from` in `text`; throws when there is none or several. */
function replaceOnce(text, from, to) {
  const parts = text.split(from);
  if (parts.length !== 2) throw new Error(`prisma/schema.prisma: expected exactly one ${JSON.stringify(from)}, found ${parts.length - 1}`);
  return parts.join(to);
}

/** The PostgreSQL schema text for the SQLite schema text `source`. */
export function derivePostgresSchema(source) {
  let out = replaceOnce(source, 'provider = "sqlite"', 'provider = "postgresql"');
  out = replaceOnce(out, 'output     = "../lib/generated/prisma"', 'output     = "../../lib/generated/prisma-pg"');
  // The CLI connects through prisma.config.ts's adapter; the url only has to name the provider.
  out = replaceOnce(out, 'url      = "file:../data/triangulate.db"', 'url      = "postgresql://localhost/triangulate"');
  return `// GENERATED from prisma/schema.prisma by scripts/postgres-schema.mjs: edit that file, not this one.\n${out}`;
}

if (process.argv[1] && path.resolve(process.argv[1]) === new URL(import.meta.url).pathname) {
  const want = derivePostgresSchema(readFileSync(sourceFile, "utf8"));
  if (process.argv.includes("--check")) {
    let have = "";
    try {
      have = readFileSync(postgresFile, "utf8");
    } catch {
      // missing: reported below
    }
    if (have !== want) {
      console.error("prisma/postgres/schema.prisma is stale: run `node scripts/postgres-schema.mjs` and add a PostgreSQL migration.");
      process.exit(1);
    }
  } else {
    writeFileSync(postgresFile, want);
    console.log(`wrote ${path.relative(root, postgresFile)}`);
  }
}
