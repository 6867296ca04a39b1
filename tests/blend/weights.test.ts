import { describe, expect, it } from "vitest";
import {
  EQUAL_PANEL_WEIGHT,
  MIN_OUTCOMES_FOR_CORRELATION,
  MIN_OUTCOMES_FOR_WEIGHTS,
  WEIGHT_PRIOR_SD,
  batesGrangerWeights,
  blendWeights,
  equalWeights,
  inverseMseWeights,
  optimalWeights,
  organiserWeights,
  weightCredibility,
  type OutcomePair,
} from "../../lib/blend";
import { runR, rVector } from "../stats/rscript";

/** History whose panel and baseline errors (actual − figure) are the given series. */
function historyFromErrors(ePanel: readonly number[], eBaseline: readonly number[]): readonly OutcomePair[] {
  return Object.freeze(
    ePanel.map((e, i) => {
      const actual = 1000 + 37 * i;
      return Object.freeze({ actual, panel: actual - e, baseline: actual - eBaseline[i] });
    }),
  );
}

describe("batesGrangerWeights: docs/methods.md §5a check table [COMPUTED-ONLY from the formula]", () => {
  // Rows σ1, σ2, ρ → w1, w2, combined MSE, as printed in docs/methods.md §5a (10 decimals).
  const rows = [
    [2, 1, 0, 0.2, 0.8, 0.8],
    [2, 1, 0.5, 0, 1, 1],
    [1, 1, 0, 0.5, 0.5, 0.5],
    [1, 1, 0.6, 0.5, 0.5, 0.8],
    [3, 2, 0.3, 0.2340425532, 0.7659574468, 3.485106383],
  ] as const;
  for (const [s1, s2, rho, w1, w2, mse] of rows) {
    it(`σ1=${s1}, σ2=${s2}, ρ=${rho} gives w1 ${w1}, w2 ${w2}, MSE ${mse}`, () => {
      const r = batesGrangerWeights(s1, s2, rho);
      expect(r.w1).toBeCloseTo(w1, 9);
      expect(r.w2).toBeCloseTo(w2, 9);
      expect(r.combinedMse).toBeCloseTo(mse, 9);
    });
  }

  it("matches R optimize() minimising E[ε_c²](λ) = (1−λ)²σ1² + λ²σ2² + 2λ(1−λ)ρσ1σ2 numerically", () => {
    const cases = [
      [2.5, 1.7, -0.4],
      [0.8, 1.9, 0.35],
      [5, 4, 0.7],
    ] as const;
    const code = cases
      .map(
        ([s1, s2, rho]) => `f <- function(l) (1-l)^2*${s1}^2 + l^2*${s2}^2 + 2*l*(1-l)*${rho}*${s1}*${s2}
o <- optimize(f, c(-5, 5), tol = 1e-12); out(c(o$minimum, o$objective))`,
      )
      .join("\n");
    const r = runR(code);
    cases.forEach(([s1, s2, rho], i) => {
      const bg = batesGrangerWeights(s1, s2, rho);
      expect(Math.abs(bg.w2 - r[i][0])).toBeLessThan(1e-8);
      expect(Math.abs(bg.combinedMse - r[i][1]) / r[i][1]).toBeLessThan(1e-12);
    });
  });

  it("gives NaN weights when every weight is equally good (σ1 = σ2, ρ = 1), and checks its inputs", () => {
    const r = batesGrangerWeights(2, 2, 1);
    expect(r.w1).toBeNaN();
    expect(r.w2).toBeNaN();
    expect(() => batesGrangerWeights(-1, 1, 0)).toThrow(RangeError);
    expect(() => batesGrangerWeights(1, NaN, 0)).toThrow(/sigma2/);
    expect(() => batesGrangerWeights(1, 1, 1.5)).toThrow(/rho/);
  });
});

