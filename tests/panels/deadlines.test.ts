/**
 * Rounds whose deadline has passed are closed by lib/panels/access.ts, the way into every
 * panel's state, before the service reads anything (lib/panels/round-closing.ts). Checked on the
 * demo's running panel in a fresh SQLite file: its open round's deadline is moved into the past,
 * then the organiser's list of panels, the organiser's panel view and the panelist's feedback each
 * see the round closed at its deadline, closed once, with a "round.closed" audit event. And no
 * other module calls settleDeadlines, so no service, route or page can forget it.
 */
import { readdirSync, readFileSync, rmSync } from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { migratedSqliteDatabase } from "../helpers/migrated-sqlite";

// Nothing that imports lib/db may be imported statically (see tests/panels/demo-history.test.ts).
type Db = typeof import("../../lib/db").db;
let db: Db;
let organiser: import("../../lib/accounts/actor").Actor;
let panelId: string;
let file: string;

beforeAll(async () => {
  file = migratedSqliteDatabase();
  ({ db } = await import("../../lib/db"));
  expect((await db.$queryRawUnsafe<{ file: string }[]>("PRAGMA database_list")).map((d) => d.file)).toContain(file);
  const { loadDemo } = await import("../../lib/cli/demo");
  const out: string[] = [];
  expect(await loadDemo({ ifEmpty: true }, { out: (t) => out.push(t), err: (t) => out.push(t), stdin: () => "" })).toBe(0);
  const { actorFromUserId } = await import("../../lib/accounts/actor");
  organiser = (await actorFromUserId((await db.user.findUniqueOrThrow({ where: { email: "organiser@quillmoor.example" } })).id))!;
  panelId = (await db.round.findFirstOrThrow({ where: { status: "open", deadline: { not: null } } })).panelId;
  // Room for the two further rounds the tests open (the demo's limit is the default 3).
  await db.panel.update({ where: { id: panelId }, data: { roundLimit: 5 } });
}, 120_000);

afterAll(async () => {
  await db?.$disconnect();
  rmSync(path.dirname(file), { recursive: true, force: true });
});

/** Moves the panel's open round's deadline to one minute ago; returns the round and that deadline. */
async function overdue(): Promise<{ id: string; number: number; deadline: Date }> {
  const round = await db.round.findFirstOrThrow({ where: { panelId, status: "open" } });
  const deadline = new Date(Math.floor(Date.now() / 1000) * 1000 - 60_000);
  await db.round.update({ where: { id: round.id }, data: { deadline } });
  return { id: round.id, number: round.number, deadline };
}

async function expectClosedAtDeadline(round: { id: string; number: number; deadline: Date }): Promise<void> {
  const stored = await db.round.findUniqueOrThrow({ where: { id: round.id } });
  expect(stored.status).toBe("closed");
  expect(stored.closedAt?.getTime()).toBe(round.deadline.getTime());
  const events = await db.auditEvent.findMany({ where: { panelId, action: "round.closed" } });
  const closings = events.filter((e) => (JSON.parse(e.detail) as { round: number }).round === round.number);
  expect(closings.map((e) => JSON.parse(e.detail))).toEqual([{ round: round.number, by: "deadline" }]);
}

/** Opens the next round (due in a day) so that it can be made overdue again. */
async function nextRound(): Promise<void> {
  const { startNextRound } = await import("../../lib/panels/rounds");
  await startNextRound(organiser, panelId, { open: true, deadline: new Date(Date.now() + 86_400_000).toISOString() });
}

describe("overdue rounds close before a service reads the panel", () => {
  it("the organiser's list of panels shows the round closed", async () => {
    const round = await overdue();
    const { listPanels } = await import("../../lib/panels/panels");
    const listed = (await listPanels(organiser)).find((p) => p.id === panelId)!;
    expect(listed.currentRound?.number).toBe(round.number);
    expect(listed.currentRound?.status).toBe("closed");
    await expectClosedAtDeadline(round);
  });

  it("the organiser's panel view shows the round closed", async () => {
    await nextRound();
    const round = await overdue();
    const { getPanel } = await import("../../lib/panels/panels");
    const view = await getPanel(organiser, panelId);
    expect(view.rounds.find((r) => r.number === round.number)?.status).toBe("closed");
    await expectClosedAtDeadline(round);
  });

  it("the panelist's feedback is that of the round just closed", async () => {
    await nextRound();
    const round = await overdue();
    const invitation = await db.invitation.findFirstOrThrow({ where: { panelId, revokedAt: null } });
    const { getFeedback } = await import("../../lib/panels/feedback");
    const feedback = await getFeedback({ kind: "panelist", invitationId: invitation.id, panelId, pseudonym: invitation.pseudonym });
    expect(feedback.round).toBe(round.number);
    await expectClosedAtDeadline(round);
  });
});

describe("settleDeadlines has one caller", () => {
  it("only lib/panels/access.ts calls it (round-closing.ts defines it)", () => {
    const root = path.resolve(__dirname, "../..");
    const files = (dir: string): string[] =>
      readdirSync(path.join(root, dir), { withFileTypes: true }).flatMap((e) =>
        e.isDirectory() ? (e.name === "generated" ? [] : files(`${dir}/${e.name}`)) : /\.(ts|tsx)$/.test(e.name) ? [`${dir}/${e.name}`] : [],
      );
    const callers = ["lib", "app", "bench"].flatMap(files).filter((f) => /\bsettleDeadlines\s*\(/.test(readFileSync(path.join(root, f), "utf8")));
    expect(callers.sort()).toEqual(["lib/panels/access.ts", "lib/panels/round-closing.ts"]);
  });
});
