/**
 * The app's one SQLite connection (lib/db.ts) under interleaved requests. Prisma's better-sqlite3
 * adapter serialises interactive transactions among themselves but lets a statement from outside
 * a transaction run on the same connection while one is open: the statement would then belong to
 * that transaction and vanish if it rolled back (an acknowledged answer lost with someone else's
 * failed round close). lib/db.ts holds such statements back until the transaction has ended.
 * The expected outcomes follow from SQLite's transaction semantics (https://sqlite.org/lang_transaction.html).
 */
import { beforeAll, describe, expect, it } from "vitest";
import { migratedSqliteDatabase } from "../helpers/migrated-sqlite";

let db: typeof import("../../lib/db");

beforeAll(async () => {
  migratedSqliteDatabase();
  db = await import("../../lib/db");
});

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

describe("one SQLite connection shared by concurrent requests", () => {
  it("a write made outside a transaction survives another request's transaction rolling back", async () => {
    const failing = db.db
      .$transaction(async (tx) => {
        await tx.rateLimitWindow.create({ data: { key: "inside", windowStart: new Date(), count: 1 } });
        await sleep(150);
        throw new Error("abort");
      })
      .catch((e: Error) => e.message);
    await sleep(30);
    await db.db.rateLimitWindow.create({ data: { key: "outside-orm", windowStart: new Date(), count: 1 } });
    await db.statements.countRateLimitHit("outside-direct", new Date(), new Date(0));
    expect(await failing).toBe("abort");
    const keys = (await db.db.rateLimitWindow.findMany({ select: { key: true }, orderBy: { key: "asc" } })).map((r) => r.key);
    expect(keys).toEqual(["outside-direct", "outside-orm"]);
  });

  it("statements held back for a transaction run once it commits, in order", async () => {
    const order: string[] = [];
    const tx = db.db.$transaction(async (t) => {
      await t.rateLimitWindow.create({ data: { key: "tx", windowStart: new Date(), count: 1 } });
      await sleep(60);
      order.push("tx done");
    });
    await sleep(10);
    const outside = db.statements.rateLimitWindow("tx").then((w) => {
      order.push("outside read");
      return w?.count;
    });
    await tx;
    // The read waited for the commit, so it sees the transaction's row.
    expect(await outside).toBe(1);
    expect(order).toEqual(["tx done", "outside read"]);
  });
});
