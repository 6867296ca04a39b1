/**
 * `triangulate backup FILE` while the app runs and panelists are answering: a SEPARATE server on
 * its own database (as in fault.test.ts) takes a burst of answers; the backup command runs in the
 * middle of it. The copy must pass `PRAGMA integrity_check` and be a consistent snapshot (every
 * answer in it is in the live database, identical, and each panelist's versions run 1…n with no
 * gap — no half-written transaction). A second backup, taken with the server still running but
 * idle, must hold exactly the same rows as the live database in every table; and a server started
 * on that copy (the restore) serves the panelists' answers.
 */
import { execFile } from "node:child_process";
import { mkdtempSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { promisify } from "node:util";
import Database from "better-sqlite3";
import { afterAll, describe, expect, it } from "vitest";
import { dialect } from "./api-client";
import { Client, createOrganiser, createPanel, freePort, migrate, newKey, organiserToken, pool, root, sendAnswer, startServer, type RunningServer } from "../harness/harness";

const run = promisify(execFile);
const dir = mkdtempSync(path.join(os.tmpdir(), "triangulate-backup-"));
const dbFile = path.join(dir, "live.db");
const distDir = process.env.NEXT_DIST_DIR || ".next";
const servers: RunningServer[] = [];

afterAll(async () => {
  for (const s of servers) await s.stop("SIGKILL");
  rmSync(dir, { recursive: true, force: true });
});

function backup(target: string) {
  return run(process.execPath, [path.join(root, "bin", "triangulate.mjs"), "backup", target], { cwd: root, env: { ...process.env, DATABASE_URL: `file:${dbFile}` } });
}

function rows(file: string, sql: string): unknown[] {
  const conn = new Database(file, { readonly: true, fileMustExist: true });
  try {
    return conn.prepare(sql).all();
  } finally {
    conn.close();
  }
}

// The backup command copies the embedded SQLite file; on PostgreSQL it refuses and points to the
// database's own tools (tests/cli/admin.test.ts). This file runs its own SQLite servers, so the
// PostgreSQL run of the suite leaves it to the SQLite run.
describe.skipIf(dialect === "postgresql")("online backup", () => {
  it("copies a consistent snapshot during writes, the same data when idle, and the copy serves the app", async () => {
    migrate({ databaseUrl: `file:${dbFile}`, port: 0, distDir });
    const server = await startServer({ databaseUrl: `file:${dbFile}`, port: await freePort(), distDir });
    servers.push(server);
    const client = new Client(server.baseURL, 12);
    const token = await organiserToken(server.baseURL, createOrganiser(`file:${dbFile}`));
    const setup = await createPanel(client, token, 40, 2);
    const work = [0, 1, 2].flatMap((rep) =>
      setup.panelists.flatMap((p, i) => setup.questionIds.map((q) => ({ invitationId: p.invitationId, token: p.token, questionId: q, value: 100 * rep + i, idempotencyKey: newKey(), invalid: false }))),
    );

    // The backup starts once a quarter of the answers are in, while the rest keep coming.
    let done = 0;
    let during: Promise<unknown> | undefined;
    const duringFile = path.join(dir, "during.db");
    const outcomes = await pool(work, 8, async (a) => {
      const o = await sendAnswer(client, a);
      if (++done === Math.floor(work.length / 4)) during = backup(duringFile);
      return o;
    });
    expect(outcomes.every((o) => o.status === 201)).toBe(true);
    const { stdout } = (await during) as { stdout: string };
    expect(stdout).toMatch(/backed up .* pages/);

    expect(rows(duringFile, "PRAGMA integrity_check")).toEqual([{ integrity_check: "ok" }]);
    const copied = rows(duringFile, `SELECT id, invitationId, questionId, version, value, idempotencyKey FROM "Answer" ORDER BY id`) as { id: string }[];
    const live = new Map((rows(dbFile, `SELECT id, invitationId, questionId, version, value, idempotencyKey FROM "Answer"`) as { id: string }[]).map((r) => [r.id, r]));
    expect(copied.length).toBeGreaterThan(0);
    for (const r of copied) expect(live.get(r.id)).toEqual(r);
    const gaps = rows(duringFile, `SELECT invitationId, questionId FROM "Answer" GROUP BY invitationId, questionId HAVING COUNT(*) <> MAX(version) OR COUNT(DISTINCT version) <> COUNT(*)`);
    expect(gaps).toEqual([]);

    // Idle, server still running: the copy equals the live database table by table.
    const idleFile = path.join(dir, "idle.db");
    await backup(idleFile);
    const tables = (rows(dbFile, `SELECT name FROM sqlite_master WHERE type = 'table' AND name NOT LIKE 'sqlite_%' ORDER BY name`) as { name: string }[]).map((t) => t.name);
    expect(tables).toContain("Answer");
    for (const t of tables) expect(rows(idleFile, `SELECT * FROM "${t}" ORDER BY rowid`), t).toEqual(rows(dbFile, `SELECT * FROM "${t}" ORDER BY rowid`));
    client.close();

    // Restore: a server on the copy serves a panelist's latest answers.
    const restored = await startServer({ databaseUrl: `file:${idleFile}`, port: await freePort(), distDir });
    servers.push(restored);
    const c2 = new Client(restored.baseURL, 4);
    const me = setup.panelists[7];
    const view = await c2.request("GET", "/api/v1/panelist/panel", { token: me.token });
    expect(view.status).toBe(200);
    const answers = (view.body.questions as { answer: { value: number; version: number } }[]).map((q) => q.answer);
    expect(answers.map((a) => [a.version, a.value])).toEqual([
      [3, 207],
      [3, 207],
    ]);
    c2.close();
  });
});