describe("inverseMseWeights (Bates & Granger 1969, ρ = 0)", () => {
  // docs/methods.md §5a [COMPUTED-ONLY from the formula]: e1 = (2, −1, 3, −2, 1), e2 = (1, 1, −1, 0.5, −0.5)
  // give MSE1 = 3.8, MSE2 = 0.7, w1 = 0.1555555556, w2 = 0.8444444444.
  const history = historyFromErrors([2, -1, 3, -2, 1], [1, 1, -1, 0.5, -0.5]);

  it("reproduces the §5a inverse-MSE check values and reports the inputs behind the weight", () => {
    const w = inverseMseWeights(history);
    expect(w.applied).toBe("inverse-mse");
    expect(w.nOutcomes).toBe(5);
    expect(w.msePanel).toBeCloseTo(3.8, 12);
    expect(w.mseBaseline).toBeCloseTo(0.7, 12);
    expect(w.rawPanel).toBeCloseTo(0.1555555556, 9);
    // Shrunk toward equal (docs/methods.md §15c): Z = τ²/(τ² + 1/(4(n + 1))) with τ = 0.1, n = 5:
    // hand: 0.01/(0.01 + 1/24) = 6/31; w = (6/31)·(7/45) + (25/31)·(1/2) = 28/930 + 375/930 = 403/930 = 13/30.
    expect(w.credibility).toBeCloseTo(6 / 31, 14);
    expect(w.panel).toBeCloseTo(13 / 30, 14);
    expect(w.baseline).toBeCloseTo(17 / 30, 14);
    // Hand computation from §5a with ρ = 0 at λ = 17/30: E[ε_c²] = w1²·MSE1 + w2²·MSE2.
    expect(w.expectedMse).toBeCloseTo((13 / 30) ** 2 * 3.8 + (17 / 30) ** 2 * 0.7, 12);
    // A wider prior (τ = 0.5: 1/(4τ²) = 1): Z = 6/7, w = (6/7)·(7/45) + (1/7)·(1/2) = 2/15 + 1/14 = 43/210 (hand).
    expect(inverseMseWeights(history, { priorSd: 0.5 }).panel).toBeCloseTo(43 / 210, 14);
    expect(w.reason).toMatch(/Bates & Granger 1969/);
  });

  it(`falls back to equal weights with a reason below ${MIN_OUTCOMES_FOR_WEIGHTS} questions with an outcome (common practice)`, () => {
    for (const h of [[], history.slice(0, 1), history.slice(0, 2)]) {
      const w = inverseMseWeights(h);
      expect(w.requested).toBe("inverse-mse");
      expect(w.applied).toBe("equal");
      expect(w.panel).toBe(0.5);
      expect(w.nOutcomes).toBe(h.length);
      expect(w.reason).toContain(`fewer than the ${MIN_OUTCOMES_FOR_WEIGHTS}`);
    }
    expect(inverseMseWeights(history.slice(0, 3)).applied).toBe("inverse-mse");
    expect(inverseMseWeights(history.slice(0, 3), { minOutcomes: 4 }).applied).toBe("equal");
  });

  it("gives raw weight 1 to a figure that was exact, shrunk by Z = 4/29 (hand), and equal weights when both were", () => {
    // n = 3: Z = 0.01/(0.01 + 1/16) = 4/29 (τ = 0.1, docs/methods.md §15c).
    const exact = inverseMseWeights(historyFromErrors([0, 0, 0], [1, -2, 1]));
    expect(exact.rawPanel).toBe(1);
    expect(exact.panel).toBeCloseTo((4 / 29) * 1 + (25 / 29) * 0.5, 14); // hand: 33/58 = 0.5689655
    expect(inverseMseWeights(historyFromErrors([1, 2, 3], [0, 0, 0])).panel).toBeCloseTo((25 / 29) * 0.5, 14); // hand: 25/58
    // τ = 0.5: Z = 0.25/(0.25 + 1/16) = 4/5, w = 4/5 + 1/10 = 9/10 (hand).
    expect(inverseMseWeights(historyFromErrors([0, 0, 0], [1, -2, 1]), { priorSd: 0.5 }).panel).toBeCloseTo(0.9, 14);
    const both = inverseMseWeights(historyFromErrors([0, 0, 0], [0, 0, 0]));
    expect(both.applied).toBe("equal");
    expect(both.panel).toBe(0.5);
  });
});

