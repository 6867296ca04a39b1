/**
 * `triangulate <command> [arguments]`: the command dispatcher.
 *
 * Each command lives in its own module and is imported only when it runs, so that
 * `triangulate baseline` loads the forecasting engine and nothing else (no Prisma, no Next).
 *
 * Exit codes used by every command: 0 success, 1 bad input data, 2 bad usage (unknown
 * command or option, bad option value).
 */
import { readFileSync } from "node:fs";

/** What a command may touch: its output streams and standard input. */
export interface CommandIo {
  /** Writes to standard output (commands call it once, with the whole output). */
  readonly out: (text: string) => void;
  readonly err: (text: string) => void;
  /** Reads all of standard input as UTF-8. */
  readonly stdin: () => string;
  /** Whether standard error is a terminal (progress lines are written only then). */
  readonly errIsTTY?: boolean;
}

/** A command module's entry point; resolves to the exit code. */
export type CommandRun = (args: string[], io: CommandIo) => Promise<number>;

interface CommandEntry {
  readonly summary: string;
  readonly load: () => Promise<CommandRun>;
}

/**
 * The commands, one entry each, each loading its module only when it runs: `baseline` loads
 * the forecasting engine only; the admin commands (lib/cli/admin.ts) load the database layer.
 */
const COMMANDS: Record<string, CommandEntry> = {
  baseline: {
    summary: "forecast CSV series with a statistical baseline (triangulate baseline --help)",
    load: async () => (await import("./baseline")).run,
  },
  "create-organiser": {
    summary: "create an organiser account (--email E --name N --password P [--role reviewer])",
    load: async () => (await import("./admin")).createOrganiser,
  },
  "create-token": {
    summary: "print a new API token of an organiser (--email E [--name N] [--days D]; no password: runs on the server)",
    load: async () => (await import("./admin")).createToken,
  },
  migrate: { summary: "apply the pending migrations to the database (SQLite or PostgreSQL)", load: async () => (await import("./migrate")).run },
  backup: { summary: "copy the live database to FILE (SQLite online backup)", load: async () => (await import("./admin")).backup },
  serve: { summary: "serve the production build ([--port P] [--hostname H]; npm start builds and serves)", load: async () => (await import("./serve")).run },
  demo: { summary: "load the demo panel of Quillmoor Instruments ([--if-empty])", load: async () => (await import("./admin")).demo },
};

/** The text of `triangulate help`. */
export function helpText(): string {
  const width = Math.max(...Object.keys(COMMANDS).map((c) => c.length), 4);
  const lines = [
    "usage: triangulate <command> [arguments]",
    "",
    "commands:",
    ...Object.entries(COMMANDS).map(([name, c]) => `  ${name.padEnd(width)}  ${c.summary}`),
    `  ${"help".padEnd(width)}  show this list`,
    "",
    "exit codes: 0 success, 1 bad input data, 2 bad usage",
  ];
  return lines.join("\n") + "\n";
}

const defaultIo: CommandIo = {
  out: (t) => process.stdout.write(t),
  err: (t) => process.stderr.write(t),
  stdin: () => readFileSync(0, "utf8"),
  errIsTTY: process.stderr.isTTY === true,
};

/** Runs `triangulate` with the given arguments (without node and the script path). */
export async function main(argv: string[], io: CommandIo = defaultIo): Promise<number> {
  const [name, ...rest] = argv;
  if (name === undefined || name === "help" || name === "--help" || name === "-h") {
    io.out(helpText());
    return name === undefined ? 2 : 0;
  }
  const entry = Object.hasOwn(COMMANDS, name) ? COMMANDS[name] : undefined;
  if (!entry) {
    io.err(`triangulate: unknown command '${name}'\n\n${helpText()}`);
    return 2;
  }
  const run = await entry.load();
  return run(rest, io);
}
