import path from "node:path";
import { defineConfig } from "vitest/config";

const root = path.dirname(new URL(import.meta.url).pathname);

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
      {
        extends: true,
        test: {
          name: "app",
          include: ["tests/app/**/*.test.ts"],
          globalSetup: ["tests/app/server-setup.ts"],
          fileParallelism: false,
          testTimeout: 120_000,
          hookTimeout: 300_000,
        },
      },
    ],
  },
});
