#!/usr/bin/env node
// `npm start`: apply migrations to the database (the embedded SQLite file unless DATABASE_URL
// names another, e.g. PostgreSQL), load the demo on first start,
// build the production app when the sources are newer than the last build, then serve on $PORT.
import { spawnSync, spawn } from "node:child_process";
import { existsSync, mkdirSync, readFileSync, statSync, writeFileSync, readdirSync } from "node:fs";
import path from "node:path";
import { randomBytes } from "node:crypto";

const root = path.resolve(path.dirname(new URL(import.meta.url).pathname), "..");
process.chdir(root);
const bin = (name) => path.join(root, "node_modules", ".bin", name);

function run(cmd, args, env = process.env) {
  const r = spawnSync(cmd, args, { stdio: "inherit", env });
  if (r.status !== 0) {
    console.error(`triangulate: "${path.basename(cmd)} ${args.join(" ")}" failed (exit ${r.status})`);
    process.exit(r.status ?? 1);
  }
}

const dataDir = path.join(root, "data");
mkdirSync(dataDir, { recursive: true });
const env = { NEXT_TELEMETRY_DISABLED: "1", ...process.env };
env.DATABASE_URL ??= `file:${path.join(dataDir, "triangulate.db")}`;
env.PORT ??= "3000";
env.NEXTAUTH_URL ??= `http://localhost:${env.PORT}`;
if (!env.NEXTAUTH_SECRET) {
  // A random secret for this installation, kept beside the database so sessions survive restarts.
  const secretFile = path.join(dataDir, "auth-secret");
  if (!existsSync(secretFile)) writeFileSync(secretFile, randomBytes(32).toString("base64url"), { mode: 0o600 });
  env.NEXTAUTH_SECRET = readFileSync(secretFile, "utf8").trim();
}

run(process.execPath, [path.join(root, "bin", "triangulate.mjs"), "migrate"], env);
// The demo's sign-ins are kept (data/demo-sign-ins.txt, readable by this user only) and printed
// again at the very end, after the build's output, where they do not scroll away.
const signInsFile = path.join(dataDir, "demo-sign-ins.txt");
const demo = spawnSync(process.execPath, [path.join(root, "bin", "triangulate.mjs"), "demo", "--if-empty"], { stdio: ["ignore", "pipe", "inherit"], env, encoding: "utf8" });
if (demo.status !== 0) {
  process.stdout.write(demo.stdout ?? "");
  console.error(`triangulate: "triangulate demo --if-empty" failed (exit ${demo.status})`);
  process.exit(demo.status ?? 1);
}
if (demo.stdout.includes("password:")) writeFileSync(signInsFile, demo.stdout, { mode: 0o600 });
else process.stdout.write(demo.stdout);
const signIns = existsSync(signInsFile) ? readFileSync(signInsFile, "utf8") : null;

function newestMtime(p) {
  if (!existsSync(p)) return 0;
  const st = statSync(p);
  if (!st.isDirectory()) return st.mtimeMs;
  let newest = 0;
  for (const entry of readdirSync(p)) {
    if (entry === "generated" || entry === "node_modules") continue;
    newest = Math.max(newest, newestMtime(path.join(p, entry)));
  }
  return newest;
}
const buildId = path.join(root, ".next", "BUILD_ID");
const sources = ["app", "lib", "next.config.mjs", "package.json", "prisma"].map((p) => newestMtime(path.join(root, p)));
if (!existsSync(buildId) || Math.max(...sources) > statSync(buildId).mtimeMs) {
  run(bin("next"), ["build"], env);
}

// The production server: Next.js, with the answer route served directly (lib/http/server.ts), its
// main thread's heap bounded (old space and young generation's semi-spaces, lib/work/heap-limits.json;
// the worker threads' bound is set where they start, lib/work/pool.ts) unless NODE_OPTIONS bounds the old space.
const heapLimits = JSON.parse(readFileSync(path.join(root, "lib", "work", "heap-limits.json"), "utf8"));
const heapFlag = /--max-old-space-size/.test(env.NODE_OPTIONS ?? "")
  ? []
  : [`--max-old-space-size=${heapLimits.serverOldSpaceMiB}`, `--max-semi-space-size=${heapLimits.serverSemiSpaceMiB}`];
const server = spawn(process.execPath, [...heapFlag, path.join(root, "bin", "triangulate.mjs"), "serve", "--port", env.PORT], { stdio: ["inherit", "pipe", "inherit"], env });
let announced = false;
server.stdout.on("data", (chunk) => {
  process.stdout.write(chunk);
  if (announced || !String(chunk).includes("serving on")) return;
  announced = true;
  if (signIns) {
    process.stdout.write(
      `\n${"=".repeat(72)}\nSign in at ${env.NEXTAUTH_URL}/sign-in with the demo accounts (kept in ${path.relative(root, signInsFile)}):\n${signIns}` +
        `More accounts: npx triangulate create-organiser --email E --name N --password P [--role reviewer]\n${"=".repeat(72)}\n`,
    );
  } else {
    process.stdout.write(`Sign in at ${env.NEXTAUTH_URL}/sign-in. Make an account with: npx triangulate create-organiser --email E --name N --password P [--role reviewer]\n`);
  }
});
for (const sig of ["SIGINT", "SIGTERM"]) process.on(sig, () => server.kill(sig));
server.on("exit", (code) => process.exit(code ?? 0));
