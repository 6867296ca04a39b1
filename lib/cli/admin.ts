/**
 * Admin commands of `triangulate` (registered in lib/cli/main.ts):
 *
 *   triangulate create-organiser --email E --name N --password P [--role organiser|reviewer]
 *   triangulate create-token --email E [--name N] [--days D]
 *   triangulate backup FILE
 *   triangulate demo [--if-empty]
 *
 * They use the database named by DATABASE_URL (a `file:` URL), else data/triangulate.db.
 * Exit codes as lib/cli/main.ts: 0 success, 1 bad input data (e.g. e-mail taken), 2 bad usage.
 */
import { existsSync } from "node:fs";
import path from "node:path";
import { parseArgs } from "node:util";
import type { CommandIo } from "./main";

const CREATE_USAGE =
  "usage: triangulate create-organiser --email E --name N --password P [--role organiser|reviewer]\n" +
  "       (--password - reads the password from the first line of standard input, keeping it out of the process list)\n";
const TOKEN_USAGE =
  "usage: triangulate create-token --email E [--name N] [--days D]\n" +
  "       prints a new personal API token of the organiser E once (default name 'created on the server', 90 days);\n" +
  "       asks no password: it runs on the server, with the database's own access\n";
const BACKUP_USAGE = "usage: triangulate backup FILE\n";
const DEMO_USAGE = "usage: triangulate demo [--if-empty]\n";

function usageError(io: CommandIo, usage: string, message?: string): number {
  io.err(`${message ? `triangulate: ${message}\n` : ""}${usage}`);
  return 2;
}

async function disconnect(): Promise<void> {
  const { db } = await import("../db");
  await db.$disconnect();
}

/** `create-organiser`: creates an organiser (or, with --role reviewer, a reviewer) account. */
export async function createOrganiser(args: string[], io: CommandIo): Promise<number> {
  let values: { email?: string; name?: string; password?: string; role?: string; help?: boolean };
  try {
    ({ values } = parseArgs({
      args,
      options: {
        email: { type: "string" },
        name: { type: "string" },
        password: { type: "string" },
        role: { type: "string", default: "organiser" },
        help: { type: "boolean", short: "h" },
      },
      strict: true,
      allowPositionals: false,
    }));
  } catch (err) {
    return usageError(io, CREATE_USAGE, (err as Error).message);
  }
  if (values.help) {
    io.out(CREATE_USAGE);
    return 0;
  }
  const { setupInput, USER_ROLES } = await import("../validation/inputs");
  const { plainMessage } = await import("../validation/messages");
  const password = values.password === "-" ? io.stdin().split(/\r?\n/)[0] : values.password;
  const parsed = setupInput.safeParse({ email: values.email, name: values.name, password });
  if (!parsed.success) {
    return usageError(io, CREATE_USAGE, parsed.error.issues.map((i) => `--${i.path.join(".")}: ${plainMessage(i)}`).join("; "));
  }
  const role = values.role as (typeof USER_ROLES)[number];
  if (!USER_ROLES.includes(role)) return usageError(io, CREATE_USAGE, `--role must be organiser or reviewer (got "${values.role}")`);
  const { createUser } = await import("../accounts/users");
  const { DomainError } = await import("../errors");
  try {
    const user = await createUser({ ...parsed.data, role });
    io.out(`created ${user.role} ${user.email} (${user.name})\n`);
    return 0;
  } catch (err) {
    if (err instanceof DomainError) {
      io.err(`triangulate: ${err.message}\n`);
      return 1;
    }
    throw err;
  } finally {
    await disconnect();
  }
}

/**
 * `create-token`: a personal API token for an organiser, printed once, for API clients that
 * cannot replay the browser sign-in. Same checks as POST /api/v1/tokens (apiTokenCreate).
 */
