/**
 * Rounding for exports (lib/ui/format.ts `roundAsShown`): the digits the pages show.
 * Expected values: R's signif(x, 4) where the number has fewer than 5 integer digits (computed
 * in the test); beyond that, the nearest integer, ties away from zero as Intl.NumberFormat's
 * default rounding mode "halfExpand" (ECMA-402) shows it, written out by hand.
 */
import { describe, expect, it } from "vitest";
import { formatNumber, roundAsShown } from "../../lib/ui/format";
import { runR, rVector } from "../stats/rscript";

const SMALL = [7676.980381156674, 0.123456, -62.64549, 1.5e-7, 9999.94];

describe("roundAsShown", () => {
  it("gives R's signif(x, 4) below 10,000", () => {
    const [r] = runR(`out(signif(${rVector(SMALL)}, 4))`);
    expect(SMALL.map((x) => roundAsShown(x))).toEqual(r);
    expect(roundAsShown(7676.980381156674)).toBe(7677);
  });
  it("rounds to whole numbers from 10,000 up, never into the integer part", () => {
    expect(roundAsShown(123456.7)).toBe(123457);
    expect(roundAsShown(-12345.5)).toBe(-12346);
    expect(roundAsShown(12345.5)).toBe(12346);
  });
  it("agrees with what the page shows, and leaves integers, NaN and infinities alone", () => {
    for (const x of [...SMALL.slice(0, 3), 123456.7, 0.5, 3.14159]) expect(formatNumber(roundAsShown(x))).toBe(formatNumber(x));
    expect(roundAsShown(0.0123456, 3)).toBe(0.0123);
    expect(roundAsShown(42)).toBe(42);
    expect(roundAsShown(12_345_678)).toBe(12_345_678);
    expect(roundAsShown(Number.NaN)).toBeNaN();
    expect(roundAsShown(Infinity)).toBe(Infinity);
  });
});
