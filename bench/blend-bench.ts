/**
 * `npm run bench:blend`: a simulated panel study of the blend's calibration and accuracy.
 *
 * Questions: M3 competition series (Makridakis & Hibon 2000, IJF 16(4), 451–476), from the
 * benchmark file given by --data (default ../shared/benchmark-data/m3.jsonl, one JSON object per
 * series with `train`, `test`, `frequency`). Every --every-th series gives one question: the
 * value at a horizon drawn from 1..h of its held-out part, asked of a panel of --panelists
 * simulated panelists.
 *
 * Panelists: each has a known bias b_j ~ N(0, 0.15) and noise σ_j ~ U(0.08, 0.35) on the log
 * scale, and the panel shares an error c ~ N(0, s²) per question (s = --shared, default 0.15;
 * panelists read the same news), so answer_j = actual · exp(c + b_j + σ_j·ε_j). With --three-point each also gives a
 * P10–P90 range ±1.2816·σ_j·k_j on the log scale with k_j ~ U(0.4, 1.2) (most are overconfident).
 *
 * Baseline: lib/forecast `baseline(train, { method: "auto", season: frequency, horizon })`,
 * the automatic baseline the app attaches; its step at the question's horizon.
 *
 * Blend: lib/triangulation/triangulation `computeTriangulation`, exactly as the app computes a
 * question, with the track records of the questions whose outcome came before it (bias factors,
 * interval hit rates, the panel's log errors, inverse-MSE history on relative errors), in order.
 * The inverse-MSE weight's raw value and the weight applied are summarised at the end.
 *
 * Printed: coverage of the 80% and 95% ranges of the baseline, the corrected panel leg and
 * the blend (goal for the blend: within ±3 points of nominal), and each figure's mean absolute
 * log error |ln(actual/figure)| and MAPE. Options: --every N (default 5), --offset R (default 0:
 * the series i with i mod N = R; the N offsets split M3 into N disjoint samples), --panelists K
 * (default 7), --three-point, --weights equal|inverse-mse (default equal, the app's default rule:
 * prisma Panel.blendRule; inverse-mse is the organiser's opt-in rule, shrunk toward equal weights
 * as docs/methods.md §15c states), --shared s.
 * A fixed PRNG start value makes runs repeatable.
 */
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { parseArgs } from "node:util";
import { baseline } from "../lib/forecast/baseline";
import { blendErrorCorrelation, trackRecord, type BiasFactor, type AnswerOutcome, type OutcomePair } from "../lib/blend";
import { computeTriangulation, type TriangulationAnswer } from "../lib/triangulation/triangulation";
import { normalQuantile } from "../lib/stats/normal";
import { mulberry32 } from "../tests/helpers/prng";

const { values: args } = parseArgs({
  options: {
    data: { type: "string", default: join(process.cwd(), "..", "shared", "benchmark-data", "m3.jsonl") },
    every: { type: "string", default: "5" },
    offset: { type: "string", default: "0" },
    panelists: { type: "string", default: "7" },
    "three-point": { type: "boolean", default: false },
    weights: { type: "string", default: "equal" },
    shared: { type: "string", default: "0.15" },
  },
});

const rand = mulberry32(20260412);
const gauss = () => normalQuantile(Math.min(1 - 1e-12, Math.max(1e-12, rand())));

interface Series {
  readonly id: string;
  readonly frequency: number;
  readonly train: readonly number[];
  readonly test: readonly number[];
}

const every = Number(args.every);
const offset = Number(args.offset);
if (!(Number.isInteger(every) && every >= 1 && Number.isInteger(offset) && offset >= 0 && offset < every)) {
  console.error("--every must be a whole number ≥ 1 and --offset a whole number from 0 to every − 1");
  process.exit(2);
}
const K = Number(args.panelists);
const threePoint = args["three-point"] === true;
const rule = args.weights === "equal" ? "equal" : "inverse-mse";
const series = readFileSync(args.data!, "utf8")
  .split("\n")
  .filter((l) => l.trim())
  .map((l) => JSON.parse(l) as Series)
  .filter((_, i) => i % every === offset);

const panel = Array.from({ length: K }, (_, j) => ({
  id: `p${j}`,
  bias: 0.15 * gauss(),
  noise: 0.08 + 0.27 * rand(),
  confidence: 0.4 + 0.8 * rand(),
}));

const records = new Map<string, AnswerOutcome[]>(panel.map((p) => [p.id, []]));
const logErrors: number[] = [];
const pairs: OutcomePair[] = [];
const blendZ: number[] = [];
type Leg = "baseline" | "panel" | "blend";
const tally = Object.fromEntries(
  (["baseline", "panel", "blend"] as Leg[]).map((k) => [k, { in80: 0, in95: 0, absLog: 0, ape: 0 }]),
) as Record<Leg, { in80: number; in95: number; absLog: number; ape: number }>;
let n = 0;
let skipped = 0;
const applied: number[] = [];
let lastRaw = NaN;
const t0 = performance.now();