describe("weightCredibility: precision weighting of the prior N(0.5, τ²) and the raw weight (docs/methods.md §15c)", () => {
  it("Z = τ²/(τ² + 1/(4(n + 1))) by hand: n = 0 → 1/26, 3 → 4/29, 24 → 1/2, 99 → 100/125; τ = 0.2 and n = 3 → 16/41", () => {
    expect(WEIGHT_PRIOR_SD).toBe(0.1); // the project's judgement (§15c), not a published value
    expect(weightCredibility(0)).toBeCloseTo(1 / 26, 14);
    expect(weightCredibility(3)).toBeCloseTo(4 / 29, 14);
    expect(weightCredibility(24)).toBeCloseTo(0.5, 14);
    expect(weightCredibility(99)).toBeCloseTo(0.8, 14);
    expect(weightCredibility(3, 0.2)).toBeCloseTo(0.04 / (0.04 + 1 / 16), 14); // = 16/41
  });

  it("v_n = 1/(4(n + 1)) is the variance of R's Beta(n/2, n/2), the raw weight of two equally good legs", () => {
    // Variance of Beta(a, b) = ab/((a + b)²(a + b + 1)), evaluated by R for a = b = n/2.
    const ns = [1, 3, 10];
    const [v] = runR(`n <- ${rVector(ns)}; a <- n/2; out(a*a/((2*a)^2*(2*a + 1)))`);
    ns.forEach((n, i) => expect(v[i]).toBeCloseTo(1 / (4 * (n + 1)), 14));
    // and by simulation in R: the variance of S_b/(S_p + S_b), S ~ χ²_3, within Monte Carlo error of 1/16.
    const [[sim]] = runR(`set.seed(1); sp <- rchisq(2e5, 3); sb <- rchisq(2e5, 3); out(var(sb/(sp + sb)))`);
    expect(Math.abs(sim - 1 / 16)).toBeLessThan(0.002);
  });

  it("policy: a negative or fractional n, or τ ≤ 0 / non-finite, throws", () => {
    expect(() => weightCredibility(-1)).toThrow(RangeError);
    expect(() => weightCredibility(2.5)).toThrow(RangeError);
    expect(() => weightCredibility(3, 0)).toThrow(/priorSd/);
    expect(() => weightCredibility(3, NaN)).toThrow(/priorSd/);
  });
});

describe("optimalWeights (Bates & Granger 1969 with error correlation)", () => {
  it("matches R: optimize() over λ of the mean squared combined error mean(((1−λ)e_p + λe_b)²)", () => {
    const ep = [12, -8, 15, 4, -3, 9, -11];
    const eb = [-6, 3, 10, -9, 2, -7, 8];
    const [[lambda, mse, rho]] = runR(`ep <- ${rVector(ep)}; eb <- ${rVector(eb)}
f <- function(l) mean(((1-l)*ep + l*eb)^2)
o <- optimize(f, c(-2, 3), tol = 1e-12)
out(c(o$minimum, o$objective, mean(ep*eb)/sqrt(mean(ep^2)*mean(eb^2))))`);
    const w = optimalWeights(historyFromErrors(ep, eb));
    expect(w.applied).toBe("optimal");
    expect(w.nOutcomes).toBe(7);
    expect(lambda).toBeGreaterThan(0); // R's optimum is interior here (about 0.62), so no clipping
    expect(lambda).toBeLessThan(1);
    expect(Math.abs(w.baseline - lambda)).toBeLessThan(1e-8);
    expect(Math.abs(w.expectedMse - mse) / mse).toBeLessThan(1e-12);
    expect(w.errorCorrelation).toBeCloseTo(rho, 12);
    expect(w.unconstrainedPanel).toBe(w.panel);
  });

  it("clips when R's unconstrained optimum λ lies above 1, and reports the unconstrained panel weight 1 − λ", () => {
    const ep = [12, -8, 15, 4, -3, 9, -11];
    const eb = [6, -2, 10, -5, 1, 7, -4];
    const [[lambda, mseB]] = runR(`ep <- ${rVector(ep)}; eb <- ${rVector(eb)}
o <- optimize(function(l) mean(((1-l)*ep + l*eb)^2), c(-2, 3), tol = 1e-12)
out(c(o$minimum, mean(eb^2)))`);
    expect(lambda).toBeGreaterThan(1);
    const w = optimalWeights(historyFromErrors(ep, eb));
    expect(w.panel).toBe(0);
    expect(w.expectedMse).toBeCloseTo(mseB, 10);
    expect(Math.abs(w.unconstrainedPanel - (1 - lambda))).toBeLessThan(1e-8);
    expect(w.reason).toMatch(/unconstrained panel weight -0\.3684 was clipped to 0/); // 1 − λ to 4 digits
  });

  it("clips a negative panel weight to 0 and says so (errors nearly proportional, ρ > σ_b/σ_p)", () => {
    const eb = [1, -1, 2, -2, 1];
    const ep = [2.2, -1.9, 4.1, -4, 2];
    const w = optimalWeights(historyFromErrors(ep, eb));
    expect(w.panel).toBe(0);
    expect(w.baseline).toBe(1);
    // At λ = 1 the combination is the baseline: its expected MSE is the baseline's MSE (hand: 11/5 = 2.2).
    expect(w.expectedMse).toBeCloseTo(2.2, 12);
    expect(w.reason).toMatch(/clipped to 0/);
    expect(w.unconstrainedPanel).toBeLessThan(0);
  });

  it(`falls back to equal weights below ${MIN_OUTCOMES_FOR_CORRELATION} questions and for identical errors`, () => {
    const h4 = historyFromErrors([1, 2, -1, 3], [2, 1, 0, -1]);
    expect(optimalWeights(h4).applied).toBe("equal");
    expect(optimalWeights(h4).reason).toContain(`fewer than the ${MIN_OUTCOMES_FOR_CORRELATION}`);
    const same = optimalWeights(historyFromErrors([1, 2, -1, 3, 2], [1, 2, -1, 3, 2]));
    expect(same.applied).toBe("equal");
    expect(same.reason).toMatch(/identical/);
    expect(optimalWeights(historyFromErrors([0, 0, 0, 0, 0], [1, 2, -1, 3, 2])).panel).toBe(1);
  });
});

