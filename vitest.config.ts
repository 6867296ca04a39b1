import path from "node:path";
import { defineConfig } from "vitest/config";

const root = path.dirname(new URL(import.meta.url).pathname);

/** An integration project: tests/app against a server that tests/app/server-setup.ts starts. */
function app(name: string, groupOrder: number) {
  return {
    extends: true as const,
    test: {
      name,
      include: ["tests/app/**/*.test.ts"],
      globalSetup: ["tests/app/server-setup.ts"],
      setupFiles: ["tests/app/fresh-connections.ts"],
      fileParallelism: false,
      testTimeout: 120_000,
      hookTimeout: 300_000,
      // expect.poll waits on the app's state; its 1 s default cap failed under load (two cores
      // shared) while a server action was still running. The cap is a bound, not a synchronisation.
      expect: { poll: { timeout: 30_000 } },
      // After the SQLite run, not beside it: the machine has two cores.
      sequence: { groupOrder },
    },
  };
}

export default defineConfig({
  resolve: { alias: { "@": root } },
  test: {
    projects: [
      {
        extends: true,
        test: {
          name: "unit",
          include: ["tests/**/*.test.ts"],
          exclude: ["tests/app/**", "node_modules/**"],
          testTimeout: 60_000,
        },
      },
      app("app", 0),
      // The same integration and browser tests on PostgreSQL, when a server is named
      // (.ci/run starts one): TRIANGULATE_TEST_POSTGRES_URL, a role that may CREATE DATABASE.
      ...(process.env.TRIANGULATE_TEST_POSTGRES_URL ? [app("app-postgres", 1)] : []),
    ],
  },
});
