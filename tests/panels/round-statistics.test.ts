/**
 * Round statistics of a question (lib/panels/round-statistics.ts) against R: quantile(type = 7),
 * median, IQR, mean, sd, min, max on the same answers (run through Rscript); the pooled
 * distribution of three-point answers against R's uniroot() on the pooled CDF built from pnorm
 * and integrate() for its moments (numerical integration, independent of the closed-form moments
 * in lib/blend), and hand derivations from the definition, named beside each check.
 */
import { describe, expect, it } from "vitest";
import { computeQuestionStatistics, type FinalAnswer } from "../../lib/panels/round-statistics";
import { expectClose, runR, rVector } from "../stats/rscript";

function rSummary(values: readonly number[]): number[] {
  const [line] = runR(`
    x <- ${rVector(values)}
    q <- quantile(x, c(0.25, 0.5, 0.75), type = 7, names = FALSE)
    out(c(length(x), mean(x), sd(x), sd(x) / mean(x), min(x), max(x), q[1], median(x), q[3], IQR(x), IQR(x) / abs(median(x))))
  `);
  return line;
}

const asArray = (s: Record<string, number | null> | null) =>
  s ? [s.n, s.mean, s.sd, s.cv, s.min, s.max, s.q1, s.median, s.q3, s.iqr, s.relativeIqr].map((v) => v ?? Number.NaN) : [];

const single = (vals: number[]): FinalAnswer[] => vals.map((v, i) => ({ pseudonym: `P${i}`, value: v, low: null, high: null }));
const threePoint = (abc: [number, number, number][]): FinalAnswer[] => abc.map(([low, value, high], i) => ({ pseudonym: `P${i}`, value, low, high }));
const pooledOf = (abc: [number, number, number][]) =>
  computeQuestionStatistics({ id: "q", answerFormat: "three-point", aggregation: "shared" }, 1, threePoint(abc)).pooled!;

/**
 * R's pooled figures for three-point answers (L, M, H): each answer the two-piece normal with
 * sd (M − L)/qnorm(0.9) below M and (H − M)/qnorm(0.9) above, pooled with equal weights;
 * quantiles by uniroot() on the pooled CDF, mean and sd by integrate() on each density.
 */
function rPooled(ans: readonly FinalAnswer[]): { quantiles: number[]; moments: number[] } {
  const [quantiles, moments] = runR(`
    L <- ${rVector(ans.map((a) => a.low!))}; M <- ${rVector(ans.map((a) => a.value))}; H <- ${rVector(ans.map((a) => a.high!))}
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
  return { quantiles, moments };
}

describe("computeQuestionStatistics", () => {
  it("single values: every figure equals R's", () => {
    const vals = [12000, 15500, 9800, 21000, 14250, 13000, 17600];
    const s = computeQuestionStatistics({ id: "q1", answerFormat: "single", aggregation: "shared" }, 1, single(vals));
    expect(s.n).toBe(7);
    expectClose(asArray(s.values), rSummary(vals), 1e-12, "single values vs R");
    expect(s.lows).toBeNull();
    expect(s.pooled).toBeNull();
    expect(s.sumOfParts).toBeNull();
  });

  it("three-point: median estimates (P50), lows and highs each equal R's; the pooled quantiles and moments equal R's", () => {
    const ans: FinalAnswer[] = [
      { pseudonym: "A", value: 12000, low: 9000, high: 18000 },
      { pseudonym: "B", value: 14000, low: 10000, high: 16000 },
      { pseudonym: "C", value: 11000, low: 6000, high: 20000 },
      { pseudonym: "D", value: 15000, low: 12000, high: 19000 },
      { pseudonym: "E", value: 10500, low: 8000, high: 14000 },
    ];
    const s = computeQuestionStatistics({ id: "q", answerFormat: "three-point", aggregation: "shared" }, 2, ans);
    expectClose(asArray(s.values), rSummary(ans.map((a) => a.value)), 1e-12, "median estimates vs R");
    expectClose(asArray(s.lows), rSummary(ans.map((a) => a.low!)), 1e-12, "lows vs R");
    expectClose(asArray(s.highs), rSummary(ans.map((a) => a.high!)), 1e-12, "highs vs R");
    const r = rPooled(ans);
    const p = s.pooled!;
    expect(p.n).toBe(5);
    expectClose([p.p10, p.p25, p.p50, p.p75, p.p90], r.quantiles, 1e-8, "pooled quantiles vs R uniroot");
    expectClose([p.mean, p.sd], r.moments, 1e-7, "pooled mean and sd vs R integrate");
  });

  it("pooled, one answer: its own P10 / P50 / P90 (hand: the pool of one distribution is that distribution)", () => {
    const p = pooledOf([[80, 100, 150]]);
    expect(p.p10).toBeCloseTo(80, 9);
    expect(p.p50).toBe(100);
    expect(p.p90).toBeCloseTo(150, 9);
  });

  it("pooled, one symmetric answer: the normal with sd = (high − mid) / qnorm(0.9) (hand derivation, qnorm from R)", () => {
    const [[z90, z75]] = runR("out(qnorm(c(0.9, 0.75)))");
    const p = pooledOf([[80, 100, 120]]);
    expect(p.mean).toBeCloseTo(100, 10);
    expect(p.sd).toBeCloseTo(20 / z90, 10);
    // quartiles of N(100, sd²): 100 ± qnorm(0.75)·sd
    expect(p.p25).toBeCloseTo(100 - z75 * (20 / z90), 9);
    expect(p.p75).toBeCloseTo(100 + z75 * (20 / z90), 9);
  });

  it("pooled, a degenerate side (low = median): half the mass sits on the median", () => {
    // Hand: F(x) = 0 below 50 and 0.5 at 50, so this answer alone has P10 = P25 = P50 = 50.
    const p = pooledOf([[50, 50, 70]]);
    expect([p.p10, p.p25, p.p50]).toEqual([50, 50, 50]);
    expect(p.p90).toBeCloseTo(70, 9);
  });

  it("sum of parts: the total is R's sum() and each share its value over the total", () => {
    const vals = [4200, 3100, 2600, 1900];
    const s = computeQuestionStatistics({ id: "q", answerFormat: "single", aggregation: "sum-of-parts" }, 1, single(vals));
    const [[total]] = runR(`out(sum(${rVector(vals)}))`);
    expect(s.sumOfParts?.total).toBe(total);
    expect(s.sumOfParts?.parts.map((p) => p.value)).toEqual([4200, 3100, 2600, 1900]);
    expect(s.sumOfParts?.parts[0].share).toBeCloseTo(4200 / 11800, 15);
  });

  it("one answer: sd and CV are null (R's sd gives NA), IQR 0; no answers: all null", () => {
    const one = computeQuestionStatistics({ id: "q", answerFormat: "single", aggregation: "shared" }, 1, single([500]));
    expect(one.values?.sd).toBeNull();
    expect(one.values?.cv).toBeNull();
    expect(one.values?.iqr).toBe(0);
    const none = computeQuestionStatistics({ id: "q", answerFormat: "single", aggregation: "shared" }, 1, []);
    expect(none.n).toBe(0);
    expect(none.values).toBeNull();
  });
});
