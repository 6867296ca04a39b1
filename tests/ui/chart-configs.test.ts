/**
 * The charts' pure configuration (lib/ui/chart-style.ts, lib/ui/chart-configs.ts): the
 * colour-blind-safe palette, distinct marker shapes and dashes per line, legends drawn with the
 * markers' point style, the proportional axis rule, the one-round interquartile bar and the guide
 * labels' placement. Invented scenario: Quillmoor Instruments' panel on Wren-2 sensor sales.
 */
import { describe, expect, it } from "vitest";
import { guideLabelSides, legendOptions, OKABE_ITO, proportionalRange, SERIES_STYLES } from "../../lib/ui/chart-style";
import { convergenceConfig, DEPARTURE_GUIDES, departureDatasets, oneRoundNote, signalDatasets } from "../../lib/ui/chart-configs";

describe("palette", () => {
  it("is Okabe & Ito's (2008) eight colours", () => {
    // Checked against R 4: grDevices::palette.colors(palette = "Okabe-Ito") gives these eight (and
    // a ninth, grey #999999, that is not in Okabe & Ito's list).
    expect(Object.values(OKABE_ITO).map((c) => c.toUpperCase())).toEqual(["#000000", "#E69F00", "#56B4E9", "#009E73", "#F0E442", "#0072B2", "#D55E00", "#CC79A7"]);
  });

  it("gives every one of the eight series styles its own colour, marker shape and dash", () => {
    const key = (d: readonly number[]) => d.join(",");
    expect(new Set(SERIES_STYLES.map((s) => s.color)).size).toBe(8);
    expect(new Set(SERIES_STYLES.map((s) => s.pointStyle)).size).toBe(8);
    expect(new Set(SERIES_STYLES.map((s) => key(s.dash))).size).toBe(8);
  });
});

describe("proportionalRange", () => {
  it("widens 11,300–11,800 (a 4% change) to span 40% of the largest value", () => {
    // By hand: pad 5% of 500 = 25 → 11,275–11,825 (span 550); 40% of 11,800 = 4,720 about the
    // middle 11,550 → 9,190–13,910.
    const r = proportionalRange([11300, 11800])!;
    expect(r.suggestedMin).toBeCloseTo(9190, 9);
    expect(r.suggestedMax).toBeCloseTo(13910, 9);
    // The 4% change now takes 500 / 4,720 ≈ 10.6% of the axis, not all of it.
    expect(500 / (r.suggestedMax - r.suggestedMin)).toBeCloseTo(0.1059, 4);
  });

  it("keeps a range that is already wide, with 5% room each side", () => {
    // By hand: 100–200, pad 5 → 95–205 (span 110 ≥ 0.4 × 200 = 80).
    expect(proportionalRange([100, 150, 200])).toEqual({ suggestedMin: 95, suggestedMax: 205 });
  });

  it("does not cross zero for values of one sign", () => {
    // By hand: 1–2, pad 0.05 → 0.95–2.05 (span 1.1 ≥ 0.8) — unchanged; 10 alone: span 4 about 10 → 8–12.
    expect(proportionalRange([10])).toEqual({ suggestedMin: 8, suggestedMax: 12 });
    // 0 and 1: pad 0.05 → −0.05–1.05 crosses zero for non-negative values → shifted to 0–1.1.
    const r = proportionalRange([0, 1])!;
    expect(r.suggestedMin).toBe(0);
    expect(r.suggestedMax).toBeCloseTo(1.1, 12);
    const n = proportionalRange([-1, 0])!;
    expect(n.suggestedMax).toBe(0);
    expect(n.suggestedMin).toBeCloseTo(-1.1, 12);
  });

  it("ignores nulls and non-finite values; nothing finite → undefined; all zero → −1…1", () => {
    expect(proportionalRange([null, NaN, Infinity])).toBeUndefined();
    expect(proportionalRange([0, 0])).toEqual({ suggestedMin: -1, suggestedMax: 1 });
    expect(proportionalRange([null, 10, NaN])).toEqual({ suggestedMin: 8, suggestedMax: 12 });
  });
});

