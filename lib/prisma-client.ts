/**
 * The one type of the app's Prisma client, on either database. Both generated clients come from
 * the same models (prisma/schema.prisma; scripts/postgres-schema.mjs derives the PostgreSQL
 * schema), but TypeScript cannot relate two separately generated clients, so one type is chosen:
 * the SQLite client's, which offers only what both databases support (the PostgreSQL client adds
 * options such as case-insensitive filters and more isolation levels, none of which the app
 * uses). `SqliteOnlyOperations` below proves, at compile time, that for every model and every
 * operation the SQLite client's arguments are arguments the PostgreSQL client accepts and the
 * results are the same types; a schema or Prisma change that breaks this fails `tsc` naming the
 * model and operation. Only then is the PostgreSQL client used under this type.
 */
import type { Prisma as SqlitePrisma, PrismaClient } from "./generated/prisma/client";
import type { Prisma as PostgresPrisma, PrismaClient as PostgresPrismaClient } from "./generated/prisma-pg/client";

/** The app's Prisma client, SQLite or PostgreSQL. */
export type AppPrismaClient = PrismaClient;

type SqliteModels = SqlitePrisma.TypeMap["model"];
type PostgresModels = PostgresPrisma.TypeMap["model"];

/** [model, operation, what differs] for each operation whose SQLite arguments PostgreSQL does not accept, or whose results differ; never when none. */
type SqliteOnlyOperations = {
  [M in keyof SqliteModels]: {
    [O in keyof SqliteModels[M]["operations"]]: M extends keyof PostgresModels
      ? O extends keyof PostgresModels[M]["operations"]
        ? [SqliteModels[M]["operations"][O], PostgresModels[M]["operations"][O]] extends [{ args: infer A; result: infer R }, { args: infer B; result: infer Q }]
          ? [A] extends [B]
            ? [R, Q] extends [Q, R]
              ? never
              : [M, O, "result"]
            : [M, O, "arguments"]
          : [M, O, "shape"]
        : [M, O, "missing on PostgreSQL"]
      : [M, "missing on PostgreSQL"];
  }[keyof SqliteModels[M]["operations"]];
}[keyof SqliteModels];

const sameOperations: [SqliteOnlyOperations] extends [never] ? true : SqliteOnlyOperations = true;
void sameOperations;

/**
 * The PostgreSQL client under the app's one client type: the one conversion between the two
 * generated types, sound for every model operation by `SqliteOnlyOperations`. Of the client's own
 * methods the SQLite type offers $connect, $disconnect, $queryRaw/$executeRaw (tagged templates
 * on both) and $transaction with the isolation level "Serializable" only, which PostgreSQL has.
 */
export function appPrismaClient(client: PostgresPrismaClient): AppPrismaClient {
  return client as unknown as AppPrismaClient;
}
