import { describe, expect, it } from "vitest";
import { intervalHitRate } from "../../lib/blend";
import { biasAdvice, MIN_OUTCOMES_FOR_ADVICE, rangeAdvice } from "../../lib/blend/own-record";
import { binomialCdf, binomialUpperTail } from "../../lib/stats";
import { rEval } from "../helpers/r";

const hits = (h: number, n: number, nominal = 0.8) => ({ count: n, hits: h, rate: n ? h / n : NaN, nominal });

describe("binomialCdf / binomialUpperTail against R, docs/methods.md §22", () => {
  it("equal R's pbinom and binom.test's one-sided p-values [R run in the test]", () => {
    const cases: [number, number, number][] = [
      [5, 10, 0.8],
      [8, 10, 0.8],
      [0, 5, 0.8],
      [1, 5, 0.8],
      [20, 20, 0.8],
      [7, 12, 0.9],
      [40, 60, 0.8],
      [300, 400, 0.8],
    ];
    const r = rEval(
      cases
        .map(
          ([k, n, p], i) =>
            `out("lo${i}", binom.test(${k}, ${n}, ${p}, alternative = "less")$p.value); out("hi${i}", binom.test(${k}, ${n}, ${p}, alternative = "greater")$p.value); out("cdf${i}", pbinom(${k}, ${n}, ${p}))`,
        )
        .join("\n"),
      { withForecast: false },
    );
    cases.forEach(([k, n, p], i) => {
      const lo = binomialCdf(k, n, p);
      const hi = binomialUpperTail(k, n, p);
      expect(Math.abs(lo - r[`cdf${i}`][0]) / Math.max(r[`cdf${i}`][0], 1e-300)).toBeLessThan(1e-11);
      expect(Math.abs(lo - r[`lo${i}`][0]) / Math.max(r[`lo${i}`][0], 1e-300)).toBeLessThan(1e-11);
      expect(Math.abs(hi - r[`hi${i}`][0]) / Math.max(r[`hi${i}`][0], 1e-300)).toBeLessThan(1e-11);
      // The p-values rangeAdvice reports are these.
      if (n >= MIN_OUTCOMES_FOR_ADVICE) {
        const a = rangeAdvice(hits(k, n, p), "ranges");
        expect(a.pLow).toBe(lo);
        expect(a.pHigh).toBe(hi);
      }
    });
  });

  it("P(X ≤ 5) for Binomial(10, 0.8) = 0.0327935 [hand: Σ_{k≤5} C(10,k)·0.8^k·0.2^(10−k) = 1.024e-7 + 4.096e-6 + 7.3728e-5 + 7.86432e-4 + 5.50502e-3 + 2.64241e-2]", () => {
    expect(binomialCdf(5, 10, 0.8)).toBeCloseTo(0.0327935, 6);
  });

  it("edges: k < 0 → 0, k ≥ n → 1, p = 0 and p = 1 exact; bad input throws", () => {
    expect(binomialCdf(-1, 5, 0.3)).toBe(0);
    expect(binomialCdf(5, 5, 0.3)).toBe(1);
    expect(binomialUpperTail(0, 5, 0.3)).toBe(1);
    expect(binomialUpperTail(6, 5, 0.3)).toBe(0);
    expect(binomialCdf(2, 5, 0)).toBe(1);
    expect(binomialUpperTail(2, 5, 1)).toBe(1);
    expect(() => binomialCdf(1.5, 5, 0.3)).toThrow(RangeError);
    expect(() => binomialCdf(1, 5, 1.2)).toThrow(RangeError);
    expect(() => binomialCdf(1, NaN, 0.3)).toThrow(RangeError);
  });
});

