/**
 * `npm run load`: answers under load, measured, then checked for loss and duplicates.
 *
 * 1. Builds the production app into NEXT_DIST_DIR (default .next-load) unless a build is there
 *    (LOAD_REBUILD=1 forces one), migrates a fresh database and starts INSTANCES app instances
 *    (`triangulate serve`, default 1) on free 127.0.0.1 ports, all on that one database. The database is
 *    a SQLite file in a temporary folder, or, with `--database postgresql://…` (or
 *    LOAD_DATABASE_URL), a new database `triangulate_load_<time>` created on that PostgreSQL
 *    server (the role needs CREATEDB) and dropped afterwards.
 * 2. Through the JSON API with an organiser's API token: PANELISTS roster members, a panel with
 *    QUESTIONS single-value questions, an invitation for each, round 1 opened.
 * 3. Warm-up (not timed): a GET per panelist (up to CONCURRENCY × INSTANCES) and one answer per
 *    panelist to an extra warm-up question (stored, and verified with the rest).
 *    Load, CONCURRENCY requests in flight, spread round-robin over the instances (so one
 *    panelist's answers reach different instances): every panelist answers every question, then half of
 *    them revise every answer. One request in 50 is deliberately invalid (outside the plausible
 *    bounds) and must be refused with 422. Every request carries a fresh Idempotency-Key.
 * 4. Prints throughput (answer requests per second over the whole load phase), p50/p95/p99
 *    latency, the count of each status and whether the target (500/s, p99 under 200 ms) was met; and, for scale, the same for 1,000 GETs of an unknown
 *    API path (404 from the catch-all route, no database): the framework's ceiling here; and the
 *    server's and the load client's CPU time per request (from /proc), which, unlike wall time,
 *    other work on a shared machine hardly changes.
 * 5. Retries RETRIES acknowledged requests with their original key: each must return 200 with the
 *    same version, and no row may be added.
 * 6. Stops the servers and checks the database directly (tests/harness/sql.ts): every acknowledged answer
 *    is stored exactly once with its acknowledged version and value, no refused answer is stored,
 *    versions run 1…n without gaps, and (SQLite) `PRAGMA integrity_check` is ok.
 *
 * Arguments: `--database URL` (a postgresql:// server to create the load database on),
 * `--instances N`. Settings (environment): LOAD_DATABASE_URL, INSTANCES (1), PANELISTS (500),
 * QUESTIONS (2), CONCURRENCY (50), RETRIES (25), TRIANGULATE_PG_POOL (connections per instance),
 * NEXT_DIST_DIR (.next-load), LOAD_REBUILD, TRIANGULATE_SQLITE_SYNCHRONOUS (NORMAL or FULL, passed
 * to the server; lib/db.ts), TRIANGULATE_DIRECT_ROUTES=off (every request through Next.js, no direct
 * answer route; lib/http/server.ts), SERVER_NODE_ARGS (e.g. "--cpu-prof --cpu-prof-dir=/tmp/prof"). Exit code 1 when any check fails. Traffic goes
 * only to the servers this script starts; the run ends by itself.
 */
import { mkdtempSync, rmSync } from "node:fs";
import { cpus, loadavg, tmpdir } from "node:os";
import path from "node:path";
import { performance } from "node:perf_hooks";
import {
  build,
  Client,
  createOrganiser,
  cpuSeconds,
  createPanel,
  freePort,
  hasBuild,
  migrate,
  mulberry32,
  newKey,
  organiserToken,
  percentile,
  pool,
  sendAnswer,
  startServer,
  verifyAnswers,
  type AnswerAttempt,
  type AnswerOutcome,
  type RunningServer,
} from "../tests/harness/harness";
import { freshDatabase, openSql } from "../tests/harness/sql";

/** `--name value` from the command line, else the environment variable, else the default. */
function setting(flag: string, variable: string, fallback: string): string {
  const i = process.argv.indexOf(`--${flag}`);
  return (i >= 0 ? process.argv[i + 1] : undefined) ?? process.env[variable] ?? fallback;
}

