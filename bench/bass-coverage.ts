/**
 * `npm run bench:bass`: coverage of the Bass method's prediction intervals on periods it was not
 * fitted to, and its error, on launches simulated from the Bass model (no open collection of
 * launch histories is at hand, so the check is under the model's own form with two kinds of noise).
 *
 * Each launch: p ~ U(0.005, 0.05), q ~ U(0.2, 0.6), m = 10,000 (Sultan, Farley & Lehmann 1990 give
 * p ≈ 0.03, q ≈ 0.38 as averages — from memory); adoptions m·(F(t) − F(t−1)) with noise either
 * additive (sd 3% of the curve's peak) or proportional (lognormal, sd 0.10 on the log scale; real
 * adoption noise grows with the level, so this one breaks the fit's equal-variance assumption).
 * The first k periods are fitted (k = 6, 8, 10, 12), the next 4 are held out. Printed: the share of
 * held-out periods inside the 80% and 95% intervals, the share of 4-period totals inside theirs,
 * and the median absolute percentage error of the total. A fixed PRNG start value makes runs repeatable.
 */
import { bassAdoptions, bassForecastSum, fitBass } from "../lib/forecast/bass";
import { normalQuantile } from "../lib/stats/normal";
import { mulberry32 } from "../tests/helpers/prng";

const rand = mulberry32(19690501);
const gauss = () => normalQuantile(Math.min(1 - 1e-12, Math.max(1e-12, rand())));
const LAUNCHES = 500;
const HOLD = 4;

console.log("noise         k  launches  step 80%  step 95%  total 80%  total 95%  median APE of total");
for (const noise of ["additive", "proportional"] as const) {
  for (const k of [6, 8, 10, 12]) {
    let steps = 0, in80 = 0, in95 = 0, t80 = 0, t95 = 0, fits = 0;
    const ape: number[] = [];
    for (let i = 0; i < LAUNCHES; i++) {
      const p = 0.005 + 0.045 * rand();
      const q = 0.2 + 0.4 * rand();
      const curve = bassAdoptions({ p, q, m: 10000 }, 1, k + HOLD);
      const peak = Math.max(...curve);
      const y = curve.map((v) => Math.max(0, noise === "additive" ? v + 0.03 * peak * gauss() : v * Math.exp(0.1 * gauss())));
      let fit;
      try {
        fit = fitBass(y.slice(0, k));
      } catch {
        continue;
      }
      fits++;
      for (let j = 0; j < HOLD; j++) {
        const s = bassForecastSum(fit, [k + j + 1], [80, 95]);
        const a = y[k + j];
        steps++;
        if (a >= s.lower["80"] && a <= s.upper["80"]) in80++;
        if (a >= s.lower["95"] && a <= s.upper["95"]) in95++;
      }
      const tot = bassForecastSum(fit, Array.from({ length: HOLD }, (_, j) => k + j + 1), [80, 95]);
      const actual = y.slice(k).reduce((s, v) => s + v, 0);
      if (actual >= tot.lower["80"] && actual <= tot.upper["80"]) t80++;
      if (actual >= tot.lower["95"] && actual <= tot.upper["95"]) t95++;
      ape.push(Math.abs(tot.mean - actual) / actual);
    }
    ape.sort((a, b) => a - b);
    const pct = (x: number, n: number) => `${((100 * x) / n).toFixed(1)}%`.padStart(8);
    console.log(
      `${noise.padEnd(13)} ${String(k).padStart(2)}  ${String(fits).padStart(8)}  ${pct(in80, steps)}  ${pct(in95, steps)}  ${pct(t80, fits)}   ${pct(t95, fits)}   ${(100 * ape[Math.floor(ape.length / 2)]).toFixed(1)}%`,
    );
  }
}
