/**
 * Vitest global setup for the "app" and "app-postgres" projects: builds the production app once
 * per run (unless TRIANGULATE_SKIP_BUILD=1), starts it on a free loopback port with a fresh
 * database (app: a SQLite file; app-postgres: a new database created on the PostgreSQL server
 * that TRIANGULATE_TEST_POSTGRES_URL names), and hands the tests its address and database URL
 * through `inject("baseURL")` and `inject("databaseUrl")`. The server is stopped and the
 * database removed after the run.
 */
import { spawn, spawnSync, type ChildProcess } from "node:child_process";
import { mkdtempSync, rmSync } from "node:fs";
import { createServer } from "node:net";
import os from "node:os";
import path from "node:path";
import type { TestProject } from "vitest/node";
import { freshDatabase } from "../../bench/sql";

declare module "vitest" {
  export interface ProvidedContext {
    baseURL: string;
    databaseUrl: string;
    /** The server's NEXTAUTH_SECRET, for a second instance that shares its sessions. */
    authSecret: string;
  }
}

const root = path.resolve(__dirname, "..", "..");
const bin = (name: string) => path.join(root, "node_modules", ".bin", name);

function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = createServer();
    srv.listen(0, "127.0.0.1", () => {
      const address = srv.address();
      srv.close(() => (typeof address === "object" && address ? resolve(address.port) : reject(new Error("no port"))));
    });
  });
}

async function waitForServer(url: string, child: ChildProcess, ms = 60_000): Promise<void> {
  const until = Date.now() + ms;
  while (Date.now() < until) {
    if (child.exitCode !== null) throw new Error(`app server exited with ${child.exitCode}`);
    try {
      const res = await fetch(url);
      if (res.status < 500) return;
    } catch {
      // not listening yet
    }
    await new Promise((r) => setTimeout(r, 250));
  }
  throw new Error(`app server did not answer at ${url} within ${ms} ms`);
}

export default async function setup(project: TestProject) {
  const dir = mkdtempSync(path.join(os.tmpdir(), "triangulate-test-"));
  const postgres = project.name === "app-postgres";
  const adminUrl = process.env.TRIANGULATE_TEST_POSTGRES_URL;
  if (postgres && !adminUrl) throw new Error("the app-postgres project needs TRIANGULATE_TEST_POSTGRES_URL");
  const database = await freshDatabase(postgres ? adminUrl! : `file:${path.join(dir, "x.db")}`, postgres ? `triangulate_test_${process.pid}` : "test", dir);
  const port = await freePort();
  const baseURL = `http://127.0.0.1:${port}`;
  const env: NodeJS.ProcessEnv = {
    ...process.env,
    NODE_ENV: "production",
    NEXT_TELEMETRY_DISABLED: "1",
    DATABASE_URL: database.url,
    NEXTAUTH_SECRET: "test-secret-for-the-app-suite-0123456789",
    NEXTAUTH_URL: baseURL,
    PORT: String(port),
  };

  const steps: [string, string[]][] = [[process.execPath, [path.join(root, "bin", "triangulate.mjs"), "migrate"]]];
  // One build serves both projects (their setups run one after the other in this process).
  if (process.env.TRIANGULATE_SKIP_BUILD !== "1" && process.env.TRIANGULATE_BUILT_IN_THIS_RUN !== "1") steps.push([bin("next"), ["build"]]);
  for (const [cmd, args] of steps) {
    const r = spawnSync(cmd, args, { cwd: root, env, encoding: "utf8" });
    if (r.status !== 0) throw new Error(`${path.basename(cmd)} ${args.join(" ")} failed:\n${r.stdout}\n${r.stderr}`);
  }
  process.env.TRIANGULATE_BUILT_IN_THIS_RUN = "1";

  const server = spawn(process.execPath, [path.join(root, "bin", "triangulate.mjs"), "serve", "--port", String(port), "--hostname", "127.0.0.1"], {
    cwd: root,
    env,
    stdio: ["ignore", "inherit", "inherit"],
  });
  await waitForServer(baseURL, server);
  project.provide("baseURL", baseURL);
  project.provide("databaseUrl", env.DATABASE_URL!);
  project.provide("authSecret", env.NEXTAUTH_SECRET!);

  return async () => {
    server.kill("SIGTERM");
    await new Promise((r) => setTimeout(r, 300));
    await database.drop();
    rmSync(dir, { recursive: true, force: true });
  };
}
