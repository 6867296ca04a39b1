#!/usr/bin/env node
// The `triangulate` command. The sources are TypeScript, so they are loaded through tsx's
// ESM loader (registered for this process only, with the project's tsconfig so that its
// path aliases resolve from any working directory); lib/cli/main.ts does the rest.
import { spawn } from "node:child_process";
import { readFileSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { register } from "tsx/esm/api";

const heapBounded = [...process.execArgv, process.env.NODE_OPTIONS ?? ""].some((a) => a.includes("--max-old-space-size"));
if (process.argv[2] === "serve" && !heapBounded) {
  // The server's main-thread heap is bounded (lib/work/heap-limits.json), as `npm start` bounds
  // it: started without a bound, `serve` runs itself again with one, passing signals and its exit on.
  const limits = JSON.parse(readFileSync(new URL("../lib/work/heap-limits.json", import.meta.url), "utf8"));
  const heap = [`--max-old-space-size=${limits.serverOldSpaceMiB}`, `--max-semi-space-size=${limits.serverSemiSpaceMiB}`];
  const args = [...process.execArgv, ...heap, fileURLToPath(import.meta.url), ...process.argv.slice(2)];
  const server = spawn(process.execPath, args, { stdio: "inherit" });
  for (const sig of ["SIGINT", "SIGTERM"]) process.on(sig, () => server.kill(sig));
  server.on("exit", (code, signal) => process.exit(code ?? (signal ? 1 : 0)));
} else {
  register({ tsconfig: fileURLToPath(new URL("../tsconfig.json", import.meta.url)) });
  const { main } = await import("../lib/cli/main.ts");
  process.exitCode = await main(process.argv.slice(2));
}
