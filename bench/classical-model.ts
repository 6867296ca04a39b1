/**
 * `npm run bench:experts`: when do performance weights (Cooke's classical model, docs/methods.md §21)
 * beat equal weights? A simulation study on panels whose panelists have known calibration.
 *
 * Each simulated panel: 6 panelists; true values x = exp(N(ln 1000, 1)) (quantities spanning orders
 * of magnitude, so the log-uniform background); panelist e has a bias b_e ~ N(0, 0.2) and noise
 * σ_e ~ U(0.1, 0.5) on the log scale and states 5/50/95 percentiles m·exp(∓1.645·σ_e·k_e) around
 * their median m = x·exp(b_e + σ_e·ε), with a spread factor k_e ~ U(0.3, 1.5) (below 1: too
 * confident). Weights come from N calibration questions (N = 5, 10, 20); both pools are then judged
 * on 10 other questions (out of sample): how often their 90% ranges hold the truth, their
 * calibration score on those 10, and their mean information. The literature's finding to compare
 * with (Colson & Cooke 2017; Cooke & Goossens 2008, from memory): performance weights improve
 * calibration markedly and information somewhat, out of sample. A fixed PRNG start value makes
 * runs repeatable.
 */
import {
  binOf,
  calibrationScore,
  informationScore,
  intrinsicRange,
  performanceWeightedPool,
  pooledQuantiles,
  type Assessment,
  type CalibrationQuestion,
} from "../lib/blend/classical-model";
import { normalQuantile } from "../lib/stats/normal";
import { mulberry32 } from "../tests/helpers/prng";

const rand = mulberry32(19910601);
const gauss = () => normalQuantile(Math.min(1 - 1e-12, Math.max(1e-12, rand())));
const PANELS = 300;
const EXPERTS = 6;
const TARGETS = 10;
const Z = 1.6448536269514722;

function question(experts: readonly { b: number; s: number; k: number }[]): CalibrationQuestion {
  const x = Math.exp(Math.log(1000) + gauss());
  const assessments = experts.map(({ b, s, k }) => {
    const m = x * Math.exp(b + s * gauss());
    return [m * Math.exp(-Z * s * k), m, m * Math.exp(Z * s * k)] as Assessment;
  });
  return { assessments, realisation: x, background: "log-uniform" };
}

console.log("calibration questions  pool         90% range holds  calibration (out of sample, median)  information  PW better (combined)");
for (const n of [5, 10, 20]) {
  const out = { pw: { hold: 0, cal: [] as number[], inf: 0 }, ew: { hold: 0, cal: [] as number[], inf: 0 } };
  let better = 0;
  for (let panel = 0; panel < PANELS; panel++) {
    const experts = Array.from({ length: EXPERTS }, () => ({ b: 0.2 * gauss(), s: 0.1 + 0.4 * rand(), k: 0.3 + 1.2 * rand() }));
    const cal = Array.from({ length: n }, () => question(experts));
    const targets = Array.from({ length: TARGETS }, () => question(experts));
    const weights = performanceWeightedPool(cal).weights;
    const score = { pw: { bins: [0, 0, 0, 0], inf: 0 }, ew: { bins: [0, 0, 0, 0], inf: 0 } };
    for (const q of targets) {
      const range = intrinsicRange(q.assessments, q.realisation, "log-uniform");
      for (const [name, w] of [["pw", weights], ["ew", Array<number>(EXPERTS).fill(1)]] as const) {
        const pooled = pooledQuantiles(q.assessments, w, range, [0.05, 0.5, 0.95], "log-uniform") as unknown as Assessment;
        const bin = binOf(pooled, q.realisation);
        score[name].bins[bin]++;
        if (bin === 1 || bin === 2) out[name].hold++;
        score[name].inf += informationScore(pooled, range, "log-uniform") / TARGETS;
      }
    }
    const combined = { pw: 0, ew: 0 };
    for (const name of ["pw", "ew"] as const) {
      const c = calibrationScore(score[name].bins);
      out[name].cal.push(c);
      out[name].inf += score[name].inf / PANELS;
      combined[name] = c * score[name].inf;
    }
    if (combined.pw > combined.ew) better++;
  }
  for (const name of ["pw", "ew"] as const) {
    const sorted = [...out[name].cal].sort((a, b) => a - b);
    console.log(
      `${String(n).padStart(21)}  ${name === "pw" ? "performance" : "equal      "}  ${((100 * out[name].hold) / (PANELS * TARGETS)).toFixed(1).padStart(14)}%  ${sorted[Math.floor(PANELS / 2)].toFixed(3).padStart(36)}  ${out[name].inf.toFixed(3).padStart(11)}  ${name === "pw" ? `${((100 * better) / PANELS).toFixed(0)}% of panels` : ""}`,
    );
  }
}
