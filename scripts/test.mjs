// `npm test` after its set-up (scripts/test-setup.mjs): two lines of work side by side, since
// vitest runs a project whose files go one at a time (the app projects share one server) only
// after every other project, in one process:
//   unit: the type check (tsc --noEmit), then the `unit` project;
//   app:  the `app` project (its set-up builds the app once), then `app-postgres` when
//         TRIANGULATE_TEST_POSTGRES_URL is set (same process, same build).
// Each output line is prefixed with its part; the exit code is 0 only when both parts pass.
// Extra arguments go to both vitest runs (e.g. `npm test -- --reporter=verbose`).
import { spawn } from "node:child_process";
import { createInterface } from "node:readline";

const bin = (name) => `node_modules/.bin/${name}`;
const extra = process.argv.slice(2);
const appProjects = ["app", ...(process.env.TRIANGULATE_TEST_POSTGRES_URL ? ["app-postgres"] : [])];

/** Runs the commands one after the other, prefixing their output; resolves to the first non-zero exit code, else 0. */
async function part(label, commands) {
  for (const [command, args] of commands) {
    const code = await new Promise((resolve) => {
      const child = spawn(command, args, { stdio: ["ignore", "pipe", "pipe"], env: { ...process.env, FORCE_COLOR: process.stdout.isTTY ? "1" : "0" } });
      for (const stream of [child.stdout, child.stderr]) createInterface({ input: stream }).on("line", (line) => console.log(`[${label}] ${line}`));
      child.on("close", (c, signal) => resolve(c ?? (signal ? 1 : 0)));
    });
    if (code !== 0) return code;
  }
  return 0;
}

const started = Date.now();
const codes = await Promise.all([
  part("unit", [
    [bin("tsc"), ["--noEmit"]],
    [bin("vitest"), ["run", "--project", "unit", ...extra]],
  ]),
  part("app", [[bin("vitest"), ["run", ...appProjects.flatMap((p) => ["--project", p]), ...extra]]]),
]);
const seconds = Math.round((Date.now() - started) / 1000);
console.log(`npm test: unit ${codes[0] === 0 ? "passed" : "FAILED"}, ${appProjects.join(" + ")} ${codes[1] === 0 ? "passed" : "FAILED"} (${seconds} s)`);
process.exit(codes.some((c) => c !== 0) ? 1 : 0);
