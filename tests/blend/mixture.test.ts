import { describe, expect, it } from "vitest";
import {
  baselineDistribution,
  blend,
  blendDistribution,
  componentQuantile,
  distributionCdf,
  distributionMean,
  distributionQuantile,
  linearPool,
  normalDistribution,
  distributionVariance,
  panelFromParts,
  panelFromSpread,
  panelFromThreePoint,
  threePointDistribution,
  type Distribution,
  type ThreePointAnswer,
} from "../../lib/blend";
import { runR, rVector } from "../stats/rscript";

const ANSWERS: readonly ThreePointAnswer[] = Object.freeze([
  Object.freeze({ low: 80, mid: 100, high: 140 }),
  Object.freeze({ low: 90, mid: 110, high: 120 }),
  Object.freeze({ low: 70, mid: 95, high: 130 }),
]);
const BASELINE = Object.freeze({ mean: 105, sd: 12 });
const W = 0.4;
const PROBS = Object.freeze([0.025, 0.1, 0.25, 0.5, 0.75, 0.9, 0.975]);

/**
 * R code for the same blended CDF, built independently with pnorm: each three-point answer is
 * a two-piece normal through its P10/P50/P90 (sd = distance / qnorm(0.9) on each side), pooled
 * with equal weights, mixed with weight W against N(105, 12²).
 */
const R_MIXTURE = `
lo <- c(80, 90, 70); mid <- c(100, 110, 95); hi <- c(140, 120, 130)
sl <- (mid - lo) / qnorm(0.9); sh <- (hi - mid) / qnorm(0.9)
tp <- function(x) mean(ifelse(x <= mid, pnorm(x, mid, sl), pnorm(x, mid, sh)))
F <- function(x) ${W} * tp(x) + ${1 - W} * pnorm(x, 105, 12)
q <- sapply(${rVector(PROBS)}, function(p) uniroot(function(x) F(x) - p, c(0, 300), tol = 1e-13, maxiter = 10000)$root)
`;

/** Density written in the test from the definitions: φ((x−m)/s)/s on each side of each median. */
function testDensity(x: number): number {
  const phi = (z: number, s: number) => Math.exp(-0.5 * z * z) / (Math.sqrt(2 * Math.PI) * s);
  const z90 = 1.2815515655446004; // qnorm(0.9) printed by R 4.2.2
  let panel = 0;
  for (const a of ANSWERS) {
    const s = x < a.mid ? (a.mid - a.low) / z90 : (a.high - a.mid) / z90;
    panel += phi((x - a.mid) / s, s) / ANSWERS.length;
  }
  return W * panel + (1 - W) * phi((x - BASELINE.mean) / BASELINE.sd, BASELINE.sd);
}

/**
 * Composite Simpson's rule of g over [a, b], split at the breakpoints (where the two-piece
 * densities jump) so each piece is smooth; `perPiece` even sub-intervals per piece. A piece's
 * end values are taken just inside the piece (one-sided limits), not on the jump itself.
 */
function simpson(g: (x: number) => number, a: number, b: number, breaks: readonly number[], perPiece = 20000): number {
  const pts = [a, ...breaks.filter((t) => t > a && t < b).sort((u, v) => u - v), b];
  let total = 0;
  for (let k = 0; k + 1 < pts.length; k++) {
    const lo = pts[k];
    const h = (pts[k + 1] - lo) / perPiece;
    const inside = (t: number, dir: number) => t + dir * 1e-12 * Math.max(1, Math.abs(t));
    let s = g(inside(lo, 1)) + g(inside(pts[k + 1], -1));
    for (let i = 1; i < perPiece; i++) s += (i % 2 === 1 ? 4 : 2) * g(lo + i * h);
    total += (s * h) / 3;
  }
  return total;
}

function blended(): Distribution {
  const panel = panelFromThreePoint(ANSWERS).distribution;
  return blendDistribution(panel, baselineDistribution(BASELINE).distribution, W);
}

