import { describe, expect, it } from "vitest";
import { quantile, quantileSorted, median, type QuantileType } from "../../lib/stats";
import { expectClose, runR, rVector } from "./rscript";
import { referenceCsv } from "./reference-data";

/** NIST e-Handbook §7.2.5.2 resistivity data (reference-data/nist_handbook_resistivity12.csv). */
const RESISTIVITY: readonly number[] = referenceCsv("nist_handbook_resistivity12.csv").y;
const FIVE = Object.freeze([15, 20, 35, 40, 50]);
const ONE_TO_TEN = Object.freeze([1, 2, 3, 4, 5, 6, 7, 8, 9, 10]);
const RATINGS = Object.freeze([3, 4, 4, 5, 5, 5, 6, 7]);

describe("quantile: published worked examples", () => {
  it("Wikipedia 'Percentile' list 15,20,35,40,50 at 40%: type 7 → 29, type 6 → 26", () => {
    // docs/methods.md §3 (b) [SOURCE via liquisearch copy of Wikipedia] [RECOMPUTED in R]
    expect(quantile(FIVE, 0.4)).toBeCloseTo(29, 12);
    expect(quantile(FIVE, 0.4, { type: 6 })).toBeCloseTo(26, 12);
  });

  it("NIST e-Handbook §7.2.5.2 resistivity: 90th percentile by p(N+1) (type 6) = 95.1981", () => {
    // docs/methods.md §3 (a) [SOURCE via a Java unit test quoting the handbook]; printed to 4 dp
    expect(Math.abs(quantile(RESISTIVITY, 0.9, { type: 6 }) - 95.1981)).toBeLessThan(0.00005);
    // same source: 0% → 95.0610, 50% → 95.1579, 100% → 95.1990
    expect(quantile(RESISTIVITY, 0, { type: 6 })).toBeCloseTo(95.061, 10);
    expect(quantile(RESISTIVITY, 0.5, { type: 6 })).toBeCloseTo(95.1579, 10);
    expect(quantile(RESISTIVITY, 1, { type: 6 })).toBeCloseTo(95.199, 10);
  });
});

describe("quantile: docs/methods.md §3 tables (R 4.2.2 quantile(type = 1..9), [COMPUTED-ONLY, reference library])", () => {
  const cases: ReadonlyArray<{ x: readonly number[]; p: readonly number[]; rows: readonly (readonly number[])[] }> = [
    {
      x: FIVE,
      p: [0.05, 0.3, 0.4, 0.5],
      rows: [
        [15, 20, 20, 35],
        [15, 20, 27.5, 35],
        [15, 20, 20, 20],
        [15, 17.5, 20, 27.5],
        [15, 20, 27.5, 35],
        [15, 19, 26, 35],
        [16, 23, 29, 35],
        [15, 19.6666666666667, 27, 35],
        [15, 19.75, 27.125, 35],
      ],
    },
    {
      x: RESISTIVITY,
      p: [0.25, 0.5, 0.75, 0.9],
      rows: [
        [95.1065, 95.1567, 95.1772, 95.1959],
        [95.113, 95.1579, 95.18545, 95.1959],
        [95.1065, 95.1567, 95.1772, 95.1959],
        [95.1065, 95.1567, 95.1772, 95.19546],
        [95.113, 95.1579, 95.18545, 95.19683],
        [95.10975, 95.1579, 95.189575, 95.19807],
        [95.11625, 95.1579, 95.181325, 95.19568],
        [95.1119166666667, 95.1579, 95.186825, 95.1972433333333],
        [95.1121875, 95.1579, 95.18648125, 95.19714],
      ],
    },
    {
      x: ONE_TO_TEN,
      p: [0.1, 0.25, 0.5, 0.75, 0.9],
      rows: [
        [1, 3, 5, 8, 9],
        [1.5, 3, 5.5, 8, 9.5],
        [1, 2, 5, 8, 9],
        [1, 2.5, 5, 7.5, 9],
        [1.5, 3, 5.5, 8, 9.5],
        [1.1, 2.75, 5.5, 8.25, 9.9],
        [1.9, 3.25, 5.5, 7.75, 9.1],
        [1.36666666666667, 2.91666666666667, 5.5, 8.08333333333333, 9.63333333333333],
        [1.4, 2.9375, 5.5, 8.0625, 9.6],
      ],
    },
  ];
  for (const [ci, c] of cases.entries()) {
    it(`table ${ci + 1}: all nine types at the printed precision (15 significant digits)`, () => {
      for (let t = 1; t <= 9; t++) {
        const got = c.p.map((p) => quantile(c.x, p, { type: t as QuantileType }));
        // the table prints 15 significant digits
        expectClose(got, c.rows[t - 1], 5e-14, `type ${t}`);
      }
    });
  }

  it("ratings 3,4,4,5,5,5,6,7: Q3 by type 1..9 and the type-7 / type-6 IQRs 1.25 / 1.75", () => {
    // docs/methods.md §3, Delphi-style ratings [COMPUTED-ONLY, R 4.2.2]
    const q3 = [5, 5.5, 5, 5, 5.5, 5.75, 5.25, 5.583333333, 5.5625];
    for (let t = 1; t <= 9; t++) {
      expect(Math.abs(quantile(RATINGS, 0.75, { type: t as QuantileType }) - q3[t - 1])).toBeLessThan(5e-10);
      expect(quantile(RATINGS, 0.25, { type: t as QuantileType })).toBe(4);
    }
    expect(quantile(RATINGS, 0.75) - quantile(RATINGS, 0.25)).toBeCloseTo(1.25, 14);
    expect(quantile(RATINGS, 0.75, { type: 6 }) - quantile(RATINGS, 0.25, { type: 6 })).toBeCloseTo(1.75, 14);
  });

  it("odd n = 7, x = 2,4,4,5,7,9,10: (Q1, median, Q3) for types 7, 6, 4, 8", () => {
    // docs/methods.md §3 [COMPUTED-ONLY, R 4.2.2]
    const x = [2, 4, 4, 5, 7, 9, 10];
    const q = (type: QuantileType) => [0.25, 0.5, 0.75].map((p) => quantile(x, p, { type }));
    expectClose(q(7), [4, 5, 8], 1e-15, "type 7");
    expectClose(q(6), [4, 5, 9], 1e-15, "type 6");
    expectClose(q(4), [3.5, 4.5, 7.5], 1e-15, "type 4");
    expectClose(q(8), [4, 5, 8.666666667], 1e-10, "type 8");
    expect(median(x)).toBe(5);
  });
});

