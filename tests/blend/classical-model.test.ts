/**
 * Cooke's classical model (lib/blend/classical-model.ts, docs/methods.md §21).
 *
 * References:
 * - Calibration = 1 − F_χ²(3)(2N·I(s, p)), p = (0.05, 0.45, 0.45, 0.05) (Cooke 1991, via the TU Delft
 *   teaching notes on structured expert judgment): R's `pchisq(…, 3, lower.tail = FALSE)` run in the
 *   test on the same I, and I itself by R from the counts. The teaching notes' worked example
 *   (N = 8, counts 4, 3, 0, 1 and 1, 3, 3, 1) prints rounded values (I ≈ 1.19, Cal ≈ 0.00027;
 *   I ≈ 0.082, Cal ≈ 0.73) from shares rounded to 2 decimals; the exact values are checked here
 *   against R, and the printed ones only to their rounding where they agree.
 * - Information I_j = Σ p_k ln(p_k/(x_k − x_{k−1})) + ln(U* − L*): R's `integrate` of f·ln(f/g)
 *   for the piecewise-uniform density f against the uniform g on [L*, U*], run in the test.
 * - The pooled 5/50/95 percentiles of a linear pool: R (approxfun for each CDF, uniroot on the
 *   weighted sum) run in the test.
 * - χ²(3) survival in closed form (Abramowitz & Stegun 26.4.5) against R `pchisq`.
 */
import { describe, expect, it } from "vitest";
import {
  backgroundFor,
  calibrationScore,
  chiSquare3Survival,
  equalWeightPool,
  informationScore,
  intrinsicRange,
  leaveOneOut,
  panelistScores,
  performanceWeightedPool,
  pooledQuantiles,
  relativeInformation,
  type Assessment,
  type CalibrationQuestion,
} from "../../lib/blend/classical-model";
import { rEval, rVector } from "../helpers/r";

const COUNTS = [
  [4, 3, 0, 1],
  [1, 3, 3, 1],
  [0, 5, 5, 0],
  [1, 9, 9, 1],
  [2, 8, 8, 2],
  [0, 0, 0, 7],
  [3, 0, 0, 0],
];

describe("calibration", () => {
  const r = rEval(
    COUNTS.map((c, i) => `c <- ${rVector(c)}; s <- c / sum(c); p <- c(0.05, 0.45, 0.45, 0.05)
      I <- sum(ifelse(s > 0, s * log(s / p), 0)); out("I${i}", I); out("cal${i}", pchisq(2 * sum(c) * I, 3, lower.tail = FALSE))`).join("\n") +
      `\nout("chi", pchisq(c(0.001, 0.5, 3, 7.81, 20, 60), 3, lower.tail = FALSE))`,
    { withForecast: false },
  );

  it("I(s, p) and the χ²(3) p-value agree with R", () => {
    COUNTS.forEach((c, i) => {
      const n = c.reduce((a, b) => a + b, 0);
      expect(relativeInformation(c.map((x) => x / n))).toBeCloseTo(r[`I${i}`][0], 13);
      const cal = calibrationScore(c);
      expect(Math.abs(cal - r[`cal${i}`][0]) / Math.max(r[`cal${i}`][0], 1e-300)).toBeLessThan(1e-12);
    });
    [0.001, 0.5, 3, 7.81, 20, 60].forEach((x, i) => expect(Math.abs(chiSquare3Survival(x) - r.chi[i]) / r.chi[i]).toBeLessThan(1e-12));
  });

  it("the teaching notes' worked example, to the notes' rounding", () => {
    // counts (4, 3, 0, 1): notes print I ≈ 1.19 and Cal ≈ 0.00027 (from rounded shares)
    expect(calibrationScore([4, 3, 0, 1])).toBeCloseTo(0.00025, 4);
    expect(relativeInformation([4 / 8, 3 / 8, 0, 1 / 8])).toBeCloseTo(1.19, 1);
    // a panelist whose shares equal p exactly scores 1 (I = 0), by hand
    expect(calibrationScore([1, 9, 9, 1])).toBe(1);
  });

  it("refuses what it cannot score", () => {
    expect(() => calibrationScore([0, 0, 0, 0])).toThrow(/at least one calibration question/);
    expect(() => calibrationScore([1, 2, 3])).toThrow(/four/);
    expect(() => chiSquare3Survival(NaN)).toThrow(/≥ 0/);
  });
});