describe("threePointDistribution: two-piece normal through P10 / P50 / P90", () => {
  it("has sdLow = (P50 − P10)/qnorm(0.9), sdHigh = (P90 − P50)/qnorm(0.9) with qnorm from R", () => {
    const [[z]] = runR("out(qnorm(0.9))");
    const d = threePointDistribution({ low: 80, mid: 100, high: 140 });
    expect(d.sdLow).toBeCloseTo(20 / z, 12);
    expect(d.sdHigh).toBeCloseTo(40 / z, 12);
    // The construction passes through all three points.
    expect(distributionCdf(d, 80)).toBeCloseTo(0.1, 14);
    expect(distributionCdf(d, 100)).toBe(0.5);
    expect(distributionCdf(d, 140)).toBeCloseTo(0.9, 14);
    expect(componentQuantile(d, 0.1)).toBeCloseTo(80, 12);
    expect(componentQuantile(d, 0.9)).toBeCloseTo(140, 12);
  });

  it("mean = median + (sdHigh − sdLow)/√(2π) agrees with Simpson integration of x·f(x)", () => {
    const d = threePointDistribution({ low: 80, mid: 100, high: 140 });
    const s = d.sdHigh;
    const phi = (x: number) => {
      const sd = x < 100 ? d.sdLow : s;
      return Math.exp(-0.5 * ((x - 100) / sd) ** 2) / (Math.sqrt(2 * Math.PI) * sd);
    };
    const m = simpson((x) => x * phi(x), 100 - 40 * d.sdLow, 100 + 40 * s, [100]);
    expect(distributionMean(d)).toBeCloseTo(m, 8);
  });

  it("accepts equal points (a point mass) and rejects misordered or non-finite ones", () => {
    const d = threePointDistribution({ low: 50, mid: 50, high: 50 });
    expect([d.sdLow, d.sdHigh]).toEqual([0, 0]);
    expect(distributionCdf(d, 49.999)).toBe(0);
    expect(distributionCdf(d, 50)).toBe(1);
    expect(componentQuantile(d, 0.3)).toBe(50);
    expect(() => threePointDistribution({ low: 60, mid: 50, high: 70 })).toThrow(/low \(60\) is above mid/);
    expect(() => threePointDistribution({ low: 40, mid: 80, high: 70 })).toThrow(/mid \(80\) is above high/);
    expect(() => threePointDistribution({ low: NaN, mid: 80, high: 90 })).toThrow(RangeError);
    expect(() => panelFromThreePoint([{ low: 1, mid: 2, high: 3 }, { low: 3, mid: 2, high: 1 }])).toThrow(/answers\[1\]/);
    expect(() => panelFromThreePoint([])).toThrow(RangeError);
  });
});

