/**
 * Pools of worker threads (node:worker_threads) for long computations. Jobs are plain
 * functions by name (a job table, e.g. lib/work/jobs.ts) that take and return plain data;
 * each worker serves the table with {@link serveJobs} (lib/work/serve.ts). Jobs queue in
 * arrival order and each free worker takes the next. A worker that dies fails its job and is
 * replaced on the next one. Idle workers do not keep the process alive.
 *
 * The app's pool ({@link runJob}): so that a panelist's request never waits on an organiser's
 * forecast (issue 11, item 7), the request thread awaits the result while it goes on serving
 * others. One worker by default: the machine this runs on has two cores, one for the request
 * thread; `triangulate baseline` on many files asks for more ({@link setPoolThreads}). Its
 * entry file is read from the source tree at run time (`lib/work/worker-boot.mjs`: beside this
 * module under tsx and vitest; under the working directory, the project folder that `npm start`
 * and `triangulate serve` run in, when this module is part of Next.js's bundle, whose chunks do
 * not keep the file layout). It lives on globalThis: route modules load twice in the production
 * server (DEVELOPERS.md), and two pools would compete for the cores.
 *
 * Each worker's old generation is bounded (`workerOldGenerationMiB` in lib/work/heap-limits.json,
 * node:worker_threads `resourceLimits`): V8 collects garbage before the heap grows past it, so
 * the server's memory stays bounded (issue 13), and a job that needs more fails alone (its
 * worker stops with ERR_WORKER_OUT_OF_MEMORY and is replaced) instead of the whole process.
 */
import { existsSync } from "node:fs";
import { Worker } from "node:worker_threads";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { ForecastInputError } from "../forecast/types";
import type { JobName, Jobs } from "./jobs";
import heapLimits from "./heap-limits.json";

/** A job table: plain-data functions by name. */
export type JobTable = Record<string, (arg: never) => unknown>;

interface Task {
  readonly id: number;
  readonly job: string;
  readonly arg: unknown;
  readonly resolve: (value: unknown) => void;
  readonly reject: (err: Error) => void;
  /** The caller's own error classes: the app's pool on globalThis may be shared by two copies of this module. */
  readonly rebuild: (name: string, message: string) => Error;
}

interface Slot {
  worker: Worker | null;
  running: Task | null;
}

interface PoolState {
  readonly boot: string | URL;
  readonly slots: Slot[];
  readonly queue: Task[];
  nextId: number;
  threads: number;
}

type Reply = { id: number; ok: true; value: unknown } | { id: number; ok: false; name: string; message: string };

/** A pool of worker threads serving one job table. */
export interface WorkerPool<J extends JobTable> {
  /** Runs a job on the next free worker; the job's errors are rethrown here. */
  run<K extends keyof J & string>(job: K, arg: Parameters<J[K]>[0]): Promise<ReturnType<J[K]>>;
  /** Sets how many workers may run at once (at least 1). */
  setThreads(threads: number): void;
  /** Stops every worker (queued jobs stay queued; a later run starts new workers). */
  close(): Promise<void>;
}

/**
 * Errors the callers tell apart, rebuilt with their class on this side. Each task carries the
 * function of the module copy that queued it: Next.js route bundles and the production server's
 * direct route each load their own copy, and `instanceof` only matches a copy's own classes.
 */
function rebuild(name: string, message: string): Error {
  if (name === "ForecastInputError") return new ForecastInputError(message);
  if (name === "RangeError") return new RangeError(message);
  if (name === "Error") return new Error(message);
  return new Error(`${name}: ${message}`);
}

function fail(state: PoolState, slot: Slot, err: Error): void {
  const task = slot.running;
  slot.running = null;
  slot.worker = null;
  task?.reject(err);
  dispatch(state);
}

function spawn(state: PoolState, slot: Slot): Worker {
  const worker = new Worker(state.boot, { resourceLimits: { maxOldGenerationSizeMb: heapLimits.workerOldGenerationMiB } });
  worker.on("message", (reply: Reply) => {
    const task = slot.running;
    if (!task || task.id !== reply.id) return;
    slot.running = null;
    if (reply.ok) task.resolve(reply.value);
    else task.reject(task.rebuild(reply.name, reply.message));
    dispatch(state);
  });
  worker.on("error", (err) => fail(state, slot, err));
  worker.on("exit", (code) => {
    if (slot.worker === worker) fail(state, slot, new Error(`the computation's worker thread stopped (exit code ${code})`));
  });
  return worker;
}

function dispatch(state: PoolState): void {
  while (state.slots.length < state.threads) state.slots.push({ worker: null, running: null });
  state.slots.forEach((slot, i) => {
    if (slot.running) return;
    const task = i < state.threads ? state.queue.shift() : undefined;
    if (!task) {
      slot.worker?.unref();
      return;
    }
    slot.worker ??= spawn(state, slot);
    slot.worker.ref();
    slot.running = task;
    slot.worker.postMessage({ id: task.id, job: task.job, arg: task.arg });
  });
}

function poolOf<J extends JobTable>(state: PoolState): WorkerPool<J> {
  return {
    run<K extends keyof J & string>(job: K, arg: Parameters<J[K]>[0]): Promise<ReturnType<J[K]>> {
      return new Promise((resolve, reject) => {
        state.queue.push({ id: state.nextId++, job, arg, resolve: resolve as (value: unknown) => void, reject, rebuild });
        dispatch(state);
      });
    },
    setThreads(threads: number): void {
      state.threads = Math.max(1, Math.floor(threads));
      dispatch(state);
    },
    async close(): Promise<void> {
      const workers = state.slots.map((s) => s.worker).filter((w): w is Worker => w !== null);
      for (const s of state.slots) s.worker = null; // their exit is then no failure
      await Promise.all(workers.map((w) => w.terminate()));
    },
  };
}

/**
 * A pool of `threads` workers started from `boot` (a plain-JavaScript entry file that serves a
 * job table with serveJobs), for job table J.
 */
export function createPool<J extends JobTable>(boot: string | URL, threads = 1): WorkerPool<J> {
  return poolOf<J>({ boot, slots: [], queue: [], nextId: 1, threads: Math.max(1, Math.floor(threads)) });
}

/** The app's entry file beside this module when it runs from the source tree, else under the working directory. */
function bootFile(): string {
  const beside = path.join(path.dirname(fileURLToPath(import.meta.url)), "worker-boot.mjs");
  return existsSync(beside) ? beside : path.join(process.cwd(), "lib", "work", "worker-boot.mjs");
}

const appState: PoolState = ((globalThis as { __triangulateWorkers?: PoolState }).__triangulateWorkers ??= {
  boot: bootFile(),
  slots: [],
  queue: [],
  nextId: 1,
  threads: 1,
});
const appPool = poolOf<Jobs>(appState);

/** Runs a job of lib/work/jobs.ts on the app's pool; the job's errors are rethrown here. */
export function runJob<J extends JobName>(job: J, arg: Parameters<Jobs[J]>[0]): Promise<ReturnType<Jobs[J]>> {
  return appPool.run(job, arg);
}

/** Sets how many worker threads the app's pool may run at once (1 by default). */
export function setPoolThreads(threads: number): void {
  appPool.setThreads(threads);
}
