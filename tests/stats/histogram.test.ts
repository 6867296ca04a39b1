import { describe, expect, it } from "vitest";
import { histogram } from "../../lib/stats";
import { expectClose, runR, rVector } from "./rscript";
import { referenceCsv } from "./reference-data";

const RESISTIVITY: readonly number[] = referenceCsv("nist_handbook_resistivity12.csv").y;

// R: Sturges' bin count, equal-width breaks from min to max, right-closed bins with the lowest included.
const R_HIST = `h <- function(x, k = nclass.Sturges(x)) { r <- hist(x, breaks = seq(min(x), max(x), length.out = k + 1), plot = FALSE); out(r$counts); out(r$breaks) }`;

describe("histogram against R's hist() via Rscript", () => {
  const INPUTS: readonly (readonly number[])[] = [
    RESISTIVITY, // NIST e-Handbook §7.2.5.2 data
    [0, 2, 4, 4, 6, 8, 8, 8], // values on the breaks 0, 2, 4, 6, 8: each counts in the bin to its left
    [120, 95, 150, 110, 400, 130, 125, 90, 105, 98, 101, 133],
    [-20, -5, -12, -8, -5.5],
    Array.from({ length: 300 }, (_, i) => 1200 + ((i * 7919) % 1601)), // 300 answers as on a large panel
  ];
  it("counts and breaks agree with R on five inputs (Sturges' bin count)", () => {
    const rows = runR(R_HIST + "\n" + INPUTS.map((x) => `h(${rVector(x)})`).join("\n"));
    INPUTS.forEach((x, i) => {
      const bins = histogram(x);
      expect(bins.map((b) => b.count), `input ${i} counts`).toEqual(rows[2 * i]);
      expectClose([bins[0].lower, ...bins.map((b) => b.upper)], rows[2 * i + 1], 1e-14, `input ${i} breaks`);
    });
  });

  it("a given bin count agrees with R", () => {
    const x = [3, 4, 4, 5, 5, 5, 6, 7];
    const [counts, breaks] = runR(`${R_HIST}\nh(${rVector(x)}, 3)`);
    const bins = histogram(x, 3);
    expect(bins.map((b) => b.count)).toEqual(counts);
    expectClose([bins[0].lower, ...bins.map((b) => b.upper)], breaks, 1e-14, "breaks");
  });

  it("equal values give one bin holding them all (hand count: 4 values of 7)", () => {
    expect(histogram([7, 7, 7, 7])).toEqual([{ lower: 7, upper: 7, count: 4 }]);
  });

  it("refuses an empty sample and a bad bin count", () => {
    expect(() => histogram([])).toThrow(RangeError);
    expect(() => histogram([1, 2], 0)).toThrow(RangeError);
  });
});
