/**
 * A small pool of worker threads (node:worker_threads) for long computations, so that a
 * panelist's request never waits on an organiser's forecast (issue 11, item 7): the request
 * thread awaits the result while it goes on serving others. The jobs are the pure core's
 * functions (lib/work/jobs.ts); the domain services call {@link runJob}.
 *
 * One worker: the machine this runs on has two cores, one for the request thread. Jobs queue
 * in arrival order. The worker's entry file is read from the source tree at run time
 * (`lib/work/worker-boot.mjs`: beside this module under tsx and vitest; under the working
 * directory, the project folder that `npm start` and `triangulate serve` run in, when this
 * module is part of Next.js's bundle, whose chunks do not keep the file layout). The pool lives on globalThis: route modules load twice in the production server
 * (DEVELOPERS.md), and two pools would compete for the cores. A worker that dies fails its
 * job and is replaced on the next one. An idle worker does not keep the process alive.
 */
import { existsSync } from "node:fs";
import { Worker } from "node:worker_threads";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { ForecastInputError } from "../forecast/types";
import type { JobName, Jobs } from "./jobs";

interface Task {
  readonly id: number;
  readonly job: JobName;
  readonly arg: unknown;
  readonly resolve: (value: unknown) => void;
  readonly reject: (err: Error) => void;
  /** The caller's own error classes: the pool on globalThis may be shared by two copies of this module. */
  readonly rebuild: (name: string, message: string) => Error;
}

interface Pool {
  worker: Worker | null;
  running: Task | null;
  readonly queue: Task[];
  nextId: number;
}

type Reply = { id: number; ok: true; value: unknown } | { id: number; ok: false; name: string; message: string };

const pool: Pool = ((globalThis as { __triangulateWorkPool?: Pool }).__triangulateWorkPool ??= { worker: null, running: null, queue: [], nextId: 1 });

/**
 * Errors the services tell apart, rebuilt with their class on this side. Each task carries the
 * function of the module copy that queued it: Next.js route bundles and the production server's
 * direct route each load their own copy, and `instanceof` only matches a copy's own classes.
 */
function rebuild(name: string, message: string): Error {
  if (name === "ForecastInputError") return new ForecastInputError(message);
  if (name === "RangeError") return new RangeError(message);
  return new Error(`${name}: ${message}`);
}

function fail(err: Error): void {
  const task = pool.running;
  pool.running = null;
  pool.worker = null;
  task?.reject(err);
  dispatch();
}

/** The entry file beside this module when it runs from the source tree, else under the working directory. */
function bootFile(): string {
  const beside = path.join(path.dirname(fileURLToPath(import.meta.url)), "worker-boot.mjs");
  return existsSync(beside) ? beside : path.join(process.cwd(), "lib", "work", "worker-boot.mjs");
}

function spawn(): Worker {
  const worker = new Worker(bootFile());
  worker.on("message", (reply: Reply) => {
    const task = pool.running;
    if (!task || task.id !== reply.id) return;
    pool.running = null;
    if (reply.ok) task.resolve(reply.value);
    else task.reject(task.rebuild(reply.name, reply.message));
    dispatch();
  });
  worker.on("error", (err) => fail(err));
  worker.on("exit", (code) => {
    if (pool.worker === worker) fail(new Error(`the computation's worker thread stopped (exit code ${code})`));
  });
  return worker;
}

function dispatch(): void {
  if (pool.running) return;
  const task = pool.queue.shift();
  if (!task) {
    pool.worker?.unref();
    return;
  }
  pool.worker ??= spawn();
  pool.worker.ref();
  pool.running = task;
  pool.worker.postMessage({ id: task.id, job: task.job, arg: task.arg });
}

/** Runs a job of lib/work/jobs.ts on the pool's worker thread; the job's errors are rethrown here. */
export function runJob<J extends JobName>(job: J, arg: Parameters<Jobs[J]>[0]): Promise<ReturnType<Jobs[J]>> {
  return new Promise((resolve, reject) => {
    pool.queue.push({ id: pool.nextId++, job, arg, resolve: resolve as (value: unknown) => void, reject, rebuild });
    dispatch();
  });
}