describe("rangeAdvice: hand-worked cases (binomial sums by hand; 0.05 level and 5 outcomes are common practice)", () => {
  it("5 of 10 80% ranges held: P(X ≤ 5) = 0.0328 < 0.05 → widen [hand, above]", () => {
    const a = rangeAdvice(hits(5, 10), "80% ranges");
    expect(a.verdict).toBe("too-narrow");
    expect(a.sentence).toBe("Your 80% ranges held 5 times in 10, where 80% would be about 8: widen them.");
  });

  it("8 of 10: P(X ≤ 8) = 1 − 10·0.8⁹·0.2 − 0.8¹⁰ = 0.6242, P(X ≥ 8) = 0.6778 → keep [hand]", () => {
    const a = rangeAdvice(hits(8, 10), "80% ranges");
    expect(a.verdict).toBe("as-stated");
    expect(a.pLow).toBeCloseTo(0.62419, 5);
    expect(a.pHigh).toBeCloseTo(0.6778, 4);
    expect(a.sentence).toBe("Your 80% ranges held 8 times in 10, in line with 80%: keep them as they are.");
  });

  it("20 of 20: P(X ≥ 20) = 0.8²⁰ = 0.0115292 < 0.05 → may narrow [hand: (0.8¹⁰)² = 0.1073741824²]", () => {
    const a = rangeAdvice(hits(20, 20), "80% ranges");
    expect(a.pHigh).toBeCloseTo(0.011529215, 8);
    expect(a.verdict).toBe("too-wide");
  });

  it("2 of 5: P(X ≤ 2) = 0.00032 + 0.0064 + 0.0512 = 0.05792 ≥ 0.05 → keep; 1 of 5: 0.00672 → widen [hand]", () => {
    expect(rangeAdvice(hits(2, 5), "80% ranges").verdict).toBe("as-stated");
    expect(rangeAdvice(hits(2, 5), "80% ranges").pLow).toBeCloseTo(0.05792, 10);
    expect(rangeAdvice(hits(1, 5), "80% ranges").verdict).toBe("too-narrow");
  });

  it("10 of 10 at 90%: P(X ≥ 10) = 0.9¹⁰ = 0.3487 → keep [hand]", () => {
    const a = rangeAdvice(hits(10, 10, 0.9), "90% ranges on calibration questions");
    expect(a.verdict).toBe("as-stated");
    expect(a.pHigh).toBeCloseTo(0.3486784401, 10);
  });

  it("fewer than 5 outcomes: says so and gives no advice, even 0 of 4 (policy)", () => {
    const a = rangeAdvice(hits(0, 4), "80% ranges");
    expect(a.verdict).toBe("too-few");
    expect(a.sentence).toBe("Your 80% ranges held 0 times in 4: too few outcomes to say whether they are too narrow or too wide (advice from 5 outcomes on).");
    expect(rangeAdvice(hits(0, 0), "80% ranges").sentence).toBe("None of your 80% ranges has met an outcome yet: nothing to say about them so far.");
  });

  it("takes intervalHitRate's output as it is (same figures the track record shows)", () => {
    const rec = [
      { actual: 100, answer: 90, low: 80, high: 95 },
      { actual: 100, answer: 100, low: 90, high: 110 },
    ];
    expect(rangeAdvice(intervalHitRate(rec), "80% ranges").sentence).toContain("held 1 time in 2");
  });

  it("refuses hits > count or a nominal outside (0, 1)", () => {
    expect(() => rangeAdvice(hits(6, 5), "x")).toThrow(RangeError);
    expect(() => rangeAdvice(hits(1, 5, 1), "x")).toThrow(RangeError);
  });
});

describe("biasAdvice: hand-worked cases (5% closeness is common practice)", () => {
  it("m = −ln 1.12 over 10 outcomes: answers exp(−m) = 1.12 times the outcome → 12% above, aim lower [hand]", () => {
    const a = biasAdvice(10, -Math.log(1.12));
    expect(a.verdict).toBe("high");
    expect(a.relative).toBeCloseTo(0.12, 12);
    expect(a.sentence).toBe("Your answers were on average 12% above the outcome (10 outcomes): aim lower.");
  });

  it("m = ln 1.25: answers 0.8 times the outcome → 20% below, aim higher [hand]", () => {
    const a = biasAdvice(6, Math.log(1.25));
    expect(a.verdict).toBe("low");
    expect(a.sentence).toBe("Your answers were on average 20% below the outcome (6 outcomes): aim higher.");
  });

  it("m = −ln 1.03: 3% above, within 5% → close [hand]", () => {
    expect(biasAdvice(5, -Math.log(1.03)).verdict).toBe("close");
  });

  it("fewer than 5 outcomes: says so (policy); n = 0 accepts m = NaN", () => {
    expect(biasAdvice(4, -Math.log(2)).sentence).toBe("Only 4 of your answers have a recorded outcome: too few to say whether you answer high or low (advice from 5 outcomes on).");
    expect(biasAdvice(0, NaN).verdict).toBe("too-few");
    expect(() => biasAdvice(5, NaN)).toThrow(RangeError);
    expect(() => biasAdvice(-1, 0)).toThrow(RangeError);
  });
});
