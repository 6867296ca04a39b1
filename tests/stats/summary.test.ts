import { describe, expect, it } from "vitest";
import { summarise } from "../../lib/stats";
import { expectClose, runR, rVector } from "./rscript";
import { referenceCsv } from "./reference-data";

const RESISTIVITY: readonly number[] = referenceCsv("nist_handbook_resistivity12.csv").y;

const KEYS = ["n", "mean", "sd", "cv", "min", "max", "q1", "median", "q3", "iqr", "relativeIqr"] as const;
const R_SUMMARY = `s <- function(x) { q <- quantile(x, c(.25, .5, .75), type = 7, names = FALSE)
  out(c(length(x), mean(x), sd(x), sd(x)/mean(x), min(x), max(x), q[1], median(x), q[3], IQR(x), IQR(x)/abs(median(x)))) }`;

describe("summarise against R (mean, sd, quantile type 7, median, IQR) via Rscript", () => {
  const INPUTS: readonly (readonly number[])[] = [
    RESISTIVITY, // NIST e-Handbook §7.2.5.2 data
    [3, 4, 4, 5, 5, 5, 6, 7], // docs/methods.md §3 ratings
    [2, 4, 4, 5, 7, 9, 10],
    [15, 20, 35, 40, 50],
    [120, 95, 150, 110, 400, 130, 125, 90, 105], // an outlier
    [-20, -5, -12, -8], // negative estimates: cv negative, relativeIqr uses |median|
    [1e9 + 3, 1e9 + 1, 1e9 + 4, 1e9 + 1, 1e9 + 5, 1e9 + 9],
  ];
  it("all eleven statistics agree to 1e-13 relative on seven inputs", () => {
    const rows = runR(R_SUMMARY + "\n" + INPUTS.map((x) => `s(${rVector(x)})`).join("\n"));
    INPUTS.forEach((x, i) => {
      const s = summarise(x);
      expectClose(KEYS.map((k) => s[k]), rows[i], 1e-13, `input ${i}`);
    });
  });

  it("docs/methods.md §3/§6b ratings check values: mean 4.875, sd 1.246423, cv 0.255676, IQR 1.25 [COMPUTED-ONLY]", () => {
    const s = summarise([3, 4, 4, 5, 5, 5, 6, 7]);
    expect(s.mean).toBe(4.875);
    expect(s.sd).toBeCloseTo(1.246423, 6);
    // §6 prints 0.255676, which is the exact 0.25567660… cut (not rounded) to 6 dp: allow 1e-6
    expect(Math.abs(s.cv - 0.255676)).toBeLessThan(1e-6);
    expect(s.iqr).toBeCloseTo(1.25, 14);
    expect(s.relativeIqr).toBeCloseTo(0.25, 14);
    expect(summarise([3, 4, 4, 5, 5, 5, 6, 7], { type: 6 }).iqr).toBeCloseTo(1.75, 14); // §3: type 6 IQR
  });

  it("1e9 offset: sd and IQR equal those of the small parts computed by R without the offset", () => {
    const small = [3, 1, 4, 1, 5, 9];
    const [[rSd, rIqr]] = runR(`x <- ${rVector(small)}; out(c(sd(x), IQR(x)))`);
    const s = summarise(small.map((v) => 1e9 + v));
    expect(Math.abs(s.sd - rSd) / rSd).toBeLessThan(1e-14);
    expect(s.iqr).toBe(rIqr);
  });
});

describe("summarise: degenerate cases and policy (lib/stats/index.ts)", () => {
  it("n = 1: sd and cv NaN (R sd gives NA); quartiles equal the value; iqr 0", () => {
    const s = summarise([42]);
    expect(s.n).toBe(1);
    expect(s.sd).toBeNaN();
    expect(s.cv).toBeNaN();
    expect([s.q1, s.median, s.q3, s.min, s.max]).toEqual([42, 42, 42, 42, 42]);
    expect(s.iqr).toBe(0);
    expect(s.relativeIqr).toBe(0);
  });
  it("mean 0 → cv NaN; median 0 → relativeIqr NaN", () => {
    const s = summarise([-2, 0, 2]);
    expect(s.mean).toBe(0);
    expect(s.cv).toBeNaN();
    expect(s.relativeIqr).toBeNaN();
    expect(s.iqr).toBe(2);
  });
  it("all equal: sd, cv, iqr, relativeIqr are 0", () => {
    const s = summarise([7, 7, 7]);
    expect([s.sd, s.cv, s.iqr, s.relativeIqr]).toEqual([0, 0, 0, 0]);
  });
  it("empty and NaN throw RangeError", () => {
    expect(() => summarise([])).toThrow(RangeError);
    expect(() => summarise([1, NaN])).toThrow(/values\[1\]/);
  });
});
