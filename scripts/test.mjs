// `npm test` after its set-up (scripts/test-setup.mjs). In one vitest process, a project whose
// files go one at a time (the app tests share one server) runs only after every other project,
// so the suite used one core at a time. Here two lines of work run side by side, each command's
// output lines prefixed with its name:
//   1. [tsc] the type check, [unit] the unit project, then (once [build] is done) [browser]:
//      the app tests in tests/app/browser-*.test.ts;
//   2. [build] the production build (once, for every app run), then [app]: the other app tests.
// Each app run starts its own server on its own fresh database (tests/app/server-setup.ts), so
// the two never share state. With TRIANGULATE_TEST_POSTGRES_URL set, each app run also runs its
// files on PostgreSQL (the project app-postgres), after SQLite. The exit code is 0 only when
// every command passes. Extra arguments go to every vitest run (e.g. `npm test -- -t "sign-in"`).
import { spawn } from "node:child_process";
import { createInterface } from "node:readline";

const bin = (name) => `node_modules/.bin/${name}`;
const extra = process.argv.slice(2);
const filtered = extra.length > 0 ? ["--passWithNoTests"] : [];
const projects = ["app", ...(process.env.TRIANGULATE_TEST_POSTGRES_URL ? ["app-postgres"] : [])].flatMap((p) => ["--project", p]);
const browserFiles = "tests/app/browser-*.test.ts";

/** Runs one command, its output lines prefixed with `[label]`; resolves to its exit code. */
function run(label, command, args, env = {}) {
  return new Promise((resolve) => {
    const child = spawn(command, args, { stdio: ["ignore", "pipe", "pipe"], env: { ...process.env, ...env } });
    for (const stream of [child.stdout, child.stderr]) createInterface({ input: stream }).on("line", (line) => console.log(`[${label}] ${line}`));
    child.on("close", (code, signal) => resolve(code ?? (signal ? 1 : 0)));
  });
}

const started = Date.now();
const results = {};
const step = async (label, command, args, env) => (results[label] = await run(label, command, args, env));
const appEnv = { TRIANGULATE_SKIP_BUILD: "1" };

const build = step("build", bin("next"), ["build"], { NEXT_TELEMETRY_DISABLED: "1" });
await Promise.all([
  (async () => {
    await step("tsc", bin("tsc"), ["--noEmit"]);
    await step("unit", bin("vitest"), ["run", "--project", "unit", ...filtered, ...extra]);
    if ((await build) === 0) await step("browser", bin("vitest"), ["run", ...projects, ...filtered, ...extra, browserFiles.replace("*.test.ts", "")], appEnv);
  })(),
  (async () => {
    if ((await build) === 0) await step("app", bin("vitest"), ["run", ...projects, "--exclude", browserFiles, ...filtered, ...extra], appEnv);
  })(),
]);

const seconds = Math.round((Date.now() - started) / 1000);
const failed = ["tsc", "unit", "build", "browser", "app"].filter((label) => results[label] !== 0);
console.log(`npm test: ${failed.length === 0 ? "all passed" : `failed or not run: ${failed.join(", ")}`} (${seconds} s)`);
process.exit(failed.length === 0 ? 0 : 1);
