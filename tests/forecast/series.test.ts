import { execFileSync } from "node:child_process";
import { describe, expect, it } from "vitest";
import {
  checkHorizon,
  checkSeason,
  interpolateGaps,
  MAX_HORIZON,
  methodProblem,
  prepareSeries,
} from "../../lib/forecast/series";
import { ForecastInputError, type Method, type MethodId } from "../../lib/forecast/types";

/** Runs R code and returns its printed numbers (NA becomes null). */
function r(code: string): (number | null)[] {
  const out = execFileSync("Rscript", ["-e", code], { encoding: "utf8", stdio: "pipe" });
  return out.trim().split(/\s+/).map((s) => (s === "NA" ? null : Number(s)));
}

/** A method shell for the policy checks (only id, minLength and applicable are consulted). */
function shell(id: MethodId, minLength = 1): Method {
  return {
    id,
    minLength: () => minLength,
    applicable: () => true,
    fit: () => {
      throw new Error("not used");
    },
    forecast: () => {
      throw new Error("not used");
    },
  };
}

describe("missing values", () => {
  it("trims the leading gap and interpolates interior gaps of R's presidents series like R's approx()", () => {
    // R datasets::presidents (quarterly approval ratings, 1945–1974) has NA at positions 1, 15, 16, 31, 111, 112.
    const raw = r('cat(ifelse(is.na(presidents), "NA", presidents), sep = " ")');
    // Expected: R 4.2.2 stats::approx over the observed points, at the interior NA positions.
    const expected = r(
      'x <- as.numeric(presidents); i <- which(!is.na(x)); cat(format(approx(i, x[i], xout = c(15, 16, 31, 111, 112))$y, digits = 17), sep = " ")',
    ) as number[];
    const s = prepareSeries({ y: raw }, { season: 4 });
    expect(s.trimmedStart).toBe(1);
    expect(s.trimmedEnd).toBe(0);
    expect(s.y.length).toBe(119);
    expect(s.filled).toEqual([13, 14, 29, 109, 110]);
    s.filled.forEach((k, j) => expect(s.y[k]).toBeCloseTo(expected[j], 12));
    expect(s.notes).toContain("1 leading missing value trimmed");
    expect(s.notes).toContain("5 missing values filled by linear interpolation (rows 15, 16, 31, 111, 112)");
  });

  it("trims trailing gaps and counts NaN as missing", () => {
    const s = prepareSeries({ y: [1, 2, NaN, 4, null, null] });
    expect(s.y).toEqual([1, 2, 3, 4]);
    expect(s.trimmedEnd).toBe(2);
  });

  it("interpolates a longer gap linearly", () => {
    expect(interpolateGaps([0, null, null, null, 8]).y).toEqual([0, 2, 4, 6, 8]);
  });

  it("refuses a series with fewer than two observed values, and infinite values", () => {
    expect(() => prepareSeries({ y: [null, 5, null] })).toThrow("the series has 1 observed value; at least 2 are needed");
    expect(() => prepareSeries({ y: [] })).toThrow(ForecastInputError);
    expect(() => prepareSeries({ y: [1, Infinity, 3] })).toThrow("row 2: value Infinity is not finite");
  });
});

describe("season length", () => {
  it("must be a whole number of at least 1", () => {
    expect(() => checkSeason(0)).toThrow("season length must be a whole number of at least 1 (got 0)");
    expect(() => checkSeason(2.5)).toThrow(/got 2.5/);
    expect(checkSeason(12)).toBe(12);
  });

  it("falls back to non-seasonal methods when there are fewer than two seasons, and says so", () => {
    const s = prepareSeries({ y: Array.from({ length: 20 }, (_, i) => 10 + (i % 12)) }, { season: 12 });
    expect(s.season).toBe(1);
    expect(s.requestedSeason).toBe(12);
    expect(s.notes).toContain("season length 12 needs at least 24 observations for seasonal methods (have 20); non-seasonal methods only");
    expect(methodProblem(shell("holt-winters-additive"), s)).toBe("season length 12 needs at least 24 observations (have 20)");
    expect(methodProblem(shell("ses"), s)).toBeUndefined();
  });
});

describe("horizon", () => {
  it("refuses absurd horizons with the limit in the message", () => {
    expect(() => checkHorizon(0, 50)).toThrow("horizon must be a whole number of at least 1 (got 0)");
    expect(() => checkHorizon(MAX_HORIZON + 1, 5000)).toThrow("horizon 1001 is above the maximum of 1000 steps");
    expect(() => checkHorizon(121, 12)).toThrow("horizon 121 is more than 10 times the 12 observations; forecast at most 120 steps");
    expect(checkHorizon(120, 12)).toBe(120);
  });

  it("defaults to 2 seasons, 10 steps without a season, or the number of future rows", () => {
    const y = Array.from({ length: 30 }, (_, i) => i + 1);
    expect(prepareSeries({ y }, { season: 4 }).horizon).toBe(8);
    expect(prepareSeries({ y }).horizon).toBe(10);
    const x = [y.map((v) => v * 2)];
    expect(prepareSeries({ y, x, futureX: [[62, 64, 66]] }).horizon).toBe(3);
  });
});