describe("quantile: against R quantile() run now via Rscript", () => {
  const PROBS = [0, 0.001, 0.01, 0.05, 0.1, 0.2, 0.25, 1 / 3, 0.4, 0.5, 0.6, 2 / 3, 0.75, 0.8, 0.9, 0.95, 0.99, 0.999, 1];
  // Frozen inputs: unsorted, ties, negatives, one value, two values, large offsets.
  const INPUTS: readonly (readonly number[])[] = [
    RESISTIVITY,
    FIVE,
    [7],
    [3, -1],
    [5, 1, 4, 1, 5, 9, 2, 6, 5, 3, 5, 8, 9, 7, 9, 3, 2, 3, 8, 4, 6],
    [-2.5, 0, 0, 0, 1e-3, 17.25, -40, 3.75, 3.75, 1e6],
    [1e9 + 4, 1e9 + 7, 1e9 + 13, 1e9 + 16, 1e9 + 1],
    Array.from({ length: 37 }, (_, i) => Math.sin(i * 12.9898) * 43758.5453),
  ];
  it("all nine types at 19 probabilities on 8 inputs agree to 1e-14 relative", () => {
    const code = INPUTS.map(
      (x) => `for (t in 1:9) out(quantile(${rVector(x)}, ${rVector(PROBS)}, type = t, names = FALSE))`,
    ).join("\n");
    const rows = runR(code);
    expect(rows.length).toBe(INPUTS.length * 9);
    INPUTS.forEach((x, i) => {
      for (let t = 1; t <= 9; t++) {
        const got = PROBS.map((p) => quantile(x, p, { type: t as QuantileType }));
        expectClose(got, rows[i * 9 + t - 1], 1e-14, `input ${i} type ${t}`);
      }
    });
  });

  it("median() equals R median() on the same inputs", () => {
    const rows = runR(INPUTS.map((x) => `out(median(${rVector(x)}))`).join("\n"));
    INPUTS.forEach((x, i) => expect(median(x)).toBe(rows[i][0]));
  });
});

describe("quantile: input policy (lib/stats/index.ts)", () => {
  it("empty input throws RangeError", () => {
    expect(() => quantile([], 0.5)).toThrow(RangeError);
    expect(() => quantileSorted([], 0.5)).toThrow(RangeError);
    expect(() => median([])).toThrow(RangeError);
  });
  it("NaN or ±Infinity in the sample throws RangeError naming the index", () => {
    expect(() => quantile([1, NaN, 3], 0.5)).toThrow(/values\[1\]/);
    expect(() => quantile([1, 2, Infinity], 0.5)).toThrow(/values\[2\]/);
  });
  it("p outside [0, 1] or NaN throws RangeError", () => {
    expect(() => quantile([1, 2], -0.01)).toThrow(RangeError);
    expect(() => quantile([1, 2], 1.01)).toThrow(RangeError);
    expect(() => quantile([1, 2], NaN)).toThrow(RangeError);
  });
  it("quantileSorted rejects unsorted input; quantile does not mutate its argument", () => {
    expect(() => quantileSorted([3, 1, 2], 0.5)).toThrow(/ascending/);
    const x = Object.freeze([3, 1, 2]);
    expect(quantile(x, 0.5)).toBe(2);
    expect(quantileSorted([1, 2, 3, 4], 0.5)).toBe(2.5); // (2 + 3)/2 by definition 7
  });
  it("an unknown type throws RangeError", () => {
    expect(() => quantile([1, 2, 3], 0.5, { type: 10 as QuantileType })).toThrow(RangeError);
  });
});