describe("blended mixture w·F_panel + (1 − w)·F_baseline: quantiles by bisection", () => {
  it("agree with R uniroot() on the same mixture CDF built from pnorm (to 1e-9 relative)", () => {
    const [q] = runR(R_MIXTURE + "out(q)");
    const d = blended();
    PROBS.forEach((p, i) => {
      const ours = distributionQuantile(d, p);
      expect(Math.abs(ours - q[i]) / q[i], `p = ${p}: ours ${ours}, R ${q[i]}`).toBeLessThan(1e-9);
    });
  });

  it("integrate back to p: Simpson's rule on the density (written in the test) from far left to each quantile", () => {
    const d = blended();
    const left = 70 - 15 * 25; // 15+ sds below every component's centre: the mass left out is below 1e-40
    const breaks = ANSWERS.map((a) => a.mid);
    for (const p of PROBS) {
      const q = distributionQuantile(d, p);
      expect(Math.abs(simpson(testDensity, left, q, breaks) - p), `p = ${p}`).toBeLessThan(1e-10);
    }
  });

  it("mean equals Simpson's ∫x·f(x)dx, and equals w·mean_panel + (1 − w)·mean_baseline", () => {
    const d = blended();
    const m = simpson((x) => x * testDensity(x), -400, 700, ANSWERS.map((a) => a.mid));
    expect(distributionMean(d)).toBeCloseTo(m, 8);
    // Hand: each half-normal piece has mean offset ±sd·√(2/π) and weight 1/2.
    const z90 = 1.2815515655446004; // qnorm(0.9) printed by R 4.2.2
    const panelMean =
      ANSWERS.reduce((acc, a) => acc + a.mid + ((a.high - a.mid) / z90 - (a.mid - a.low) / z90) / Math.sqrt(2 * Math.PI), 0) / 3;
    expect(distributionMean(d)).toBeCloseTo(W * panelMean + (1 - W) * 105, 10);
  });

  it("blend(): figure w·panel + (1 − w)·baseline (hand), normal with Bates & Granger's combined sd; σ_p from R's uniroot on the pool", () => {
    const [[p10, p90]] = runR(`
      lo <- c(80, 90, 70); mid <- c(100, 110, 95); hi <- c(140, 120, 130)
      sl <- (mid - lo) / qnorm(0.9); sh <- (hi - mid) / qnorm(0.9)
      tp <- function(x) mean(ifelse(x <= mid, pnorm(x, mid, sl), pnorm(x, mid, sh)))
      out(sapply(c(0.1, 0.9), function(p) uniroot(function(x) tp(x) - p, c(0, 300), tol = 1e-13)$root))`);
    const panel = panelFromThreePoint(ANSWERS);
    const input = {
      panelFigure: 100, // the median of the mids 100, 110, 95
      baselineFigure: 105,
      panelDistribution: panel.distribution,
      baselineDistribution: baselineDistribution(BASELINE).distribution,
      panelWeight: W,
      errorCorrelation: 0.3,
    };
    const b = blend(input);
    // Hand: σ_p = (P90 − P10)/(2·qnorm(0.9)); σ_c² = w²σ_p² + (1 − w)²σ_b² + 2w(1 − w)ρσ_pσ_b (docs/methods.md §5a, λ = 1 − w).
    const z90 = 1.2815515655446004; // qnorm(0.9) printed by R 4.2.2
    const sp = (p90 - p10) / (2 * z90);
    const sc = Math.sqrt(W * W * sp * sp + (1 - W) ** 2 * 144 + 2 * W * (1 - W) * 0.3 * sp * 12);
    expect(b.figure).toBeCloseTo(0.4 * 100 + 0.6 * 105, 12); // = 103 by hand
    expect(b.median).toBe(b.figure);
    expect(b.panelSd).toBeCloseTo(sp, 8);
    expect(b.distribution.sd).toBeCloseTo(sc, 8);
    const [[l80, u80, l95, u95]] = runR(`out(qnorm(c(0.1, 0.9, 0.025, 0.975), 103, ${sc}))`);
    expect(b.intervals.map((i) => i.level)).toEqual([80, 95]);
    expect(b.intervals[0].lower).toBeCloseTo(l80, 8);
    expect(b.intervals[0].upper).toBeCloseTo(u80, 8);
    expect(b.intervals[1].lower).toBeCloseTo(l95, 8);
    expect(b.intervals[1].upper).toBeCloseTo(u95, 8);
    // A range scale of 0.8 from the blend's track record narrows σ_c by 0.8 (hand).
    expect(blend({ ...input, rangeScale: 0.8 }).distribution.sd).toBeCloseTo(0.8 * sc, 8);
    expect(() => blend({ ...input, levels: [100] })).toThrow(/levels\[0\]/);
    expect(() => blend({ ...input, errorCorrelation: 1.5 })).toThrow(/between -1 and 1/);
  });

  it("the figure lies inside its own ranges even with a point-mass panel leg (issue 12: '11,621; 80% range 11,570 to 11,570')", () => {
    const b = blend({
      panelFigure: 11570,
      baselineFigure: 11672,
      panelDistribution: normalDistribution(11570, 0),
      baselineDistribution: normalDistribution(11672, 600),
      panelWeight: 0.5,
      errorCorrelation: 0.5,
    });
    for (const iv of b.intervals) expect(iv.lower < b.figure && b.figure < iv.upper).toBe(true);
    expect(b.figure).toBe(11621); // hand: 0.5·11570 + 0.5·11672
  });

  it("spread-based panel: median and IQR/(2·qnorm(0.75)) from R, mixture quantiles vs R uniroot", () => {
    const x = [80, 95, 100, 104, 120, 150];
    const [[med, sd], q] = runR(`x <- ${rVector(x)}; med <- median(x); s <- IQR(x) / (2 * qnorm(0.75)); out(c(med, s))
F <- function(v) 0.5 * pnorm(v, med, s) + 0.5 * pnorm(v, 105, 12)
out(sapply(c(0.05, 0.5, 0.95), function(p) uniroot(function(v) F(v) - p, c(0, 300), tol = 1e-13)$root))`);
    const panel = panelFromSpread(x);
    expect(panel.rule).toBe("round spread");
    expect(panel.median).toBeCloseTo(med, 12);
    expect(panel.sd).toBeCloseTo(sd, 12);
    const d = blendDistribution(panel.distribution, normalDistribution(105, 12), 0.5);
    [0.05, 0.5, 0.95].forEach((p, i) => expect(Math.abs(distributionQuantile(d, p) - q[i]) / q[i]).toBeLessThan(1e-9));
  });

  it("keeps full relative accuracy at large magnitudes (unit volumes near 2e9) vs R uniroot", () => {
    const big = [
      { low: 1.8e9, mid: 2.0e9, high: 2.3e9 },
      { low: 1.9e9, mid: 2.05e9, high: 2.15e9 },
    ];
    const probs = [0.025, 0.1, 0.5, 0.9, 0.975];
    const [q] = runR(`lo <- c(1.8e9, 1.9e9); mid <- c(2.0e9, 2.05e9); hi <- c(2.3e9, 2.15e9)
sl <- (mid - lo) / qnorm(0.9); sh <- (hi - mid) / qnorm(0.9)
F <- function(x) 0.7 * mean(ifelse(x <= mid, pnorm(x, mid, sl), pnorm(x, mid, sh))) + 0.3 * pnorm(x, 2.1e9, 5e7)
out(sapply(${rVector(probs)}, function(p) uniroot(function(x) F(x) - p, c(1e9, 3e9), tol = 1e-4, maxiter = 10000)$root))`);
    const d = blendDistribution(panelFromThreePoint(big).distribution, normalDistribution(2.1e9, 5e7), 0.7);
    probs.forEach((p, i) => expect(Math.abs(distributionQuantile(d, p) - q[i]) / q[i], `p = ${p}`).toBeLessThan(1e-11));
  });

  it("stays correct when the panel is a point mass (all answers equal): hand-derived quantiles", () => {
    // F(x) = 0.5·1{x ≥ 100} + 0.5·Φ((x − 100)/10). Hand: Q(0.1) = 100 + 10·Φ⁻¹(0.2),
    // Q(0.5) = 100 (the jump from 0.25 to 0.75), Q(0.9) = 100 + 10·Φ⁻¹(0.8); Φ⁻¹ from R.
    const [[z2, z8]] = runR("out(qnorm(c(0.2, 0.8)))");
    const panel = panelFromSpread([100, 100, 100]);
    expect(panel.sd).toBe(0);
    const d = blendDistribution(panel.distribution, normalDistribution(100, 10), 0.5);
    expect(distributionQuantile(d, 0.1)).toBeCloseTo(100 + 10 * z2, 9);
    expect(distributionQuantile(d, 0.5)).toBe(100);
    expect(distributionQuantile(d, 0.3)).toBe(100);
    expect(distributionQuantile(d, 0.9)).toBeCloseTo(100 + 10 * z8, 9);
  });
});