const PANELISTS = Number(process.env.PANELISTS ?? 500);
const QUESTIONS = Number(process.env.QUESTIONS ?? 2);
const CONCURRENCY = Number(process.env.CONCURRENCY ?? 50);
const RETRIES = Number(process.env.RETRIES ?? 25);
const distDir = process.env.NEXT_DIST_DIR || ".next-load";
const INSTANCES = Number(setting("instances", "INSTANCES", "1"));
const POSTGRES = setting("database", "LOAD_DATABASE_URL", "");

function summarise(label: string, outcomes: readonly AnswerOutcome[], seconds: number): void {
  const ms = outcomes.filter((o) => o.status !== 0).map((o) => o.ms);
  const statuses = new Map<number, number>();
  for (const o of outcomes) statuses.set(o.status, (statuses.get(o.status) ?? 0) + 1);
  const fmt = (x: number) => x.toFixed(1).padStart(7);
  console.log(
    `${label.padEnd(10)} ${String(outcomes.length).padStart(6)} requests in ${seconds.toFixed(2)} s = ${(outcomes.length / seconds).toFixed(0).padStart(5)} /s` +
      `   latency ms p50 ${fmt(percentile(ms, 50))} p95 ${fmt(percentile(ms, 95))} p99 ${fmt(percentile(ms, 99))} max ${fmt(Math.max(...ms))}` +
      `   statuses ${[...statuses].sort((a, b) => a[0] - b[0]).map(([s, n]) => `${s === 0 ? "no-response" : s}:${n}`).join(" ")}`,
  );
}

