/**
 * Vitest global setup for the "app" and "app-postgres" projects: builds the production app once
 * per run (unless TRIANGULATE_SKIP_BUILD=1), starts it with tests/harness/harness.ts (as the load run and
 * the fault test do) on a free loopback port with a fresh database (app: a SQLite file;
 * app-postgres: a new database created on the PostgreSQL server that
 * TRIANGULATE_TEST_POSTGRES_URL names), and hands the tests its address and database URL
 * through `inject("baseURL")` and `inject("databaseUrl")`. The server is stopped and the
 * database removed after the run.
 */
import { mkdtempSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import type { TestProject } from "vitest/node";
import { build, freePort, migrate, startServer, type ServerOptions } from "../harness/harness";
import { freshDatabase } from "../harness/sql";

declare module "vitest" {
  export interface ProvidedContext {
    baseURL: string;
    databaseUrl: string;
    /** The server's NEXTAUTH_SECRET, for a second instance that shares its sessions. */
    authSecret: string;
  }
}

export default async function setup(project: TestProject) {
  const dir = mkdtempSync(path.join(os.tmpdir(), "triangulate-test-"));
  const postgres = project.name === "app-postgres";
  const adminUrl = process.env.TRIANGULATE_TEST_POSTGRES_URL;
  if (postgres && !adminUrl) throw new Error("the app-postgres project needs TRIANGULATE_TEST_POSTGRES_URL");
  const database = await freshDatabase(postgres ? adminUrl! : `file:${path.join(dir, "x.db")}`, postgres ? `triangulate_test_${process.pid}` : "test", dir);
  const secret = "test-secret-for-the-app-suite-0123456789";
  const server: ServerOptions = { databaseUrl: database.url, port: await freePort(), secret };
  migrate(server);
  // One build serves both projects (their setups run one after the other in this process).
  if (process.env.TRIANGULATE_SKIP_BUILD !== "1" && process.env.TRIANGULATE_BUILT_IN_THIS_RUN !== "1") build(process.env.NEXT_DIST_DIR || ".next");
  process.env.TRIANGULATE_BUILT_IN_THIS_RUN = "1";
  const running = await startServer(server);
  project.provide("baseURL", running.baseURL);
  project.provide("databaseUrl", server.databaseUrl);
  project.provide("authSecret", secret);

  return async () => {
    await running.stop();
    await database.drop();
    rmSync(dir, { recursive: true, force: true });
  };
}