describe("equal, organiser and dispatch", () => {
  it("equal weights are 0.5 / 0.5 (Blattberg & Hoch 1990)", () => {
    const w = equalWeights();
    expect(EQUAL_PANEL_WEIGHT).toBe(0.5);
    expect([w.panel, w.baseline, w.nOutcomes]).toEqual([0.5, 0.5, 0]);
    expect(w.reason).toMatch(/Blattberg & Hoch 1990/);
  });

  it("organiser weight is validated to [0, 1]", () => {
    const w = organiserWeights(0.3);
    expect(w.panel).toBe(0.3);
    expect(w.baseline).toBeCloseTo(0.7, 15);
    expect(organiserWeights(0).panel).toBe(0);
    expect(organiserWeights(1).panel).toBe(1);
    for (const bad of [-0.1, 1.2, NaN, Infinity]) expect(() => organiserWeights(bad)).toThrow(RangeError);
  });

  it("blendWeights dispatches on the rule", () => {
    const h = historyFromErrors([2, -1, 3, -2, 1], [1, 1, -1, 0.5, -0.5]);
    expect(blendWeights({ rule: "equal" }).panel).toBe(0.5);
    expect(blendWeights({ rule: "organiser", panelWeight: 0.25 }).panel).toBe(0.25);
    expect(blendWeights({ rule: "inverse-mse", history: h }).panel).toBeCloseTo(13 / 30, 14); // §5a, shrunk with Z = 6/31 (hand, above)
    expect(blendWeights({ rule: "inverse-mse", history: h, priorSd: 0.5 }).panel).toBeCloseTo(43 / 210, 14); // Z = 6/7 (hand, above)
    expect(blendWeights({ rule: "inverse-mse", history: h, minOutcomes: 6 }).applied).toBe("equal");
    expect(blendWeights({ rule: "optimal", history: h }).applied).toBe("optimal");
    expect(() => blendWeights({ rule: "median" } as never)).toThrow(/unknown rule/);
  });

  it("policy: NaN or Infinity in history throws a RangeError naming the entry and field", () => {
    const h = [
      { actual: 10, panel: 9, baseline: 11 },
      { actual: 12, panel: NaN, baseline: 11 },
      { actual: 13, panel: 12, baseline: 12 },
    ];
    expect(() => inverseMseWeights(h)).toThrow(/history\[1\]\.panel/);
    expect(() => optimalWeights([{ actual: Infinity, panel: 1, baseline: 1 }])).toThrow(/history\[0\]\.actual/);
    expect(() => inverseMseWeights(h.slice(0, 1), { minOutcomes: 0 })).toThrow(/minOutcomes/);
  });
});
