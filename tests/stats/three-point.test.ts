/**
 * Three-point answers and their linear opinion pool (lib/stats/three-point.ts).
 * Expected values: R 4.x via Rscript (pnorm/qnorm, uniroot on the pooled CDF, integrate for
 * the moments — numerical integration, independent of the closed-form moments in the code)
 * and hand derivations from the definition, named beside each check.
 */
import { describe, expect, it } from "vitest";
import { poolThreePoint, threePointCdf, Z90, type ThreePoint } from "../../lib/stats/three-point";
import { expectClose, runR, rVector } from "./rscript";

const answers: readonly ThreePoint[] = Object.freeze([
  { low: 9000, median: 12000, high: 18000 },
  { low: 10000, median: 14000, high: 16000 },
  { low: 6000, median: 11000, high: 20000 },
  { low: 12000, median: 15000, high: 19000 },
  { low: 8000, median: 10500, high: 14000 },
]);

describe("Z90", () => {
  it("is the standard normal 90th percentile (R: qnorm(0.9) = 1.2815515655446004)", () => {
    expect(Z90).toBeCloseTo(1.2815515655446004, 12);
  });
});

describe("threePointCdf", () => {
  it("passes through the three stated percentiles (by construction: Φ(−z₀.₉) = 0.1, Φ(0) = 0.5, Φ(z₀.₉) = 0.9)", () => {
    const a = answers[0];
    expect(threePointCdf(a, a.low)).toBeCloseTo(0.1, 12);
    expect(threePointCdf(a, a.median)).toBe(0.5);
    expect(threePointCdf(a, a.high)).toBeCloseTo(0.9, 12);
  });
});

describe("poolThreePoint", () => {
  it("of one answer returns its own P10 / P50 / P90 (hand: the pool of one distribution is that distribution)", () => {
    const p = poolThreePoint([{ low: 80, median: 100, high: 150 }]);
    expect(p.p10).toBeCloseTo(80, 6);
    expect(p.p50).toBeCloseTo(100, 6);
    expect(p.p90).toBeCloseTo(150, 6);
  });

  it("of one symmetric answer is the normal with sd = (high − mid) / z₀.₉ (hand derivation)", () => {
    const p = poolThreePoint([{ low: 80, median: 100, high: 120 }]);
    expect(p.mean).toBeCloseTo(100, 10);
    expect(p.sd).toBeCloseTo(20 / 1.2815515655446004, 9);
    // quartiles of N(100, sd): 100 ± qnorm(0.75)·sd = 100 ± 0.6744897501960817·15.60608 (R qnorm)
    expect(p.p25).toBeCloseTo(100 - 0.6744897501960817 * (20 / 1.2815515655446004), 6);
  });

  it("matches R's mixture quantiles (uniroot) and moments (integrate) for five answers", () => {
    const L = answers.map((a) => a.low);
    const M = answers.map((a) => a.median);
    const H = answers.map((a) => a.high);
    const [quantiles, moments] = runR(`
      L <- ${rVector(L)}; M <- ${rVector(M)}; H <- ${rVector(H)}
      z <- qnorm(0.9); sL <- (M - L) / z; sR <- (H - M) / z
      Fi <- function(x, i) if (x <= M[i]) pnorm((x - M[i]) / sL[i]) else pnorm((x - M[i]) / sR[i])
      F <- function(x) mean(sapply(seq_along(M), function(i) Fi(x, i)))
      q <- function(p) uniroot(function(x) F(x) - p, c(0, 40000), tol = 1e-10)$root
      out(sapply(c(0.1, 0.25, 0.5, 0.75, 0.9), q))
      m1 <- 0; m2 <- 0
      for (i in seq_along(M)) {
        fl <- function(x) dnorm((x - M[i]) / sL[i]) / sL[i]
        fr <- function(x) dnorm((x - M[i]) / sR[i]) / sR[i]
        m1 <- m1 + (integrate(function(x) x * fl(x), -Inf, M[i], rel.tol = 1e-12)$value + integrate(function(x) x * fr(x), M[i], Inf, rel.tol = 1e-12)$value) / length(M)
        m2 <- m2 + (integrate(function(x) x^2 * fl(x), -Inf, M[i], rel.tol = 1e-12)$value + integrate(function(x) x^2 * fr(x), M[i], Inf, rel.tol = 1e-12)$value) / length(M)
      }
      out(c(m1, sqrt(m2 - m1^2)))
    `);
    const p = poolThreePoint(answers);
    expect(p.n).toBe(5);
    expectClose([p.p10, p.p25, p.p50, p.p75, p.p90], quantiles, 1e-8, "pooled quantiles vs R uniroot");
    expectClose([p.mean, p.sd], moments, 1e-7, "pooled mean and sd vs R integrate");
  });

  it("handles a degenerate side (low = median): half the mass sits on the median", () => {
    // Hand: F(x) = 0 below 50, 0.5 at 50, so the pool of this answer alone has P10 = P50 = 50.
    const p = poolThreePoint([{ low: 50, median: 50, high: 70 }]);
    expect(p.p10).toBeCloseTo(50, 8);
    expect(p.p50).toBeCloseTo(50, 8);
    expect(p.p90).toBeCloseTo(70, 6);
  });

  it("rejects empty input and answers out of order (RangeError)", () => {
    expect(() => poolThreePoint([])).toThrow(RangeError);
    expect(() => poolThreePoint([{ low: 5, median: 4, high: 6 }])).toThrow(/low ≤ median ≤ high/);
    expect(() => poolThreePoint([{ low: 1, median: Number.NaN, high: 6 }])).toThrow(RangeError);
  });
});
