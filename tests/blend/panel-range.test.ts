/**
 * The panel leg's range from track records (lib/blend/panel-range.ts). Expected values: hand
 * computations from the formulas cited in that file (Gelman et al. 2013, §2.6: the scaled
 * inverse-χ² update s_n² = (ν0·s0² + Σe²)/(ν0 + n) and the Student t predictive), with R's qt,
 * qnorm and plnorm computed in the test.
 */
import { describe, expect, it } from "vitest";
import {
  PANEL_LOG_ERROR_PRIOR,
  blendErrorCorrelation,
  blendRangeScale,
  componentQuantile,
  distributionCdf,
  intervalWidthFactor,
  panelErrorScale,
  panelFromTrackRecord,
  widenThreePoint,
} from "../../lib/blend";
import { runR } from "../stats/rscript";

describe("panelErrorScale: log errors of the corrected panel figure pooled with the prior", () => {
  it("without history it is the prior: scale 0.25 on 3 degrees of freedom (the stated default)", () => {
    const e = panelErrorScale([]);
    expect(e).toMatchObject({ n: 0, scale: 0.25, df: 3, priorScale: 0.25, priorStrength: 3 });
    expect(e.historyScale).toBeNaN();
    expect(PANEL_LOG_ERROR_PRIOR).toEqual({ scale: 0.25, strength: 3 });
  });

  it("pools by hand: e = (0.1, −0.2) → s² = (3·0.0625 + 0.01 + 0.04)/5 = 0.0475", () => {
    const e = panelErrorScale([0.1, -0.2]);
    expect(e.scale).toBeCloseTo(Math.sqrt(0.0475), 14);
    expect(e.df).toBe(5);
    expect(e.historyScale).toBeCloseTo(Math.sqrt(0.025), 14); // hand: √((0.01 + 0.04)/2)
  });

  it("a long history takes over from the prior (hand: 97 errors of ±0.05 → s² = (0.1875 + 0.2425)/100)", () => {
    const e = panelErrorScale(Array.from({ length: 97 }, (_, i) => (i % 2 ? 0.05 : -0.05)));
    expect(e.scale).toBeCloseTo(Math.sqrt((3 * 0.0625 + 97 * 0.0025) / 100), 14);
  });
});

describe("panelFromTrackRecord: P10/P90 at figure·exp(∓t·s), median at the figure", () => {
  it("matches R's qt and exp on the log scale; the median is the figure", () => {
    const e = panelErrorScale([0.1, -0.2, 0.3]);
    const [[lo, hi]] = runR(`s <- sqrt((3 * 0.25^2 + 0.01 + 0.04 + 0.09) / 6); t <- qt(0.9, 6); out(c(1000 * exp(-t * s), 1000 * exp(t * s)))`);
    const d = panelFromTrackRecord(1000, e, 5);
    expect(d.rule).toBe("track record");
    expect(d.median).toBe(1000);
    expect(componentQuantile(d.distribution as never, 0.1)).toBeCloseTo(lo, 9);
    expect(componentQuantile(d.distribution as never, 0.9)).toBeCloseTo(hi, 9);
    expect(distributionCdf(d.distribution, 1000)).toBe(0.5);
  });

  it("always gives a range, also for a figure of 0 or below (symmetric, hand: ±|figure|·(e^{t·s} − 1))", () => {
    const e = panelErrorScale([]);
    const [[up]] = runR("out(exp(qt(0.9, 3) * 0.25))");
    const d = panelFromTrackRecord(-200, e, 2);
    expect(componentQuantile(d.distribution as never, 0.9)).toBeCloseTo(-200 + 200 * (up - 1), 9);
    expect(componentQuantile(d.distribution as never, 0.1)).toBeCloseTo(-200 - 200 * (up - 1), 9);
  });
});

describe("intervalWidthFactor: a panelist's P10–P90 range rescaled by their hit rate", () => {
  it("hits 1 of 5 → ĥ = (1 + 0.8·5)/10 = 0.5 → factor qnorm(0.9)/qnorm(0.75) (R)", () => {
    const [[f1, f2]] = runR("out(c(qnorm(0.9) / qnorm(0.75), qnorm(0.9) / qnorm((1 + 14/15) / 2)))");
    const w = intervalWidthFactor(1, 5);
    expect(w.coverage).toBeCloseTo(0.5, 14);
    expect(w.factor).toBeCloseTo(f1, 12);
    // 10 of 10 → ĥ = (10 + 4)/15: ranges that always held are narrowed.
    expect(intervalWidthFactor(10, 10).factor).toBeCloseTo(f2, 12);
    expect(intervalWidthFactor(10, 10).factor).toBeLessThan(1);
  });

  it("no history, or hits exactly at 80%, leaves the range as stated (hand: ĥ = 0.8)", () => {
    expect(intervalWidthFactor(0, 0).factor).toBe(1);
    expect(intervalWidthFactor(4, 5).factor).toBeCloseTo(1, 14);
  });

  it("the coverage is held to [0.2, 0.98] (hand: 0 of 100 → raw 4/105, held at 0.2)", () => {
    expect(intervalWidthFactor(0, 100).coverage).toBe(0.2);
    expect(intervalWidthFactor(1000, 1000).coverage).toBe(0.98);
    expect(() => intervalWidthFactor(3, 2)).toThrow(/hits ≤ count/);
    expect(() => intervalWidthFactor(1.5, 2)).toThrow(RangeError);
  });

  it("widenThreePoint scales both halves about the middle value (hand)", () => {
    expect(widenThreePoint({ low: 80, mid: 100, high: 140 }, 2)).toEqual({ low: 60, mid: 100, high: 180 });
    expect(() => widenThreePoint({ low: 80, mid: 100, high: 140 }, 0)).toThrow(RangeError);
  });
});

describe("blendRangeScale: the blend range recalibrated by its own track record", () => {
  it("R: quantile(|z|, 0.8, type 7)/qnorm(0.9), shrunk toward 1 with Z = n/(n + 5)", () => {
    const z = [0.3, -1.9, 0.8, -0.2, 2.4, 1.1, -0.6, 0.05, -1.4, 0.9];
    const [[h]] = runR(`out(quantile(abs(${JSON.stringify(z).replace("[", "c(").replace("]", ")")}), 0.8, type = 7) / qnorm(0.9))`);
    const r = blendRangeScale(z);
    expect(r.historyScale).toBeCloseTo(h, 12);
    expect(r.credibility).toBeCloseTo(10 / 15, 14);
    expect(r.scale).toBeCloseTo((10 / 15) * h + 5 / 15, 12);
    expect(blendRangeScale([]).scale).toBe(1);
  });
});

describe("blendErrorCorrelation: ρ of the two legs' errors shrunk toward the prior 0.5", () => {
  it("hand: errors e_p = (1, −1, 2), e_b = (1, 1, 2) → mean(e_p·e_b) = 4/3, MSEs 2 and 2 → ρ = 2/3; Z = 3/8", () => {
    const h = [
      { actual: 10, panel: 9, baseline: 9 },
      { actual: 10, panel: 11, baseline: 9 },
      { actual: 10, panel: 8, baseline: 8 },
    ];
    const r = blendErrorCorrelation(h);
    expect(r.historyRho).toBeCloseTo(2 / 3, 14);
    expect(r.rho).toBeCloseTo((3 / 8) * (2 / 3) + (5 / 8) * 0.5, 14);
    expect(blendErrorCorrelation([]).rho).toBe(0.5);
  });
});