describe("variance and the sum-of-parts panel distribution", () => {
  it("variance of the blended mixture equals Simpson's ∫(x − mean)²·f(x)dx with the test's own density", () => {
    const d = blended();
    const m = distributionMean(d);
    const v = simpson((x) => (x - m) ** 2 * testDensity(x), -400, 700, ANSWERS.map((a) => a.mid));
    expect(distributionVariance(d)).toBeCloseTo(v, 6);
  });

  it("sum of parts: mean Σ mean_i and sd √Σ var_i, each part's moments by R integrate() on its two-piece density", () => {
    const [[mean, sd]] = runR(`
lo <- c(80, 90, 70); mid <- c(100, 110, 95); hi <- c(140, 120, 130)
m <- 0; v <- 0
for (i in 1:3) {
  f <- function(x) ifelse(x < mid[i], dnorm(x, mid[i], (mid[i] - lo[i]) / qnorm(0.9)), dnorm(x, mid[i], (hi[i] - mid[i]) / qnorm(0.9)))
  m1 <- integrate(function(x) x * f(x), -Inf, mid[i], rel.tol = 1e-12)$value + integrate(function(x) x * f(x), mid[i], Inf, rel.tol = 1e-12)$value
  m2 <- integrate(function(x) (x - m1)^2 * f(x), -Inf, mid[i], rel.tol = 1e-12)$value + integrate(function(x) (x - m1)^2 * f(x), mid[i], Inf, rel.tol = 1e-12)$value
  m <- m + m1; v <- v + m2
}
out(c(m, sqrt(v)))`);
    const p = panelFromParts(ANSWERS);
    expect(p.rule).toBe("sum of parts");
    expect(p.distribution).toMatchObject({ kind: "normal" });
    expect(Math.abs(distributionMean(p.distribution) - mean) / mean).toBeLessThan(1e-9);
    expect(Math.abs(p.sd - sd) / sd).toBeLessThan(1e-8);
    expect(() => panelFromParts([{ low: 2, mid: 1, high: 3 }])).toThrow(/parts\[0\]/);
  });
});