async function main(): Promise<number> {
  const started = Date.now();
  if (process.env.LOAD_REBUILD === "1" || !hasBuild(distDir)) {
    console.log(`building into ${distDir} …`);
    build(distDir);
  }
  if (!Number.isInteger(INSTANCES) || INSTANCES < 1 || INSTANCES > 8) throw new Error("--instances must be 1–8");
  const dir = mkdtempSync(path.join(tmpdir(), "triangulate-load-"));
  const database = await freshDatabase(POSTGRES || `file:${path.join(dir, "x.db")}`, POSTGRES ? `triangulate_load_${Date.now()}` : "load", dir);
  const databaseUrl = database.url;
  migrate({ databaseUrl, port: 0, distDir });
  const servers: RunningServer[] = [];
  for (let i = 0; i < INSTANCES; i++) servers.push(await startServer({ databaseUrl, port: await freePort(), distDir }));
  const server = servers[0];
  const clients = servers.map((s) => new Client(s.baseURL, Math.ceil(CONCURRENCY / INSTANCES) + 4));
  const c = clients[0];
  let turn = 0;
  const nextClient = () => clients[turn++ % clients.length];
  let failures = 0;
  try {
    const where = POSTGRES ? `PostgreSQL ${new URL(databaseUrl).host}${new URL(databaseUrl).pathname} (pool ${process.env.TRIANGULATE_PG_POOL ?? 10} per instance)` : `SQLite ${databaseUrl.slice(5)}, synchronous=${process.env.TRIANGULATE_SQLITE_SYNCHRONOUS ?? "NORMAL"}`;
    console.log(`${INSTANCES} instance(s) ${servers.map((s) => `${s.baseURL} (pid ${s.child.pid})`).join(", ")}, build ${distDir}, database ${where}, ${CONCURRENCY} in flight`);
    console.log(`machine: ${cpus().length} cores (${cpus()[0]?.model ?? "?"}), load average ${loadavg().map((x) => x.toFixed(2)).join(" ")}`);
    const user = createOrganiser(databaseUrl);
    const token = await organiserToken(server.baseURL, user);
    const t0 = performance.now();
    // One more question than measured: the warm-up answers go to it.
    const setup = await createPanel(c, token, PANELISTS, QUESTIONS + 1);
    const [warmQuestion, ...questionIds] = setup.questionIds;
    console.log(`setup: ${PANELISTS} roster members, ${QUESTIONS} questions + 1 for the warm-up, ${setup.panelists.length} invitations, round 1 open in ${((performance.now() - t0) / 1000).toFixed(1)} s`);

    const rnd = mulberry32(20261201);
    const attempt = (p: (typeof setup.panelists)[number], questionId: string): AnswerAttempt => {
      const invalid = rnd() < 0.02;
      return {
        invitationId: p.invitationId,
        token: p.token,
        questionId,
        value: invalid ? 200_000 + Math.floor(rnd() * 1000) : 1000 + Math.floor(rnd() * 9000),
        idempotencyKey: newKey(),
        invalid,
      };
    };
    const first = setup.panelists.flatMap((p) => questionIds.map((q) => attempt(p, q)));
    const revisions = setup.panelists.filter((_, i) => i % 2 === 0).flatMap((p) => questionIds.map((q) => attempt(p, q)));

    // Warm-up, not timed: the first requests compile routes and fill caches on every instance.
    // Each panelist reads their panel and answers the warm-up question once; those answers are
    // stored and verified with the others below.
    await pool(setup.panelists.slice(0, CONCURRENCY * INSTANCES), CONCURRENCY, (p) => nextClient().request("GET", "/api/v1/panelist/panel", { token: p.token }));
    const warm = await pool(setup.panelists, CONCURRENCY, (p) => sendAnswer(nextClient(), attempt(p, warmQuestion)));
    console.log(`warm-up (not timed): ${warm.length} answers to the warm-up question, ${warm.filter((w) => w.status === 201).length} stored`);
    if (warm.some((w) => w.status !== (w.attempt.invalid ? 422 : 201))) failures++;

    // The framework's own ceiling on this machine, for scale: an API path that is not in the route
    // table (404 problem+json from the catch-all route: no authentication, no database).
    await pool(Array.from({ length: 200 }), CONCURRENCY, () => nextClient().request("GET", "/api/v1/no-such-operation"));
    const tCeil = performance.now();
    const ceiling = await pool(Array.from({ length: 1000 }), CONCURRENCY, () => nextClient().request("GET", "/api/v1/no-such-operation"));
    const ceilSeconds = (performance.now() - tCeil) / 1000;
    console.log(
      `ceiling: GET of an unknown API path (404, no database): ${(1000 / ceilSeconds).toFixed(0)} /s, p50 ${percentile(ceiling.map((r) => r.ms), 50).toFixed(1)} ms, p99 ${percentile(ceiling.map((r) => r.ms), 99).toFixed(1)} ms`,
    );

    const tLoad = performance.now();
    const serversCpu = () => servers.reduce((sum, s) => sum + cpuSeconds(s.child.pid), 0);
    const serverCpu0 = serversCpu();
    const clientCpu0 = process.cpuUsage();
    const firstOut = await pool(first, CONCURRENCY, (a) => sendAnswer(nextClient(), a));
    const tMid = performance.now();
    const revOut = await pool(revisions, CONCURRENCY, (a) => sendAnswer(nextClient(), a));
    const tEnd = performance.now();
    const serverCpu = serversCpu() - serverCpu0;
    const clientCpu = process.cpuUsage(clientCpu0);
    const all = [...firstOut, ...revOut];
    console.log("");
    summarise("answers", firstOut, (tMid - tLoad) / 1000);
    summarise("revisions", revOut, (tEnd - tMid) / 1000);
    summarise("all", all, (tEnd - tLoad) / 1000);
    const rate = all.length / ((tEnd - tLoad) / 1000);
    const p99 = percentile(all.filter((o) => o.status !== 0).map((o) => o.ms), 99);
    // The target stated for a 2-core machine; reported, not enforced (timing depends on the host).
    console.log(`target (at least 500 answers/s, p99 under 200 ms): ${rate >= 500 && p99 < 200 ? "met" : "not met"}`);
    // CPU time, which the other work on a shared machine does not inflate the way it does wall time.
    console.log(
      `cpu: server ${(serverCpu * 1000 / all.length).toFixed(2)} ms per answer request (${serverCpu.toFixed(2)} s over ${((tEnd - tLoad) / 1000).toFixed(2)} s = ${(serverCpu / ((tEnd - tLoad) / 1000)).toFixed(2)} cores busy, main thread plus GC and I/O threads), ` +
        `load client ${((clientCpu.user + clientCpu.system) / 1000 / all.length).toFixed(2)} ms per request`,
    );

    const unexpected = all.filter((o) => (o.attempt.invalid ? o.status !== 422 : o.status !== 201));
    if (unexpected.length > 0) {
      failures++;
      console.log(`UNEXPECTED: ${unexpected.length} requests, e.g. ${unexpected.slice(0, 3).map((o) => `${o.status} ${JSON.stringify(o.body)}`).join(" | ")}`);
    }

    // Retries with the same key: 200, replayed, same version, nothing added.
    const countRows = async () => {
      const conn = await openSql(databaseUrl, { readonly: true });
      try {
        return (await conn.query<{ n: number }>(`SELECT COUNT(*) AS "n" FROM "Answer"`))[0].n;
      } finally {
        await conn.close();
      }
    };
    const before = await countRows();
    const acked = all.filter((o) => o.status === 201);
    const toRetry = acked.filter((_, i) => i % Math.max(1, Math.floor(acked.length / RETRIES)) === 0).slice(0, RETRIES);
    const retried = await pool(toRetry, 10, (o) => sendAnswer(nextClient(), o.attempt));
    const badRetries = retried.filter((r, i) => r.status !== 200 || r.replayed !== true || r.version !== toRetry[i].version);
    const after = await countRows();
    console.log(`\nretries with the same Idempotency-Key: ${retried.length}, all 200 replayed with the first version: ${badRetries.length === 0 ? "yes" : "NO"}; answer rows ${before} → ${after}`);
    if (badRetries.length > 0 || after !== before) failures++;

    // Panelists can read their answers back (a sample).
    const sample = setup.panelists.slice(0, 5);
    for (const p of sample) {
      const r = await nextClient().request("GET", "/api/v1/panelist/panel", { token: p.token });
      if (r.status !== 200) failures++;
    }

    for (const s of servers) await s.stop();
    const v = await verifyAnswers(databaseUrl, [...warm, ...all, ...retried]);
    console.log(
      `verification (direct SQL): acknowledged ${v.acknowledged}, missing ${v.missing.length}, duplicated ${v.duplicated.length}, ` +
        `stored-but-refused ${v.refusedButStored.length}, mismatched ${v.mismatched.length}, rows without acknowledgement ${v.unacknowledgedRows}, integrity_check ${v.integrity ?? "not applicable (PostgreSQL)"}`,
    );
    if (v.missing.length || v.duplicated.length || v.refusedButStored.length || v.mismatched.length || v.unacknowledgedRows || (v.integrity !== "ok" && v.integrity !== null)) failures++;
    const expectedAcks = [...warm, ...all].filter((o) => !o.attempt.invalid).length;
    if (v.acknowledged !== expectedAcks) {
      console.log(`expected ${expectedAcks} acknowledged answers, got ${v.acknowledged}`);
      failures++;
    }
    console.log(`\n${failures === 0 ? "PASS" : `FAIL (${failures} checks)`} in ${((Date.now() - started) / 1000).toFixed(0)} s`);
  } finally {
    for (const client of clients) client.close();
    for (const s of servers) await s.stop();
    await database.drop();
    rmSync(dir, { recursive: true, force: true });
  }
  return failures === 0 ? 0 : 1;
}

main().then(
  (code) => process.exit(code),
  (err) => {
    console.error(err);
    process.exit(1);
  },
);