describe("constant series, zeros and negatives, explanatory columns", () => {
  it("allows only the methods that cope with a constant series", () => {
    const s = prepareSeries({ y: [5, 5, 5, 5, 5, 5] });
    expect(s.constant).toBe(true);
    expect(s.notes).toContain("the series is constant (every value is 5); only methods that cope with that are used");
    expect(methodProblem(shell("naive"), s)).toBeUndefined();
    expect(methodProblem(shell("holt"), s)).toMatch(/^holt is not used on a constant series/);
  });

  it("drops holt-winters-multiplicative when a value is zero or negative", () => {
    const y = Array.from({ length: 24 }, (_, i) => (i % 4) - 1);
    const s = prepareSeries({ y }, { season: 4 });
    expect(s.positive).toBe(false);
    expect(s.notes).toContain("the series has zeros or negative values; holt-winters-multiplicative is not used");
    expect(methodProblem(shell("holt-winters-multiplicative"), s)).toBe("holt-winters-multiplicative needs every value above zero");
    expect(methodProblem(shell("holt-winters-additive"), s)).toBeUndefined();
  });

  it("makes regression unavailable, with the reason, when future rows are too few or a cell is empty", () => {
    const y = [1, 2, 3, 4, 5, 6];
    const short = prepareSeries({ y, x: [y], xNames: ["price"], futureX: [[7]] }, { horizon: 2 });
    expect(short.regressionProblem).toBe(
      "regression needs future values of the explanatory columns for each of the 2 steps (the file has 1 future row)",
    );
    expect(methodProblem(shell("regression"), short)).toBe(short.regressionProblem);
    const holes = prepareSeries({ y, x: [[1, 2, null, 4, 5, 6]], xNames: ["price"], futureX: [[7]], rows: [2, 3, 4, 5, 6, 7] });
    expect(holes.regressionProblem).toBe("column 'price' is empty in row 4");
    const ok = prepareSeries({ y, x: [y], xNames: ["price"], futureX: [[7, 8, 9]] }, { horizon: 2 });
    expect(ok.futureX).toEqual([[7, 8]]);
    expect(methodProblem(shell("regression"), ok)).toBeUndefined();
  });

  it("refuses a method when the series is shorter than the method's minimum", () => {
    const s = prepareSeries({ y: [1, 3, 2] });
    expect(methodProblem(shell("theta", 4), s)).toBe("theta needs at least 4 observations (have 3)");
  });
});

describe("baseline() applies the policy", () => {
  // Imported here so that the policy tests above do not depend on the method files.
  const load = () => import("../../lib/forecast/baseline");

  it("forecasts a constant series with naive only, like R's forecast::naive", async () => {
    const { baseline } = await load();
    const res = baseline([5, 5, 5, 5, 5, 5], { horizon: 2 });
    // R 4.2.2, forecast 8.20: naive(rep(5, 6), h = 2) has mean 5 and bounds 5 at both levels.
    const rv = r('f <- forecast::naive(rep(5, 6), h = 2); cat(c(f$mean, f$lower, f$upper), sep = " ")') as number[];
    expect(res.method).toBe("naive");
    expect(res.forecast.map((s) => s.mean)).toEqual(rv.slice(0, 2));
    expect(res.forecast.map((s) => s.lower["80"])).toEqual(rv.slice(2, 4));
    expect(res.notes).toContain("MASE is undefined on a constant series, so naive was used without comparison");
    expect(() => baseline([5, 5, 5, 5, 5, 5], { method: "holt" })).toThrow(/holt is not used on a constant series/);
  });

  it("leaves holt-winters-multiplicative out on data with negative values (R's diff(UKgas))", async () => {
    const { baseline } = await load();
    const y = r('cat(diff(as.numeric(UKgas)), sep = " ")') as number[];
    // Rolling-origin selection (strategy "best") lists every candidate with the reason it was left out.
    const res = baseline(y, { season: 4, horizon: 4, strategy: "best" });
    const hwm = res.candidates!.find((c) => c.method === "holt-winters-multiplicative");
    expect(hwm).toEqual({ method: "holt-winters-multiplicative", mase: null, error: "holt-winters-multiplicative needs every value above zero" });
    expect(res.method).not.toBe("holt-winters-multiplicative");
    expect(res.notes).toContain("the series has zeros or negative values; holt-winters-multiplicative is not used");
  });

  it("falls back to non-seasonal methods for 20 months of R's AirPassengers with season 12", async () => {
    const { baseline } = await load();
    const y = r('cat(as.numeric(AirPassengers)[1:20], sep = " ")') as number[];
    const res = baseline(y, { season: 12, horizon: 6, strategy: "best" });
    expect(res.season).toBe(1);
    expect(baseline(y, { season: 12, horizon: 6 }).season).toBe(1); // the default combination too
    expect(res.notes).toContain("season length 12 needs at least 24 observations for seasonal methods (have 20); non-seasonal methods only");
    const scored = res.candidates!.filter((c) => c.mase !== null).map((c) => c.method);
    expect(scored).not.toContain("seasonal-naive");
    expect(scored).not.toContain("holt-winters-additive");
    expect(() => baseline(y, { season: 12, method: "holt-winters-additive" })).toThrow(
      "season length 12 needs at least 24 observations (have 20)",
    );
  });

  it("interpolates the gaps of R's presidents series before forecasting and says so", async () => {
    const { baseline } = await load();
    const raw = r('cat(ifelse(is.na(presidents), "NA", presidents), sep = " ")');
    const res = baseline(raw, { season: 4, horizon: 4, method: "naive" });
    expect(res.fitted).toHaveLength(119);
    expect(res.notes).toContain("5 missing values filled by linear interpolation (rows 15, 16, 31, 111, 112)");
    // The last value of presidents (1974 Q4) is 24, so the naive forecast is 24 (R: tail(presidents, 1)).
    expect(res.forecast[0].mean).toBe(r("cat(tail(presidents, 1))")[0]);
  });

  it("refuses bad levels and fixed parameters without a named method", async () => {
    const { baseline } = await load();
    expect(() => baseline([1, 2, 3, 4], { levels: [80, 100] })).toThrow("interval level 100 must be a percentage strictly between 0 and 100");
    expect(() => baseline([1, 2, 3, 4], { fixed: { alpha: 0.5 } })).toThrow("fixed parameters need a named method, not auto");
  });
});
