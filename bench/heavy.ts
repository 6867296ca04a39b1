/**
 * Answer latency while an organiser's baseline is fitted (issue 11 item 7, issue 13's
 * "no organiser request delays an answer POST"): `npx tsx bench/heavy.ts`.
 *
 * Starts the production build (NEXT_DIST_DIR, default .next; built if missing) on a fresh
 * SQLite database, makes a panel of 2 questions with 100 panelists (the per-invitation rate limit) and round 1 open, then
 * 1. idle: 60 answer POSTs one after another;
 * 2. busy: ROUNDS (default 3) times, an organiser PUTs a 5,000-row baseline (automatic method,
 *    season 12, the largest history accepted) while panelists POST answers one after another
 *    until the PUT has answered.
 * Prints each phase's answer latency (p50, p95, max) and the PUTs' durations. Not a test: the
 * figures depend on the machine and on what else runs on it.
 */
import { mkdtempSync, rmSync } from "node:fs";
import { cpus, loadavg, tmpdir } from "node:os";
import path from "node:path";
import { Client, build, createOrganiser, createPanel, freePort, hasBuild, migrate, newKey, organiserToken, percentile, sendAnswer, startServer, type PanelSetup } from "../tests/harness/harness";
import { freshDatabase } from "../tests/harness/sql";

const distDir = process.env.NEXT_DIST_DIR || ".next";
const ROUNDS = Number(process.env.ROUNDS ?? 3);

/** Invented monthly history: trend, a yearly season and a repeating wobble. */
const CSV = ["month,value", ...Array.from({ length: 5000 }, (_, i) => `${i + 1},${(100 + i * 0.1 + 10 * Math.sin((2 * Math.PI * i) / 12) + ((i * 7919) % 13)).toFixed(3)}`)].join("\n");

let turn = 0;
async function answer(c: Client, setup: PanelSetup): Promise<number> {
  const p = setup.panelists[turn++ % setup.panelists.length];
  const o = await sendAnswer(c, { invitationId: p.invitationId, token: p.token, questionId: setup.questionIds[0], value: 1000 + (turn % 50), idempotencyKey: newKey(), invalid: false });
  if (o.status !== 201) throw new Error(`answer → ${o.status}: ${JSON.stringify(o.body)}`);
  return o.ms;
}

function line(label: string, ms: readonly number[]): string {
  const f = (x: number) => x.toFixed(1).padStart(8);
  return `${label.padEnd(34)} n ${String(ms.length).padStart(4)}   ms p50 ${f(percentile(ms, 50))} p95 ${f(percentile(ms, 95))} max ${f(Math.max(...ms))}`;
}

async function main(): Promise<void> {
  if (!hasBuild(distDir)) build(distDir);
  const dir = mkdtempSync(path.join(tmpdir(), "triangulate-heavy-"));
  const database = await freshDatabase(`file:${path.join(dir, "x.db")}`, "heavy", dir);
  migrate({ databaseUrl: database.url, port: 0, distDir });
  const server = await startServer({ databaseUrl: database.url, port: await freePort(), distDir });
  const c = new Client(server.baseURL, 8);
  try {
    console.log(`build ${distDir}; machine: ${cpus().length} cores, load average ${loadavg().map((x) => x.toFixed(2)).join(" ")}`);
    const token = await organiserToken(server.baseURL, createOrganiser(database.url));
    const setup = await createPanel(c, token, 100, 2);
    for (let i = 0; i < 10; i++) await answer(c, setup); // warm-up
    const idle: number[] = [];
    for (let i = 0; i < 60; i++) idle.push(await answer(c, setup));
    const busy: number[] = [];
    const puts: number[] = [];
    for (let r = 0; r < ROUNDS; r++) {
      let done = false;
      const put = c
        .request("PUT", `/api/v1/panels/${setup.panelId}/questions/${setup.questionIds[1]}/baseline`, { token, body: { csv: CSV, season: 12, horizon: 4 }, timeoutMs: 600_000 })
        .then((res) => {
          done = true;
          if (res.status !== 200) throw new Error(`baseline → ${res.status}: ${JSON.stringify(res.body)}`);
          puts.push(res.ms);
        });
      while (!done) busy.push(await answer(c, setup));
      await put;
    }
    console.log(line("answers, idle", idle));
    console.log(line("answers while a baseline is fitted", busy));
    console.log(line("baseline PUT (5,000 rows, auto, m=12)", puts));
  } finally {
    c.close();
    await server.stop();
    await database.drop();
    rmSync(dir, { recursive: true, force: true });
  }
}

main().catch((err) => {
  console.error(err);
  process.exitCode = 1;
});
