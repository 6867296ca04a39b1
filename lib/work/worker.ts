/**
 * One worker thread of the pool (lib/work/pool.ts): runs the named job on each message and
 * answers with its value, or with the error's name and message.
 */
import { parentPort } from "node:worker_threads";
import { jobs, type JobName } from "./jobs";

const port = parentPort!;
port.on("message", (m: { id: number; job: JobName; arg: unknown }) => {
  try {
    // The pool's runJob typed the argument for this job's name.
    const run = jobs[m.job] as (arg: unknown) => unknown;
    port.postMessage({ id: m.id, ok: true, value: run(m.arg) });
  } catch (err) {
    const e = err instanceof Error ? err : new Error(String(err));
    port.postMessage({ id: m.id, ok: false, name: e.name, message: e.message });
  }
});
