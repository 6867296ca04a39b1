/**
 * The app's one SQLite connection (lib/db.ts) under interleaved requests. Prisma's better-sqlite3
 * adapter serialises interactive transactions among themselves but lets a statement from outside
 * a transaction run on the same connection while one is open: the statement would then belong to
 * that transaction and vanish if it rolled back (an acknowledged answer lost with someone else's
 * failed round close). lib/db.ts holds such statements back until the transaction has ended.
 * The expected outcomes follow from SQLite's transaction semantics (https://sqlite.org/lang_transaction.html).
 *
 * The second part pins what that gate relies on in @prisma/adapter-better-sqlite3 (the factory's
 * `connect`, the adapter's `client`, `queryRaw`, `executeRaw` and `startTransaction`, the
 * transaction's `commit` and `rollback`, and how Prisma calls them), so that an upgrade of the
 * adapter or of Prisma that changes any of it fails here with a message naming what changed,
 * rather than losing answers silently.
 */
import { readFileSync } from "node:fs";
import path from "node:path";
import Database from "better-sqlite3";
import { PrismaBetterSQLite3 } from "@prisma/adapter-better-sqlite3";
import type { SqlDriverAdapter, SqlQuery } from "@prisma/driver-adapter-utils";
import { beforeAll, describe, expect, it } from "vitest";
import { PrismaClient } from "../../lib/generated/prisma/client";
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

const adapterVersion: string = JSON.parse(
  readFileSync(path.join(__dirname, "..", "..", "node_modules", "@prisma", "adapter-better-sqlite3", "package.json"), "utf8"),
).version;
const changed = (what: string) => `@prisma/adapter-better-sqlite3 ${adapterVersion}: ${what}; the transaction gate in lib/db.ts (holdOutsideStatements) relies on it`;
const query = (sql: string): SqlQuery => ({ sql, args: [], argTypes: [] });

describe("what the transaction gate relies on in the better-sqlite3 driver adapter", () => {
  it("the factory's connect gives an adapter with a better-sqlite3 client and overridable queryRaw, executeRaw and startTransaction", async () => {
    const factory = new PrismaBetterSQLite3({ url: `file:${migratedSqliteDatabase()}` });
    expect(typeof factory.connect, changed("the factory has no connect() to wrap")).toBe("function");
    const adapter = (await factory.connect()) as SqlDriverAdapter & { client?: unknown };
    expect(adapter.client, changed("the adapter no longer exposes its better-sqlite3 connection as `client`")).toBeInstanceOf(Database);
    const client = adapter.client as Database.Database;
    for (const method of ["queryRaw", "executeRaw", "startTransaction", "executeScript"] as const) {
      expect(typeof adapter[method], changed(`the adapter has no ${method}()`)).toBe("function");
    }
    let outside = 0;
    for (const method of ["queryRaw", "executeRaw"] as const) {
      const run = adapter[method].bind(adapter) as (q: SqlQuery) => Promise<never>;
      (adapter as unknown as Record<string, unknown>)[method] = (q: SqlQuery) => (outside++, run(q));
    }
    await adapter.queryRaw(query("SELECT 1"));
    expect(outside, changed("replacing queryRaw on the adapter object does not take effect")).toBe(1);

    const tx = await adapter.startTransaction();
    // BEGIN on the one shared connection: this is why outside statements must wait.
    expect(client.inTransaction, changed("startTransaction no longer opens the transaction on the adapter's own connection")).toBe(true);
    for (const method of ["commit", "rollback", "queryRaw", "executeRaw"] as const) {
      expect(typeof tx[method], changed(`the transaction has no ${method}()`)).toBe("function");
    }
    await tx.executeRaw(query(`INSERT INTO "RateLimitWindow" ("key", "windowStart", "count") VALUES ('in-tx', '2030-01-01T00:00:00.000+00:00', 1)`));
    await tx.queryRaw(query("SELECT 1"));
    expect(outside, changed("a transaction's statements go through the adapter's queryRaw/executeRaw, so the gate would hold the transaction's own statements")).toBe(1);
    await tx.executeRaw(query("ROLLBACK"));
    await tx.rollback();
    expect(client.inTransaction).toBe(false);
    await adapter.dispose();
  });

  it("Prisma calls the factory's connect, the adapter's queryRaw/executeRaw outside transactions, startTransaction and the transaction's commit or rollback", async () => {
    const factory = new PrismaBetterSQLite3({ url: `file:${migratedSqliteDatabase()}` });
    const calls: string[] = [];
    const connect = factory.connect.bind(factory);
    factory.connect = async () => {
      calls.push("connect");
      const adapter = await connect();
      for (const method of ["queryRaw", "executeRaw"] as const) {
        const run = adapter[method].bind(adapter) as (q: SqlQuery) => Promise<never>;
        (adapter as unknown as Record<string, unknown>)[method] = (q: SqlQuery) => (calls.push("outside"), run(q));
      }
      const start = adapter.startTransaction.bind(adapter);
      adapter.startTransaction = async (level) => {
        calls.push("start");
        const tx = await start(level);
        for (const method of ["commit", "rollback"] as const) {
          const end = tx[method].bind(tx);
          tx[method] = () => (calls.push(method), end());
        }
        return tx;
      };
      return adapter;
    };
    const prisma = new PrismaClient({ adapter: factory });
    await prisma.rateLimitWindow.count();
    expect(calls, changed("Prisma no longer connects through the factory's connect() or no longer runs a statement through the adapter's queryRaw/executeRaw")).toEqual(["connect", "outside"]);
    calls.length = 0;
    await prisma.$transaction(async (tx) => {
      await tx.rateLimitWindow.create({ data: { key: "tx", windowStart: new Date(), count: 1 } });
      await tx.rateLimitWindow.count();
    });
    expect(calls, changed("an interactive transaction no longer runs as startTransaction … commit with its statements on the transaction object")).toEqual(["start", "commit"]);
    calls.length = 0;
    await expect(prisma.$transaction(async (tx) => {
      await tx.rateLimitWindow.create({ data: { key: "tx-2", windowStart: new Date(), count: 1 } });
      throw new Error("abort");
    })).rejects.toThrow("abort");
    expect(calls, changed("a failed interactive transaction no longer ends with rollback()")).toEqual(["start", "rollback"]);
    await prisma.$disconnect();
  });

  it("without the gate, a statement from outside runs inside the open transaction and is lost with its rollback", async () => {
    // If this fails, the adapter keeps outside statements out of an open transaction itself and
    // the gate in lib/db.ts may no longer be needed.
    const prisma = new PrismaClient({ adapter: new PrismaBetterSQLite3({ url: `file:${migratedSqliteDatabase()}` }) });
    const failing = prisma
      .$transaction(async (tx) => {
        await tx.rateLimitWindow.create({ data: { key: "inside", windowStart: new Date(), count: 1 } });
        await sleep(150);
        throw new Error("abort");
      })
      .catch((e: Error) => e.message);
    await sleep(30);
    await prisma.rateLimitWindow.create({ data: { key: "outside", windowStart: new Date(), count: 1 } });
    expect(await failing).toBe("abort");
    expect(await prisma.rateLimitWindow.count(), changed("outside statements no longer join an open transaction")).toBe(0);
    await prisma.$disconnect();
  });
});
