/**
 * The worker pool (lib/work/pool.ts): a fit runs on a worker thread, so this thread goes on
 * while it runs (order of completion, not time), and the engine's input errors come back with
 * their class. The fit's figures through the worker are checked against R in
 * tests/triangulation/baselines.test.ts.
 */
import { describe, expect, it } from "vitest";
import { ForecastInputError } from "../../lib/forecast/types";
import { runJob, setPoolThreads } from "../../lib/work/pool";

/** A 5,000-point monthly-looking series (deterministic, invented). */
const LONG = Array.from({ length: 5000 }, (_, i) => 100 + i * 0.1 + 10 * Math.sin((2 * Math.PI * i) / 12) + ((i * 7919) % 13));

describe("runJob", () => {
  it("leaves this thread free while a long fit runs: a timer queued after it fires first", async () => {
    const order: string[] = [];
    const fit = runJob("baseline", { series: { y: LONG }, options: { season: 12, horizon: 4, levels: [80, 95] } }).then(() => order.push("fit"));
    await new Promise<void>((resolve) => setImmediate(resolve));
    order.push("this thread");
    await fit;
    expect(order).toEqual(["this thread", "fit"]);
  });

  it("runs jobs side by side with two threads: a short fit queued after a long one finishes first", async () => {
    const order: string[] = [];
    setPoolThreads(2);
    try {
      // Both workers started first (one quick job each), so that neither start-up is in the race.
      const quick = { series: { y: [1, 2, 3] }, options: { method: "naive" as const, horizon: 1 } };
      await Promise.all([runJob("baseline", quick), runJob("baseline", quick)]);
      const long = runJob("baseline", { series: { y: LONG }, options: { season: 12, horizon: 4, levels: [80, 95] } }).then(() => order.push("long"));
      const short = runJob("baseline", { series: { y: [1, 2, 3, 4, 5, 6] }, options: { method: "naive", horizon: 1 } }).then(() => order.push("short"));
      await Promise.all([long, short]);
    } finally {
      setPoolThreads(1);
    }
    expect(order).toEqual(["short", "long"]);
  });

  it("rethrows the engine's input errors with their class and message", async () => {
    const err = await runJob("baseline", { series: { y: [1, 2, 3] }, options: { method: "seasonal-naive", season: 4 } }).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(ForecastInputError);
    expect((err as Error).message).toMatch(/season/);
  });
});