for (const s of series) {
  const h = 1 + Math.floor(rand() * s.test.length);
  const actual = s.test[h - 1];
  let b;
  try {
    b = baseline(s.train, { method: "auto", season: s.frequency, horizon: h }).forecast[h - 1];
  } catch {
    skipped++;
    continue;
  }
  const [lo80, hi80, lo95, hi95] = [b.lower["80"], b.upper["80"], b.lower["95"], b.upper["95"]];
  if (!(actual > 0) || b.mean === null || !(b.mean > 0) || lo80 === null || hi80 === null || lo95 === null || hi95 === null || !(lo80 < hi80)) {
    skipped++;
    continue;
  }
  const shared = Number(args.shared) * gauss();
  const answers: TriangulationAnswer[] = panel.map((p, j) => {
    const e = shared + p.bias + p.noise * gauss();
    const value = actual * Math.exp(e);
    const half = normalQuantile(0.9) * p.noise * p.confidence;
    return { invitationId: p.id, pseudonym: `P${j}`, value, low: threePoint ? value * Math.exp(-half) : null, high: threePoint ? value * Math.exp(half) : null };
  });
  const factors: Record<string, BiasFactor> = {};
  const intervalHits: Record<string, { hits: number; count: number }> = {};
  for (const p of panel) {
    const r = trackRecord(records.get(p.id)!);
    factors[p.id] = r.bias;
    intervalHits[p.id] = { hits: r.intervalHitRate.hits, count: r.intervalHitRate.count };
  }
  const t = computeTriangulation({
    aggregation: "shared",
    answerFormat: threePoint ? "three-point" : "single",
    rounds: [{ round: 1, answers }],
    factors,
    intervalHits,
    panelLogErrors: logErrors,
    blendHistory: pairs,
    blendStandardisedErrors: blendZ,
    baseline: { mean: b.mean, lower80: lo80, upper80: hi80, lower95: lo95, upper95: hi95 },
    weight: rule === "equal" ? { rule: "equal" } : { rule: "inverse-mse", history: pairs },
  });
  const legs: Record<Leg, { figure: number; l80: number; u80: number; l95: number; u95: number }> = {
    baseline: { figure: b.mean, l80: lo80, u80: hi80, l95: lo95, u95: hi95 },
    panel: { figure: t.panel!.corrected.figure, l80: t.panel!.corrected.intervals[0].lower, u80: t.panel!.corrected.intervals[0].upper, l95: t.panel!.corrected.intervals[1].lower, u95: t.panel!.corrected.intervals[1].upper },
    blend: { figure: t.blend!.figure, l80: t.blend!.intervals[0].lower, u80: t.blend!.intervals[0].upper, l95: t.blend!.intervals[1].lower, u95: t.blend!.intervals[1].upper },
  };
  for (const [k, v] of Object.entries(legs) as [Leg, (typeof legs)[Leg]][]) {
    const x = tally[k];
    if (actual >= v.l80 && actual <= v.u80) x.in80++;
    if (actual >= v.l95 && actual <= v.u95) x.in95++;
    x.absLog += v.figure > 0 ? Math.abs(Math.log(actual / v.figure)) : Infinity;
    x.ape += Math.abs((actual - v.figure) / actual);
  }
  applied.push(t.weights!.panel);
  if (Number.isFinite(t.weights!.rawPanel)) lastRaw = t.weights!.rawPanel;
  n++;
  // Record the outcome: the question joins the track records of the questions that follow.
  for (const a of answers) {
    records.get(a.invitationId)!.push(a.low !== null && a.high !== null ? { actual, answer: a.value, low: a.low, high: a.high } : { actual, answer: a.value });
  }
  logErrors.push(Math.log(actual / t.panel!.corrected.figure));
  pairs.push({ actual: 1, panel: t.panel!.corrected.figure / actual, baseline: b.mean / actual });
  if (t.blend!.combinedSd > 0) blendZ.push((actual - t.blend!.figure) / t.blend!.combinedSd);
}

const pct = (x: number) => `${((100 * x) / n).toFixed(1)}%`;
console.log(`Simulated panel study: ${n} questions from M3 (every ${every}th series${offset ? ` from the ${offset + 1}th` : ""}; ${skipped} skipped: no usable baseline or actual ≤ 0), ${K} panelists (shared error ${args.shared}), ${threePoint ? "three-point" : "single-value"} answers, ${rule} weights; ${((performance.now() - t0) / 1000).toFixed(1)} s`);
console.log("figure     80% coverage  95% coverage  mean |ln(actual/figure)|  MAPE");
for (const k of ["baseline", "panel", "blend"] as Leg[]) {
  const x = tally[k];
  console.log(`${k.padEnd(10)} ${pct(x.in80).padStart(12)}  ${pct(x.in95).padStart(12)}  ${(x.absLog / n).toFixed(4).padStart(24)}  ${pct(x.ape).padStart(6)}`);
}
const c80 = (100 * tally.blend.in80) / n;
const c95 = (100 * tally.blend.in95) / n;
console.log(`blend coverage within ±3 points of nominal: 80% ${Math.abs(c80 - 80) <= 3 ? "yes" : "no"} (${c80.toFixed(1)}), 95% ${Math.abs(c95 - 95) <= 3 ? "yes" : "no"} (${c95.toFixed(1)})`);
console.log(`blend error below both legs': mean |log error| ${tally.blend.absLog < tally.panel.absLog && tally.blend.absLog < tally.baseline.absLog ? "yes" : "no"}, MAPE ${tally.blend.ape < tally.panel.ape && tally.blend.ape < tally.baseline.ape ? "yes" : "no"}`);
const last = logErrors.length ? Math.sqrt(logErrors.reduce((a, e) => a + e * e, 0) / logErrors.length) : NaN;
console.log(`panel log-error scale over the run: ${last.toFixed(4)}; mean log error ${(logErrors.reduce((a, e) => a + e, 0) / logErrors.length).toFixed(4)}`);
console.log(`panel weight applied: mean ${(applied.reduce((a, w) => a + w, 0) / applied.length).toFixed(4)}, last ${applied[applied.length - 1]?.toFixed(4)}; last raw inverse-MSE weight ${Number.isFinite(lastRaw) ? lastRaw.toFixed(4) : "—"}`);
console.log(`legs' error correlation at the end: ${JSON.stringify(blendErrorCorrelation(pairs))}`);