describe("convergence chart", () => {
  const one = [{ round: 1, median: 11500, q1: 11200, q3: 11900 }];

  it("draws one round's interquartile range as a bar from Q1 to Q3, with the median over it", () => {
    const c = convergenceConfig(one, "units");
    const [bar, line] = c.data.datasets;
    expect(bar.type).toBe("bar");
    expect(bar.data).toEqual([[11200, 11900]]);
    expect(line.type).toBe("line");
    expect(line.data).toEqual([11500]);
    expect(oneRoundNote(1, true)).toMatch(/second round/);
    expect(oneRoundNote(2, true)).toBeNull();
  });

  it("titles the y axis with the range rule and applies it (sum of parts 11,300 → 11,800)", () => {
    const c = convergenceConfig([{ round: 1, median: 11300, q1: null, q3: null }, { round: 2, median: 11800, q1: null, q3: null }], "units", "Total of the parts");
    expect(c.data.datasets).toHaveLength(1); // no band for a sum of parts
    const y = c.options!.scales!.y as { beginAtZero: boolean; suggestedMin: number; suggestedMax: number; title: { text: string } };
    expect(y.beginAtZero).toBe(false); // a bar dataset would otherwise pull the axis down to 0
    expect(y.suggestedMin).toBeCloseTo(9190, 9);
    expect(y.suggestedMax).toBeCloseTo(13910, 9);
    expect(y.title.text).toBe("units (axis spans ≥ 40% of the value)");
  });

  it("draws the legend with each dataset's point style, and the band's style is a box", () => {
    const c = convergenceConfig(one, "units");
    expect((c.options!.plugins!.legend as { labels: { usePointStyle: boolean } }).labels.usePointStyle).toBe(true);
    expect((c.data.datasets[0] as { pointStyle: string }).pointStyle).toBe("rect");
  });
});

describe("departure chart", () => {
  const answers = ["P1", "P2", "P3", "P4", "P5"].map((label, i) => ({ label, z: [i - 2, (i - 2) / 2] }));
  const sets = departureDatasets(answers, [0.4, 0.2]);

  it("gives five pseudonyms and the panel figure six distinct colours, marker shapes and dashes", () => {
    expect(sets).toHaveLength(6);
    expect(new Set(sets.map((d) => d.borderColor)).size).toBe(6);
    expect(new Set(sets.map((d) => d.pointStyle)).size).toBe(6);
    expect(new Set(sets.map((d) => JSON.stringify(d.borderDash ?? []))).size).toBe(6);
    expect(sets[5]).toMatchObject({ label: "Panel figure", borderColor: "#000000", data: [0.4, 0.2] });
  });

  it("places neighbouring guide labels at opposite ends of their lines", () => {
    // Φ⁻¹(0.90) = 1.2816, Φ⁻¹(0.975) = 1.9600 (R: qnorm(c(0.9, 0.975))).
    expect(DEPARTURE_GUIDES.map((g) => g.y)).toEqual([1.96, -1.96, 1.2816, -1.2816]);
    const sides = guideLabelSides(DEPARTURE_GUIDES.map((g) => g.y));
    // In order of y: −1.96 right, −1.28 left, +1.28 right, +1.96 left.
    expect(sides).toEqual(["left", "right", "right", "left"]);
  });

  it("legend options draw point styles and keep a filter", () => {
    const l = legendOptions((t) => t !== "Q1");
    expect(l.labels.usePointStyle).toBe(true);
    expect(l.labels.filter!({ text: "Q1" })).toBe(false);
  });

  it("gives the tracking signal's four figures distinct shapes and dashes", () => {
    const s = signalDatasets(["Raw panel", "Corrected panel", "Baseline", "Blend"].map((label) => ({ label, values: [1, -2] })));
    expect(new Set(s.map((d) => d.pointStyle)).size).toBe(4);
    expect(new Set(s.map((d) => JSON.stringify(d.borderDash ?? []))).size).toBe(4);
  });
});
