/**
 * `triangulate serve [--port P] [--hostname H]`: serves the production build (lib/http/server.ts)
 * on port P (default $PORT, else 3000), on all interfaces unless H is given. `npm start` runs it
 * after migrating and building. SIGTERM or SIGINT stops accepting connections, lets the requests
 * in flight finish (at most 10 s) and closes the database.
 */
import { parseArgs } from "node:util";
import type { CommandIo } from "./main";

const USAGE = "usage: triangulate serve [--port P] [--hostname H]   (run `next build` first; npm start does both)\n";
const STOP_GRACE_MS = 10_000;

export async function run(args: string[], io: CommandIo): Promise<number> {
  let values: { port?: string; hostname?: string; help?: boolean };
  try {
    ({ values } = parseArgs({
      args,
      options: { port: { type: "string", short: "p" }, hostname: { type: "string", short: "H" }, help: { type: "boolean", short: "h" } },
      strict: true,
      allowPositionals: false,
    }));
  } catch (err) {
    io.err(`triangulate: ${(err as Error).message}\n${USAGE}`);
    return 2;
  }
  if (values.help) {
    io.out(USAGE);
    return 0;
  }
  const portText = values.port ?? process.env.PORT ?? "3000";
  const port = Number(portText);
  if (!/^\d+$/.test(portText) || port < 1 || port > 65535) {
    io.err(`triangulate: --port must be a whole number from 1 to 65535, got '${portText}'\n${USAGE}`);
    return 2;
  }
  // Before React and Next.js load: they choose their production code from it.
  (process.env as Record<string, string>).NODE_ENV = "production";
  const { checkEnvAtStartup } = await import("../env-startup");
  checkEnvAtStartup();
  const { serve } = await import("../http/server");
  let serving: Awaited<ReturnType<typeof serve>>;
  try {
    serving = await serve({ port, hostname: values.hostname });
  } catch (err) {
    io.err(`triangulate: cannot serve: ${(err as Error).message}\n`);
    return 1;
  }
  io.out(`triangulate: serving on http://${values.hostname ?? "localhost"}:${port}\n`);
  let stopping = false;
  const stop = (signal: NodeJS.Signals) => {
    if (stopping) return;
    stopping = true;
    setTimeout(() => process.exit(1), STOP_GRACE_MS).unref();
    serving.close().then(
      () => process.exit(0),
      (err) => {
        io.err(`triangulate: stopping on ${signal}: ${(err as Error).message}\n`);
        process.exit(1);
      },
    );
  };
  process.once("SIGTERM", stop);
  process.once("SIGINT", stop);
  return 0;
}
