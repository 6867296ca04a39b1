import { mkdirSync } from "node:fs";
import path from "node:path";

/** True when `url` names a PostgreSQL database (`postgres://` or `postgresql://`). */
export function isPostgresUrl(url: string | undefined): url is string {
  return url !== undefined && /^postgres(ql)?:\/\//.test(url);
}

/**
 * The SQLite file the app and the Prisma CLI use: `DATABASE_URL` (a `file:` URL)
 * when set, else `data/triangulate.db` under the working directory.
 */
export function databaseFile(env: NodeJS.ProcessEnv = process.env): string {
  const url = env.DATABASE_URL;
  if (!url) return path.resolve("data", "triangulate.db");
  if (!url.startsWith("file:")) {
    throw new Error(`DATABASE_URL must be a file: URL for SQLite or a postgresql:// URL (got "${url.split(":")[0]}:")`);
  }
  return path.resolve(url.slice("file:".length));
}

/** {@link databaseFile}, with its folder created if missing (SQLite creates the file itself). */
export function ensureDatabaseFile(env: NodeJS.ProcessEnv = process.env): string {
  const file = databaseFile(env);
  mkdirSync(path.dirname(file), { recursive: true });
  return file;
}
