import path from "node:path";
import { defineConfig } from "prisma/config";
import { PrismaBetterSQLite3 } from "@prisma/adapter-better-sqlite3";
import { ensureDatabaseFile } from "./lib/env-db";

export default defineConfig({
  experimental: { adapter: true },
  engine: "js",
  schema: path.join("prisma", "schema.prisma"),
  async adapter() {
    return new PrismaBetterSQLite3({ url: `file:${ensureDatabaseFile()}` });
  },
});
