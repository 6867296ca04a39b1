/**
 * What a baseline answers (lib/triangulation/baselines.ts `analyseBaseline`, issue 12 item 1): the
 * value in period k, the total over the next n periods, or their average, on 24 monthly values
 * with season 12 (R's AirPassengers, 1949–1950: a public series shipped with R).
 *
 * References, computed in the test:
 * - the means: R's forecast::snaive() on the same series, its step means summed (total) or
 *   averaged (average);
 * - the bounds: R's one-step sd σ = (upper80 − mean)/Φ⁻¹(0.9) of snaive(), and the aggregated
 *   variance of a lag-12 random walk over 12 steps, σ² Σ_{i=1}^{12} (⌊(12 − i)/12⌋ + 1)² = 12σ²
 *   (each innovation enters one step; Hyndman, Koehler, Ord & Snyder 2008 ch. 6, as written out
 *   in lib/forecast/total.ts). The closed forms themselves are checked in tests/forecast/total.test.ts;
 *   this file checks the service's wiring: which quantity, and the average as total / n.
 * - the month-to-year case (issue 12): the one-month value is far below the year's total, so
 *   a question about the year must not get the one-month figure.
 */
import { describe, expect, it } from "vitest";
import { analyseBaseline, quantityLabel } from "../../lib/triangulation/baselines";
import { baselineInput } from "../../lib/validation/triangulation-inputs";
import { expectClose, runR, rVector } from "../stats/rscript";
import { legWarnings } from "../../lib/triangulation/warnings";

/** AirPassengers, January 1949 to December 1950 (R datasets). */
const AIR24 = [112, 118, 132, 129, 121, 135, 148, 148, 136, 119, 104, 118, 115, 126, 141, 135, 125, 149, 170, 170, 158, 133, 114, 140];
const parse = (body: unknown) => baselineInput.parse(body);