describe("information", () => {
  it("matches R's integrate of f·ln(f/g) on the intrinsic range", () => {
    const cases: [Assessment, [number, number]][] = [
      [[10, 20, 40], [-0.5, 65.5]],
      [[1, 1.5, 30], [0.2, 40]],
      [[50, 51, 52], [0, 100]],
    ];
    const r = rEval(
      cases
        .map(([a, rg], i) => `x <- c(${rg[0]}, ${a.join(", ")}, ${rg[1]}); p <- c(0.05, 0.45, 0.45, 0.05)
          f <- function(t) { k <- findInterval(t, x, rightmost.closed = TRUE, all.inside = TRUE); p[k] / diff(x)[k] }
          g <- 1 / (x[5] - x[1])
          v <- sum(sapply(1:4, function(k) integrate(function(t) f(t) * log(f(t) / g), x[k], x[k + 1], rel.tol = 1e-12)$value))
          out("inf${i}", v)`)
        .join("\n"),
      { withForecast: false },
    );
    cases.forEach(([a, rg], i) => expect(informationScore(a, rg)).toBeCloseTo(r[`inf${i}`][0], 9));
    // L = 5, U = 60 over both panelists and the true value, widened by 10% of 55 (hand): L* = −0.5, U* = 65.5
    const range = intrinsicRange([[10, 20, 40], [5, 30, 60]], 25);
    expect(range[0]).toBeCloseTo(-0.5, 12);
    expect(range[1]).toBeCloseTo(65.5, 12);
  });

  it("is 0 for percentiles at the background's own 5/50/95 percentiles, and larger for narrower ones", () => {
    expect(informationScore([5, 50, 95], [0, 100])).toBeCloseTo(0, 14);
    expect(informationScore([40, 50, 60], [0, 100])).toBeGreaterThan(informationScore([20, 50, 80], [0, 100]));
  });

  it("log-uniform background: the same formula on ln x", () => {
    expect(informationScore([10, 100, 1000], [1, 10000], "log-uniform")).toBeCloseTo(informationScore([1, 2, 3], [0, 4]), 12);
    expect(() => intrinsicRange([[0, 1, 2]], 1, "log-uniform")).toThrow(/above 0/);
  });
});

describe("backgroundFor", () => {
  it("is log-uniform only for positive values spanning two orders of magnitude (factor 100: common practice)", () => {
    // Hand cases: ratio 99.9 / 1 < 100; ratio 100 / 1 = 100; a value at 0 or below, or not finite, keeps the uniform background.
    expect(backgroundFor([1, 50, 99.9])).toBe("uniform");
    expect(backgroundFor([1, 10, 100])).toBe("log-uniform");
    expect(backgroundFor([0, 10, 1000])).toBe("uniform");
    expect(backgroundFor([-5, 10, 1000])).toBe("uniform");
    expect(backgroundFor([])).toBe("uniform");
    expect(backgroundFor([1, Number.NaN, 1000])).toBe("uniform");
  });

  it("the information score on a log-uniform background equals R's integral of f·ln(f/g) on ln x", () => {
    // One question spanning four orders of magnitude: two panelists' P5/P50/P95 and the true value 300.
    const assessments: Assessment[] = [[10, 100, 1000], [50, 400, 100000]];
    const question: CalibrationQuestion = { assessments, realisation: 300, background: backgroundFor([...assessments.flat(), 300]) };
    expect(question.background).toBe("log-uniform");
    const scores = panelistScores([question]);
    // R: the intrinsic range on ln x (every percentile and the true value, widened by 10% each side) and the
    // relative information of the minimum-information density against the uniform density on it, by integrate.
    const r = rEval(
      assessments
        .map((a, i) => `v <- log(c(${[...assessments.flat(), 300].join(", ")})); pad <- 0.1 * (max(v) - min(v))
          x <- c(min(v) - pad, log(c(${a.join(", ")})), max(v) + pad); p <- c(0.05, 0.45, 0.45, 0.05)
          f <- function(t) { k <- findInterval(t, x, rightmost.closed = TRUE, all.inside = TRUE); p[k] / diff(x)[k] }
          g <- 1 / (x[5] - x[1])
          out("inf${i}", sum(sapply(1:4, function(k) integrate(function(t) f(t) * log(f(t) / g), x[k], x[k + 1], rel.tol = 1e-12)$value)))`)
        .join("\n"),
      { withForecast: false },
    );
    scores.forEach((s, i) => expect(s.information).toBeCloseTo(r[`inf${i}`][0], 9));
  });
});

