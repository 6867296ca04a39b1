/**
 * `npx tsx bench/calibration-speed.ts [--sizes 10x10,30x10,100x10]`: how long the report's
 * performance weights take (lib/triangulation/calibration-figures.ts `computeCalibration`, docs/methods.md §21) for
 * P panelists × N calibration questions and 5 target questions — the panelists' scores, the
 * optimised cut-off and the leave-one-out comparison, which the app computes on the worker pool
 * (lib/work/jobs.ts), not on the request thread. Simulated answers (as
 * bench/classical-model.ts: bias, noise and spread per panelist; background by `backgroundFor`); a fixed PRNG start value. Prints the median of 3 runs per size.
 */
import { computeCalibration } from "../lib/triangulation/calibration-figures";
import { normalQuantile } from "../lib/stats/normal";
import { mulberry32 } from "../tests/helpers/prng";

const rand = mulberry32(19910601);
const gauss = () => normalQuantile(Math.min(1 - 1e-12, Math.max(1e-12, rand())));
const arg = process.argv.indexOf("--sizes");
const sizes = (arg > 0 ? process.argv[arg + 1] : "10x10,30x10,100x10").split(",").map((s) => s.split("x").map(Number) as [number, number]);
const TARGETS = 5;

for (const [panelists, n] of sizes) {
  const people = Array.from({ length: panelists }, (_, e) => ({ id: `inv${e}`, pseudonym: `Panelist ${e}`, b: 0.2 * gauss(), s: 0.1 + 0.4 * rand(), k: 0.3 + 1.2 * rand() }));
  const questions = Array.from({ length: n + TARGETS }, (_, j) => ({
    id: `q${j}`,
    text: `question ${j}`,
    unit: "units",
    answerFormat: "three-point",
    aggregation: "shared",
    calibration: j < n,
    trueValue: j < n ? 1000 * Math.exp(gauss()) : null,
  }));
  const answers = new Map(
    questions.map((q) => {
      const x = q.trueValue ?? 1000;
      const z = q.calibration ? 1.6449 : 1.2816;
      return [
        q.id,
        people.map((p) => {
          const m = x * Math.exp(p.b + p.s * gauss());
          return { invitationId: p.id, pseudonym: p.pseudonym, value: m, low: m * Math.exp(-z * p.s * p.k), high: m * Math.exp(z * p.s * p.k) };
        }),
      ];
    }),
  );
  const times: number[] = [];
  for (let rep = 0; rep < 3; rep++) {
    const t0 = performance.now();
    computeCalibration(questions, answers);
    times.push(performance.now() - t0);
  }
  times.sort((a, b) => a - b);
  console.log(`${panelists} panelists × ${n} calibration questions: ${times[1].toFixed(0)} ms (median of 3)`);
}