describe("the quantity a baseline answers", () => {
  const [[stepMean, stepL80, stepU80, total, sigma]] = runR(`
    suppressMessages(library(forecast))
    f <- snaive(ts(${rVector(AIR24)}, frequency = 12), h = 12, level = c(80, 95))
    out(c(f$mean[12], f$lower[12, 1], f$upper[12, 1], sum(f$mean), (f$upper[1, 1] - f$mean[1]) / qnorm(0.9)))
  `);
  const sd = Math.sqrt(12) * sigma; // 12σ² (file comment)

  it("the value in period 12 is the step forecast (R snaive)", async () => {
    const a = await analyseBaseline(parse({ values: AIR24, season: 12, method: "seasonal-naive", horizon: 12, period: "month" }));
    expect(a.target).toMatchObject({ quantity: "value", period: "month", step: 12, label: "value in month 12 after the history" });
    expectClose([a.target.mean!, a.target.lower80!, a.target.upper80!], [stepMean, stepL80, stepU80], 1e-10, "snaive step 12 vs R");
  });

  it("the total of the next 12 months: R's summed means, bounds from 12σ²", async () => {
    const a = await analyseBaseline(parse({ values: AIR24, season: 12, method: "seasonal-naive", horizon: 12, quantity: "total", period: "month" }));
    expect(a.target).toMatchObject({ quantity: "total", period: "month", step: 12, label: "total of the next 12 months" });
    const z80 = 1.2815515655446004; // Φ⁻¹(0.9), R qnorm(0.9)
    const z95 = 1.959963984540054; // Φ⁻¹(0.975), R qnorm(0.975)
    expectClose(
      [a.target.mean!, a.target.lower80!, a.target.upper80!, a.target.lower95!, a.target.upper95!],
      [total, total - z80 * sd, total + z80 * sd, total - z95 * sd, total + z95 * sd],
      1e-10,
      "snaive total vs R",
    );
    expect(total).toBe(1676); // hand sum of 1950's twelve values
    expect(a.target.how).toMatch(/lag-12 random walk/);
  });

  it("the average over the next 12 months: the total's mean and bounds divided by 12", async () => {
    const a = await analyseBaseline(parse({ values: AIR24, season: 12, method: "seasonal-naive", horizon: 12, quantity: "average", period: "month" }));
    expect(a.target.label).toBe("average of the next 12 months");
    expectClose([a.target.mean!, a.target.lower80!, a.target.upper80!], [total / 12, (total - 1.2815515655446004 * sd) / 12, (total + 1.2815515655446004 * sd) / 12], 1e-10, "snaive average vs R");
  });

  it("the total and average of months 4..15 (a..b): R's summed means over the window, bounds from 15σ²", async () => {
    const [[windowTotal]] = runR(`
      suppressMessages(library(forecast))
      f <- snaive(ts(${rVector(AIR24)}, frequency = 12), h = 15)
      out(sum(f$mean[4:15]))
    `);
    // Lag-12 walk, window 4..15: innovation ε_{n+i} recurs at steps i and i + 12; inside 4..15
    // each of i = 1..15 is counted once (i = 1, 2, 3 at steps 13, 14, 15; i ≥ 4 at step i):
    // var = 15σ² (hand computation from lib/forecast/total.ts's decomposition).
    const wsd = Math.sqrt(15) * sigma;
    const z80 = 1.2815515655446004; // Φ⁻¹(0.9), R qnorm(0.9)
    const a = await analyseBaseline(parse({ values: AIR24, season: 12, method: "seasonal-naive", horizon: 15, firstPeriod: 4, quantity: "total", period: "month" }));
    expect(a.target).toMatchObject({ quantity: "total", step: 15, firstPeriod: 4, label: "total of months 4 to 15 after the history" });
    expectClose([a.target.mean!, a.target.lower80!, a.target.upper80!], [windowTotal, windowTotal - z80 * wsd, windowTotal + z80 * wsd], 1e-10, "snaive window total vs R");
    expect(windowTotal).toBe(135 + 125 + 149 + 170 + 170 + 158 + 133 + 114 + 140 + 115 + 126 + 141); // 1950's April–December, then January–March (hand)
    const avg = await analyseBaseline(parse({ values: AIR24, season: 12, method: "seasonal-naive", horizon: 15, firstPeriod: 4, quantity: "average", period: "month" }));
    expect(avg.target.label).toBe("average of months 4 to 15 after the history");
    expectClose([avg.target.mean!, avg.target.upper80!], [windowTotal / 12, (windowTotal + z80 * wsd) / 12], 1e-10, "window average = total / 12 periods");
  });

  it("a first period is refused for a value, after the horizon, or after the default horizon (named field)", async () => {
    expect(baselineInput.safeParse({ values: [1, 2], horizon: 3, firstPeriod: 2 }).error?.issues[0].path).toEqual(["firstPeriod"]);
    expect(baselineInput.safeParse({ values: [1, 2], horizon: 3, firstPeriod: 4, quantity: "total" }).error?.issues[0].path).toEqual(["firstPeriod"]);
    expect(parse({ values: [1, 2], quantity: "total" }).firstPeriod).toBe(1);
    await expect(analyseBaseline(parse({ values: AIR24, method: "naive", firstPeriod: 3, quantity: "total" }))).rejects.toMatchObject({ errors: [{ field: "firstPeriod" }] });
    expect(quantityLabel("total", "month", 15, true, 13)).toBe("total of months 13 to 15 after launch");
    expect(quantityLabel("average", "year", 3, false, 3)).toBe("average of year 3 after the history");
  });

  it("the request schema offers value, total and average and the six period names, and keeps today's default", () => {
    expect(parse({ values: [1, 2] })).toMatchObject({ quantity: "value", period: "other" });
    expect(baselineInput.safeParse({ values: [1, 2], quantity: "sum" }).error?.issues[0].path).toEqual(["quantity"]);
    expect(baselineInput.safeParse({ values: [1, 2], period: "fortnight" }).error?.issues[0].path).toEqual(["period"]);
    expect(quantityLabel("total", "quarter", 1)).toBe("total of the next quarter");
  });
});

describe("warnings about the legs", () => {
  const q = { lowerBound: 500, upperBound: 5000, unit: "passengers (thousands)" };
  it("a one-month baseline for a year's question is outside the plausible range and an order of magnitude below the panel", () => {
    const w = legWarnings(q, { mean: 140, label: "value in month 12 after the history" }, 1700);
    expect(w).toHaveLength(2);
    expect(w[0]).toMatch(/baseline's forecast \(140 passengers \(thousands\), the value in month 12 after the history\) lies outside the question's plausible range, 500 to 5,000/);
    expect(w[1]).toMatch(/differ by a factor of 12\.1: an order of magnitude/); // 1700 / 140 = 12.14 (hand computation)
  });
  it("no warning when both legs are inside the range and within a factor of 10 (9.9 is not an order of magnitude)", () => {
    expect(legWarnings(q, { mean: 1676, label: "total of the next 12 months" }, 1700)).toEqual([]);
    expect(legWarnings({ ...q, lowerBound: 0 }, { mean: 100, label: "x" }, 990)).toEqual([]);
    expect(legWarnings(q, null, 6000)).toEqual([expect.stringMatching(/corrected panel figure \(6,000 passengers \(thousands\)\) lies outside/)]);
  });
});
