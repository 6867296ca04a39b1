import path from "node:path";
import { defineConfig } from "prisma/config";
import { PrismaBetterSQLite3 } from "@prisma/adapter-better-sqlite3";
import { PrismaPg } from "@prisma/adapter-pg";
import { ensureDatabaseFile, isPostgresUrl } from "./lib/env-db";

// One CLI configuration for both databases: DATABASE_URL naming PostgreSQL selects the derived
// schema (prisma/postgres, see scripts/postgres-schema.mjs) and its migrations; anything else is
// the embedded SQLite file.
const url = process.env.DATABASE_URL;
const postgres = isPostgresUrl(url);

export default defineConfig({
  experimental: { adapter: true },
  engine: "js",
  schema: postgres ? path.join("prisma", "postgres", "schema.prisma") : path.join("prisma", "schema.prisma"),
  // Applied by `triangulate migrate` (lib/cli/migrate.ts), which uses Prisma Migrate for SQLite only.
  migrations: { path: postgres ? path.join("prisma", "postgres", "migrations") : path.join("prisma", "migrations") },
  async adapter() {
    return postgres ? new PrismaPg({ connectionString: url }) : new PrismaBetterSQLite3({ url: `file:${ensureDatabaseFile()}` });
  },
});
