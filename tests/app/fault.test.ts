/**
 * Crash safety: a SEPARATE production server (its own port and database, not the suite's shared
 * one, of the suite's kind: a SQLite file, or a new PostgreSQL database) receives answers from 80 panelists at 8 in flight; once 60 answers have been
 * acknowledged it is killed with SIGKILL while requests are still in flight. Restarted on the
 * same database file, it must hold every acknowledged answer exactly once (with its acknowledged
 * version and value), nothing that was refused, on SQLite `PRAGMA integrity_check` must be "ok", and the
 * panelists must be able to go on: the requests cut off by the kill are sent again with their
 * original Idempotency-Key (each is either stored now or, if it had been stored before the kill,
 * replayed with its first version — never twice), and new revisions are accepted.
 *
 * What makes this hold on SQLite is lib/db.ts: WAL journal, commits written to the log before the
 * answer is acknowledged; on PostgreSQL, its own commit. The build is the suite's
 * (tests/app/server-setup.ts, NEXT_DIST_DIR).
 */
import { mkdtempSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import {
  Client,
  createOrganiser,
  createPanel,
  freePort,
  migrate,
  newKey,
  organiserToken,
  sendAnswer,
  startServer,
  verifyAnswers,
  type AnswerAttempt,
  type AnswerOutcome,
  type RunningServer,
} from "../harness/harness";
import { freshDatabase, openSql } from "../harness/sql";
import { databaseUrl as suiteDatabase, dialect } from "./api-client";

const dir = mkdtempSync(path.join(os.tmpdir(), "triangulate-fault-"));
let database: Awaited<ReturnType<typeof freshDatabase>> | undefined;
const distDir = process.env.NEXT_DIST_DIR || ".next";
let server: RunningServer | undefined;

afterAll(async () => {
  await server?.stop("SIGKILL");
  await database?.drop();
  rmSync(dir, { recursive: true, force: true });
});

describe("SIGKILL in the middle of a burst of answers", () => {
  it("keeps every acknowledged answer, stays consistent, and panelists can go on", async () => {
    database = await freshDatabase(suiteDatabase, `triangulate_fault_${process.pid}`, dir);
    const databaseUrl = database.url;
    migrate({ databaseUrl, port: 0, distDir });
    server = await startServer({ databaseUrl, port: await freePort(), distDir });
    let client = new Client(server.baseURL, 12);
    const token = await organiserToken(server.baseURL, createOrganiser(databaseUrl));
    const setup = await createPanel(client, token, 80, 2);

    // Answers 1..80 on both questions, then a revision of each; one in 10 is out of bounds (422).
    let n = 0;
    const attempt = (p: (typeof setup.panelists)[number], questionId: string): AnswerAttempt => {
      n++;
      const invalid = n % 10 === 0;
      return { invitationId: p.invitationId, token: p.token, questionId, value: invalid ? 500_000 + n : 1000 + n, idempotencyKey: newKey(), invalid };
    };
    const work = [
      ...setup.panelists.flatMap((p) => setup.questionIds.map((q) => attempt(p, q))),
      ...setup.panelists.flatMap((p) => setup.questionIds.map((q) => attempt(p, q))),
    ];

    // Send with 8 in flight; SIGKILL the server as soon as 60 answers are acknowledged.
    const outcomes: AnswerOutcome[] = [];
    let acknowledged = 0;
    let next = 0;
    const killed = server;
    const worker = async () => {
      while (next < work.length) {
        const a = work[next++];
        const o = await sendAnswer(client, a, 10_000);
        outcomes.push(o);
        if (o.status === 201 && ++acknowledged === 60) killed.child.kill("SIGKILL");
      }
    };
    await Promise.all(Array.from({ length: 8 }, worker));
    await killed.stop("SIGKILL");
    client.close();
    expect(killed.child.signalCode).toBe("SIGKILL");

    const cutOff = outcomes.filter((o) => o.status === 0);
    const answered = outcomes.filter((o) => o.status !== 0);
    // The kill landed mid-load: some requests were answered, some got no response.
    expect(answered.filter((o) => o.status === 201).length).toBeGreaterThanOrEqual(60);
    expect(cutOff.length).toBeGreaterThan(0);
    // Before the kill, every answer got the status it deserved.
    for (const o of answered) expect(o.status).toBe(o.attempt.invalid ? 422 : 201);

    // Restart on the same file; the database is checked while the server runs (WAL readers are fine).
    server = await startServer({ databaseUrl, port: await freePort(), distDir });
    client = new Client(server.baseURL, 12);
    const afterCrash = await verifyAnswers(databaseUrl, outcomes);
    expect(afterCrash.integrity).toBe(dialect === "sqlite" ? "ok" : null);
    expect(afterCrash.missing).toEqual([]);
    expect(afterCrash.duplicated).toEqual([]);
    expect(afterCrash.mismatched).toEqual([]);
    expect(afterCrash.refusedButStored).toEqual([]);
    expect(afterCrash.acknowledged).toBe(answered.filter((o) => o.status === 201).length);
    // A row nobody acknowledged can only come from a request the kill cut off.
    expect(afterCrash.unacknowledgedRows).toBeLessThanOrEqual(cutOff.length);

    // Panelists go on: the cut-off requests again, with their original keys.
    const resent: AnswerOutcome[] = [];
    for (const o of cutOff) resent.push(await sendAnswer(client, o.attempt));
    for (const r of resent) {
      if (r.attempt.invalid) expect(r.status).toBe(422);
      else expect([200, 201]).toContain(r.status);
    }
    // Those stored before the kill come back as replays; exactly as many as there were unacknowledged rows.
    expect(resent.filter((r) => r.status === 200 && r.replayed).length).toBe(afterCrash.unacknowledgedRows);

    // And a new revision from a panelist who answered before the crash gets the next version.
    const before = answered.find((o) => o.status === 201)!;
    const more = await sendAnswer(client, { ...before.attempt, value: 4321, idempotencyKey: newKey() });
    expect(more.status).toBe(201);
    const conn = await openSql(databaseUrl, { readonly: true });
    const [{ v: maxVersion }] = await conn.query<{ v: number }>(`SELECT MAX("version") AS "v" FROM "Answer" WHERE "invitationId" = ? AND "questionId" = ?`, [
      before.attempt.invitationId,
      before.attempt.questionId,
    ]);
    await conn.close();
    expect(more.version).toBe(maxVersion);
    expect(more.version).toBeGreaterThan(1);

    const final = await verifyAnswers(databaseUrl, [...answered, ...resent, more]);
    expect(final.integrity).toBe(dialect === "sqlite" ? "ok" : null);
    expect(final.missing).toEqual([]);
    expect(final.duplicated).toEqual([]);
    expect(final.mismatched).toEqual([]);
    expect(final.refusedButStored).toEqual([]);
    expect(final.unacknowledgedRows).toBe(0);
    client.close();
  });
});