describe("linearPool, baselineDistribution and the policy", () => {
  it("linearPool normalises weights, flattens nested mixtures and drops zero weights", () => {
    const inner = linearPool([
      { weight: 1, distribution: normalDistribution(0, 1) },
      { weight: 3, distribution: normalDistribution(10, 2) },
    ]);
    expect(inner.weights).toEqual([0.25, 0.75]);
    const outer = linearPool([
      { weight: 2, distribution: inner },
      { weight: 2, distribution: normalDistribution(5, 1) },
      { weight: 0, distribution: normalDistribution(99, 1) },
    ]);
    expect(outer.weights).toEqual([0.125, 0.375, 0.5]);
    expect(outer.components).toHaveLength(3);
    expect(() => linearPool([])).toThrow(RangeError);
    expect(() => linearPool([{ weight: -1, distribution: inner }])).toThrow(/weight/);
    expect(() => linearPool([{ weight: 0, distribution: inner }])).toThrow(/all weights are 0/);
    expect(() => blendDistribution(inner, inner, 1.5)).toThrow(/panelWeight/);
  });

  it("baseline sd: given sd first, else the 80% interval, else the 95% (qnorm from R)", () => {
    const [[z90, z975]] = runR("out(qnorm(c(0.9, 0.975)))");
    expect(baselineDistribution({ mean: 105, sd: 7, lower80: 0, upper80: 1 }).distribution.sd).toBe(7);
    const b80 = baselineDistribution({ mean: 105, lower80: 90, upper80: 120, lower95: 60, upper95: 150 });
    expect(b80.sdSource).toBe("80% interval");
    expect(b80.distribution.sd).toBeCloseTo(30 / (2 * z90), 12);
    const b95 = baselineDistribution({ mean: 105, lower95: 80, upper95: 130 });
    expect(b95.sdSource).toBe("95% interval");
    expect(b95.distribution.sd).toBeCloseTo(50 / (2 * z975), 12);
  });

  it("baseline errors say what to fix", () => {
    expect(() => baselineDistribution({ mean: 105 })).toThrow(/give sd/);
    expect(() => baselineDistribution({ mean: 105, sd: 0 })).toThrow(/sd/);
    expect(() => baselineDistribution({ mean: 105, lower80: 90 })).toThrow(/needs both/);
    expect(() => baselineDistribution({ mean: 105, lower80: 120, upper80: 90 })).toThrow(/must be below/);
    expect(() => baselineDistribution({ mean: NaN, sd: 1 })).toThrow(/mean/);
  });

  it("quantile policy: p = 0 / 1 give the infinite tails, NaN and out-of-range p throw; NaN x throws", () => {
    const d = blended();
    expect(distributionQuantile(d, 0)).toBe(-Infinity);
    expect(distributionQuantile(d, 1)).toBe(Infinity);
    expect(() => distributionQuantile(d, NaN)).toThrow(RangeError);
    expect(() => distributionQuantile(d, 1.1)).toThrow(RangeError);
    expect(() => distributionCdf(d, NaN)).toThrow(RangeError);
    expect(() => panelFromSpread([1, NaN])).toThrow(/values\[1\]/);
    expect(() => panelFromSpread([])).toThrow(RangeError);
    expect(() => normalDistribution(0, -1)).toThrow(/sd/);
  });
});
