import { execFileSync } from "node:child_process";
import { describe, expect, it } from "vitest";
import ses from "../../lib/forecast/methods/ses";
import { originPlan, rollingOrigin, selectMethod } from "../../lib/forecast/select";
import type { Method, MethodId } from "../../lib/forecast/types";

/** Evaluates R code and returns the printed numbers. */
function r(code: string): number[] {
  return execFileSync("Rscript", ["-e", code], { encoding: "utf8", stdio: "pipe" }).trim().split(/\s+/).map(Number);
}

/** R's datasets::Nile (annual flow of the Nile at Aswan, 1871–1970), read from R itself. */
const NILE = r("cat(format(as.numeric(Nile), digits = 17))");

/**
 * SES with alpha fixed and the level started at the first value: the same model as R's
 * `ses(x, alpha = a, initial = "simple")`, so that rolling-origin errors can be compared with
 * R's `tsCV()`. `id` lets two differently tuned copies stand as two candidates.
 */
function fixedSes(alpha: number, id: MethodId = "ses"): Method {
  return {
    ...ses,
    id,
    minLength: () => 2,
    applicable: () => true,
    fit: (input) => ses.fit({ ...input, fixed: { alpha, l0: input.y[0] } }),
    forecast: ses.forecast.bind(ses),
  };
}

/** R 4.2.2 + forecast 8.20: mean over the last three origins of MAE(tsCV errors) / in-sample naive MAE. */
const R_ROLLING_MASE = (forecastFn: string, h: number) => `
  suppressMessages(library(forecast)); y <- as.numeric(Nile); n <- length(y); h <- ${h}
  fc <- ${forecastFn}
  e <- tsCV(y, fc, h = h)
  origins <- c(n - h, n - h - 1, n - h - 2)
  cat(format(mean(sapply(origins, function(t) mean(abs(e[t, ])) / mean(abs(diff(y[1:t]))))), digits = 17))`;

describe("rolling-origin MASE", () => {
  it("equals the MASE of R's tsCV() errors for SES(alpha = 0.5) on the Nile series", () => {
    const expected = r(R_ROLLING_MASE('function(x, h) ses(x, alpha = 0.5, initial = "simple", h = h)', 5))[0];
    for (const refit of ["full", "update"] as const) {
      const score = rollingOrigin(fixedSes(0.5), { y: NILE, season: 1, horizon: 5 }, 3, 1, refit);
      expect(score.origins).toBe(3);
      expect(score.mase).toBeCloseTo(expected, 10);
    }
  });

  it("scores the equal-weight combination like R's tsCV() of the averaged forecasts", () => {
    const expected = r(
      R_ROLLING_MASE(
        `function(x, h) list(mean = (ses(x, alpha = 0.5, initial = "simple", h = h)$mean + ses(x, alpha = 0.2, initial = "simple", h = h)$mean) / 2)`,
        4,
      ),
    )[0];
    const sel = selectMethod([fixedSes(0.5, "ses"), fixedSes(0.2, "holt")], { y: NILE, season: 1, horizon: 4 }, { strategy: "combine", combine: 2, step: 1 });
    expect(sel.combination?.methods).toHaveLength(2);
    expect(sel.combination?.mase).toBeCloseTo(expected, 10);
  });
});

