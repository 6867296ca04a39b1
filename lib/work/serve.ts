/**
 * The worker side of a pool (lib/work/pool.ts): runs the named job of a table on each message
 * and answers with its value, or with the error's name and message.
 */
import { parentPort } from "node:worker_threads";
import type { JobTable } from "./pool";

/** Serves `jobs` on this worker thread's port. */
export function serveJobs(jobs: JobTable): void {
  const port = parentPort!;
  port.on("message", (m: { id: number; job: string; arg: unknown }) => {
    try {
      // The pool's run typed the argument for this job's name.
      const run = jobs[m.job] as (arg: unknown) => unknown;
      port.postMessage({ id: m.id, ok: true, value: run(m.arg) });
    } catch (err) {
      const e = err instanceof Error ? err : new Error(String(err));
      port.postMessage({ id: m.id, ok: false, name: e.name, message: e.message });
    }
  });
}