describe("pools", () => {
  // Three panelists on four calibration questions (invented assessments; the checks are R's
  // pooled quantiles and the formulas' structure, not the numbers themselves).
  const questions: CalibrationQuestion[] = [
    { assessments: [[8, 10, 12], [5, 12, 30], [20, 25, 30]], realisation: 11 },
    { assessments: [[40, 50, 60], [30, 55, 90], [70, 80, 90]], realisation: 52 },
    { assessments: [[1, 2, 3], [0.5, 2.5, 6], [4, 5, 6]], realisation: 2.2 },
    { assessments: [[100, 120, 140], [90, 130, 200], [150, 160, 170]], realisation: 125 },
  ];

  it("pooled percentiles match R's inversion of the weighted CDFs", () => {
    const q = questions[0];
    const range = intrinsicRange(q.assessments, q.realisation);
    const w = [0.5, 0.3, 0.2];
    const ours = pooledQuantiles(q.assessments, w, range);
    const r = rEval(`L <- ${range[0]}; U <- ${range[1]}; w <- ${rVector(w)}
      A <- list(${q.assessments.map((a) => rVector(a)).join(", ")})
      Fs <- lapply(A, function(a) approxfun(c(L, a, U), c(0, 0.05, 0.5, 0.95, 1), rule = 2, ties = "ordered"))
      F <- function(x) sum(sapply(seq_along(Fs), function(e) w[e] * Fs[[e]](x)))
      out("q", sapply(c(0.05, 0.5, 0.95), function(p) uniroot(function(x) F(x) - p, c(L, U), tol = 1e-13)$root))`, { withForecast: false });
    ours.forEach((v, i) => expect(v).toBeCloseTo(r.q[i], 8));
  });

  it("an assessment at P10/P50/P90 (a target question) pools through those levels, as R's inversion does", () => {
    const a: Assessment[] = [[900, 1200, 1500], [1000, 1100, 1800], [700, 1300, 1400]];
    const range = intrinsicRange(a, null);
    const w = [0.6, 0.1, 0.3];
    const ours = pooledQuantiles(a, w, range, [0.05, 0.5, 0.95], "uniform", [0.1, 0.5, 0.9]);
    const r = rEval(`L <- ${range[0]}; U <- ${range[1]}; w <- ${rVector(w)}
      A <- list(${a.map((x) => rVector(x)).join(", ")})
      Fs <- lapply(A, function(a) approxfun(c(L, a, U), c(0, 0.1, 0.5, 0.9, 1), rule = 2, ties = "ordered"))
      F <- function(x) sum(sapply(seq_along(Fs), function(e) w[e] * Fs[[e]](x)))
      out("q", sapply(c(0.05, 0.5, 0.95), function(p) uniroot(function(x) F(x) - p, c(L, U), tol = 1e-13)$root))`, { withForecast: false });
    ours.forEach((v, i) => expect(v).toBeCloseTo(r.q[i], 8));
    expect(() => pooledQuantiles(a, w, range, [0.5], "uniform", [0.5, 0.1, 0.9])).toThrow(/increase inside/);
  });

  it("performance weights are calibration × information over those kept, and both pools are scored", () => {
    const scores = panelistScores(questions);
    const pw = performanceWeightedPool(questions);
    expect(pw.weights.reduce((a, b) => a + b, 0)).toBeCloseTo(1, 14);
    const kept = scores.map((s) => s.calibration >= pw.cutoff!);
    const sum = scores.reduce((a, s, e) => a + (kept[e] ? s.combined : 0), 0);
    scores.forEach((s, e) => expect(pw.weights[e]).toBeCloseTo(kept[e] ? s.combined / sum : 0, 14));
    // panelist 3 never holds the true value inside 5–95: calibration below the others', by hand counts
    expect(scores[2].binCounts).toEqual([4, 0, 0, 0]);
    expect(scores[2].calibration).toBeLessThan(scores[0].calibration);
    const ew = equalWeightPool(questions);
    expect(ew.weights).toEqual([1 / 3, 1 / 3, 1 / 3]);
    // the optimised pool's combined score is the best over the cut-offs it tried, so at least that
    // of keeping everyone with performance weights (α = the lowest calibration score)
    expect(Number.isFinite(ew.score.combined)).toBe(true);
    expect(pw.score.combined).toBeGreaterThan(0);
  });

  it("leave-one-out puts each true value in one bin of each pool", () => {
    const cv = leaveOneOut(questions);
    expect(cv.performance.binCounts.reduce((a, b) => a + b, 0)).toBe(4);
    expect(cv.equal.binCounts.reduce((a, b) => a + b, 0)).toBe(4);
    expect(() => leaveOneOut(questions.slice(0, 1))).toThrow(/at least 2/);
  });

  it("refuses bad input with the question and panelist named", () => {
    expect(() => panelistScores([{ assessments: [[3, 2, 1]], realisation: 1 }])).toThrow(/question 1, panelist 1: percentiles must not decrease/);
    expect(() => panelistScores([])).toThrow(/at least one calibration question/);
    expect(() => pooledQuantiles([[1, 2, 3]], [0], [0, 4])).toThrow(/not all 0/);
  });
});