export async function createToken(args: string[], io: CommandIo): Promise<number> {
  let values: { email?: string; name?: string; days?: string; help?: boolean };
  try {
    ({ values } = parseArgs({
      args,
      options: { email: { type: "string" }, name: { type: "string", default: "created on the server" }, days: { type: "string" }, help: { type: "boolean", short: "h" } },
      strict: true,
      allowPositionals: false,
    }));
  } catch (err) {
    return usageError(io, TOKEN_USAGE, (err as Error).message);
  }
  if (values.help) {
    io.out(TOKEN_USAGE);
    return 0;
  }
  if (!values.email) return usageError(io, TOKEN_USAGE, "--email is required");
  const { apiTokenCreate } = await import("../validation/inputs");
  const { plainMessage } = await import("../validation/messages");
  const days = values.days === undefined ? undefined : /^\d+$/.test(values.days) ? Number(values.days) : NaN;
  const parsed = apiTokenCreate.safeParse({ name: values.name, ...(days === undefined ? {} : { expiresInDays: days }) });
  if (!parsed.success) {
    const option = (field: PropertyKey | undefined) => (field === "expiresInDays" ? "days" : String(field));
    return usageError(io, TOKEN_USAGE, parsed.error.issues.map((i) => `--${option(i.path[0])}: ${plainMessage(i)}`).join("; "));
  }
  const { createApiTokenFor } = await import("../accounts/users");
  const { DomainError } = await import("../errors");
  try {
    const made = await createApiTokenFor(values.email, parsed.data);
    io.out(`${made.token}\n`);
    io.err(`created API token "${made.name}" for ${values.email}, expires ${made.expiresAt}; it is shown only now\n`);
    return 0;
  } catch (err) {
    if (err instanceof DomainError) {
      io.err(`triangulate: ${err.message}\n`);
      return 1;
    }
    throw err;
  } finally {
    await disconnect();
  }
}

/**
 * `backup FILE`: a consistent copy of the live database through SQLite's online backup API
 * (better-sqlite3 `.backup()`), safe while the app is running. Refuses to overwrite a file.
 */
export async function backup(args: string[], io: CommandIo): Promise<number> {
  if (args.length !== 1 || args[0].startsWith("-")) {
    if (args[0] === "--help" || args[0] === "-h") {
      io.out(BACKUP_USAGE);
      return 0;
    }
    return usageError(io, BACKUP_USAGE, args.length === 0 ? "missing FILE" : undefined);
  }
  const target = path.resolve(args[0]);
  if (existsSync(target)) {
    io.err(`triangulate: ${target} already exists; choose a new file name\n`);
    return 1;
  }
  const { databaseFile, isPostgresUrl } = await import("../env-db");
  if (isPostgresUrl(process.env.DATABASE_URL)) {
    io.err("triangulate: backup copies the embedded SQLite database; for PostgreSQL use its own tools (pg_dump, or continuous archiving)\n");
    return 1;
  }
  const source = databaseFile();
  if (!existsSync(source)) {
    io.err(`triangulate: no database at ${source}\n`);
    return 1;
  }
  const { default: Database } = await import("better-sqlite3");
  const conn = new Database(source, { fileMustExist: true });
  try {
    const result = await conn.backup(target);
    io.out(`backed up ${source} to ${target} (${result.totalPages} pages)\n`);
    return 0;
  } finally {
    conn.close();
  }
}

/** `demo [--if-empty]`: loads the Quillmoor Instruments demo (lib/cli/demo.ts). */
export async function demo(args: string[], io: CommandIo): Promise<number> {
  let ifEmpty = false;
  for (const a of args) {
    if (a === "--if-empty") ifEmpty = true;
    else if (a === "--help" || a === "-h") {
      io.out(DEMO_USAGE);
      return 0;
    } else return usageError(io, DEMO_USAGE, `unknown argument '${a}'`);
  }
  const { loadDemo } = await import("./demo");
  try {
    return await loadDemo({ ifEmpty }, io);
  } finally {
    await disconnect();
  }
}