describe("selectMethod", () => {
  it("reports every candidate, keeps a failing one with its error, and picks the lowest score", () => {
    const failing: Method = {
      ...fixedSes(0.5, "theta"),
      fit: () => {
        throw new Error("boom at this origin");
      },
    };
    const sel = selectMethod([fixedSes(0.9, "ses"), failing, fixedSes(0.2, "holt")], { y: NILE, season: 1, horizon: 5 });
    expect(sel.candidates.map((c) => c.method)).toEqual(["ses", "theta", "holt"]);
    expect(sel.candidates[1]).toEqual({ method: "theta", mase: null, origins: 0, error: "boom at this origin" });
    const [a, , c] = sel.candidates;
    expect(sel.chosen).toEqual([a.mase! <= c.mase! ? "ses" : "holt"]);
    expect(sel.mase).toBe(Math.min(a.mase!, c.mase!));
  });

  it("breaks a tie in favour of the method listed first", () => {
    const sel = selectMethod([fixedSes(0.3, "holt"), fixedSes(0.3, "ses")], { y: NILE, season: 1, horizon: 3 });
    expect(sel.candidates[0].mase).toBe(sel.candidates[1].mase);
    expect(sel.chosen).toEqual(["holt"]);
  });

  it("chooses the combination only when it scores better than the best single candidate", () => {
    const sel = selectMethod([fixedSes(0.5, "ses"), fixedSes(0.2, "holt")], { y: NILE, season: 1, horizon: 4 }, { strategy: "combine", combine: 2 });
    const best = Math.min(...sel.candidates.map((c) => c.mase!));
    if (sel.combination!.mase < best) expect(sel.chosen).toHaveLength(2);
    else expect(sel.chosen).toHaveLength(1);
  });

  it("shortens the evaluated horizon on short series and says so", () => {
    const sel = selectMethod([fixedSes(0.5)], { y: NILE.slice(0, 8), season: 1, horizon: 10 }, { step: 1 });
    expect(sel.evaluatedHorizon).toBe(4);
    expect(sel.originLengths).toEqual([4, 3, 2]);
    expect(sel.notes[0]).toBe("the series is short: candidates were compared on 4-step forecasts instead of 10");
    // Default spacing (2): three origins 2 apart leave room for 2-step forecasts only.
    expect(selectMethod([fixedSes(0.5)], { y: NILE.slice(0, 8), season: 1, horizon: 10 }).originLengths).toEqual([6, 4, 2]);
  });

  it("throws without candidates", () => {
    expect(() => selectMethod([], { y: NILE, season: 1, horizon: 3 })).toThrow("no candidate methods to select from");
  });
});

describe("baseline() with a combination", () => {
  it("averages the members' means and interval bounds, matching R's ses() forecasts averaged", async () => {
    const { baseline } = await import("../../lib/forecast/baseline");
    // On the Nile series with h = 10, the combination of SES(0.7) and SES(0.1) scores below both
    // (rolling-origin MASE 0.812 against 0.855 and 0.826 here; the scoring is checked against R's tsCV above).
    const res = baseline(NILE, {
      horizon: 10,
      strategy: "combine",
      combine: 2,
      step: 1,
      methods: [fixedSes(0.7, "ses"), fixedSes(0.1, "holt")],
    });
    expect(res.method).toBe("combination");
    expect(res.parameters).toEqual({ ses: 0.5, holt: 0.5 });
    expect(res.combination!.map((c) => c.method)).toEqual(["holt", "ses"]);
    // Expected: R 4.2.2 + forecast 8.20, ses(Nile, alpha, initial = "simple", h = 10, level = c(80, 95)), averaged.
    const rv = r(`suppressMessages(library(forecast));
      a <- ses(Nile, alpha = 0.7, initial = "simple", h = 10, level = c(80, 95));
      b <- ses(Nile, alpha = 0.1, initial = "simple", h = 10, level = c(80, 95));
      cat(format(c((a$mean + b$mean) / 2, (a$lower[, 1] + b$lower[, 1]) / 2, (a$upper[, 2] + b$upper[, 2]) / 2), digits = 17))`);
    res.forecast.forEach((s, i) => {
      expect(s.mean).toBeCloseTo(rv[i], 8);
      expect(s.lower["80"]).toBeCloseTo(rv[10 + i], 8);
      expect(s.upper["95"]).toBeCloseTo(rv[20 + i], 8);
    });
  });
});

describe("originPlan", () => {
  it("places the origins h steps before the end, step apart, longest first", () => {
    expect(originPlan(100, 10, 3, 5)).toEqual({ lengths: [90, 89, 88], horizon: 10 });
    expect(originPlan(100, 10, 3, 5, 4)).toEqual({ lengths: [90, 86, 82], horizon: 10 });
  });
});
