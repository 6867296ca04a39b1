import { describe, expect, it } from "vitest";
import ses from "../../lib/forecast/methods/ses";
import { originPlan, rollingOrigin, selectMethod } from "../../lib/forecast/select";
import type { Method, MethodId } from "../../lib/forecast/types";
import { rEvalBatch } from "../helpers/r";

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

/** R: SES(α) with ℓ0 = y1, as `fixedSes`; the mean of two as the equal-weight combination. */
const SES = (alpha: number) => `function(x, h) ses(x, alpha = ${alpha}, initial = "simple", h = h)`;
const PAIR = (a: number, b: number) => `function(x, h) list(mean = (ses(x, alpha = ${a}, initial = "simple", h = h)$mean + ses(x, alpha = ${b}, initial = "simple", h = h)$mean) / 2)`;

/**
 * R 4.x + forecast: mean over three origins (the last at n − h, then `step` apart) of
 * MAE(tsCV errors) / in-sample naive MAE, the rolling-origin MASE of lib/forecast/select.ts.
 */
const rollingMase = (forecastFn: string, h: number, step: number) => `fc <- ${forecastFn}; h <- ${h}
  e <- tsCV(y, fc, h = h)
  origins <- n - h - ${step} * (0:2)
  out("mase", mean(sapply(origins, function(t) mean(abs(e[t, ])) / mean(abs(diff(y[1:t]))))))`;

/** Every R reference of this file, in one R session. */
const R = rEvalBatch(
  Object.fromEntries(
    Object.entries({
      nile: `out("y", Nile)`, // R's datasets::Nile (annual flow of the Nile at Aswan, 1871–1970)
      ses05h5: rollingMase(SES(0.5), 5, 1),
      pair0502h4: rollingMase(PAIR(0.5, 0.2), 4, 1),
      // selectMethod's default spacing of origins is 2
      ses09h5s2: rollingMase(SES(0.9), 5, 2),
      ses02h5s2: rollingMase(SES(0.2), 5, 2),
      ses05h4s2: rollingMase(SES(0.5), 4, 2),
      ses02h4s2: rollingMase(SES(0.2), 4, 2),
      pair0502h4s2: rollingMase(PAIR(0.5, 0.2), 4, 2),
      ses07h10: rollingMase(SES(0.7), 10, 1),
      ses01h10: rollingMase(SES(0.1), 10, 1),
      pair0701h10: rollingMase(PAIR(0.7, 0.1), 10, 1),
      // Expected: ses(Nile, alpha, initial = "simple", h = 10, level = c(80, 95)), averaged.
      combined: `a <- ses(Nile, alpha = 0.7, initial = "simple", h = 10, level = c(80, 95))
        b <- ses(Nile, alpha = 0.1, initial = "simple", h = 10, level = c(80, 95))
        out("mean", (a$mean + b$mean) / 2); out("lower80", (a$lower[, 1] + b$lower[, 1]) / 2); out("upper95", (a$upper[, 2] + b$upper[, 2]) / 2)`,
    }).map(([k, code]) => [k, `y <- as.numeric(Nile); n <- length(y)\n${code}`]),
  ),
);
const NILE = R.nile.y;
const mase = (key: string) => R[key].mase[0];

describe("rolling-origin MASE", () => {
  it("equals the MASE of R's tsCV() errors for SES(alpha = 0.5) on the Nile series", () => {
    const expected = mase("ses05h5");
    for (const refit of ["full", "update"] as const) {
      const score = rollingOrigin(fixedSes(0.5), { y: NILE, season: 1, horizon: 5 }, 3, 1, refit);
      expect(score.origins).toBe(3);
      expect(score.mase).toBeCloseTo(expected, 10);
    }
  });

  it("scores the equal-weight combination like R's tsCV() of the averaged forecasts", () => {
    const expected = mase("pair0502h4");
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
    // R's tsCV scores (default spacing 2): SES(0.9) 1.0929, SES(0.2) 0.99993, so SES(0.2), listed as "holt".
    const [a, , c] = sel.candidates;
    expect(a.mase).toBeCloseTo(mase("ses09h5s2"), 10);
    expect(c.mase).toBeCloseTo(mase("ses02h5s2"), 10);
    expect(mase("ses02h5s2")).toBeLessThan(mase("ses09h5s2"));
    expect(sel.chosen).toEqual(["holt"]);
    expect(sel.mase).toBeCloseTo(mase("ses02h5s2"), 10);
  });

  it("breaks a tie in favour of the method listed first", () => {
    const sel = selectMethod([fixedSes(0.3, "holt"), fixedSes(0.3, "ses")], { y: NILE, season: 1, horizon: 3 });
    expect(sel.candidates[0].mase).toBe(sel.candidates[1].mase);
    expect(sel.chosen).toEqual(["holt"]);
  });

  it("chooses the combination only when it scores better than the best single candidate", () => {
    // R's tsCV scores, h = 4, spacing 2: SES(0.5) 1.1299, SES(0.2) 0.97187, their mean 1.0509: not chosen.
    const worse = selectMethod([fixedSes(0.5, "ses"), fixedSes(0.2, "holt")], { y: NILE, season: 1, horizon: 4 }, { strategy: "combine", combine: 2 });
    expect(worse.candidates.map((c) => c.mase)).toEqual([expect.closeTo(mase("ses05h4s2"), 10), expect.closeTo(mase("ses02h4s2"), 10)]);
    expect(worse.combination!.mase).toBeCloseTo(mase("pair0502h4s2"), 10);
    expect(mase("pair0502h4s2")).toBeGreaterThan(mase("ses02h4s2"));
    expect(worse.chosen).toEqual(["holt"]);
    // R's tsCV scores, h = 10, spacing 1: SES(0.7) 0.85497, SES(0.1) 0.82551, their mean 0.81236: chosen.
    const better = selectMethod([fixedSes(0.7, "ses"), fixedSes(0.1, "holt")], { y: NILE, season: 1, horizon: 10 }, { strategy: "combine", combine: 2, step: 1 });
    expect(better.combination!.mase).toBeCloseTo(mase("pair0701h10"), 10);
    expect(mase("pair0701h10")).toBeLessThan(Math.min(mase("ses07h10"), mase("ses01h10")));
    expect([...better.chosen].sort()).toEqual(["holt", "ses"]);
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
    // (R's tsCV rolling-origin MASE 0.812 against 0.855 and 0.826: the selection test above).
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
    // Expected: R 4.x + forecast, ses(Nile, alpha, initial = "simple", h = 10, level = c(80, 95)), averaged.
    res.forecast.forEach((s, i) => {
      expect(s.mean).toBeCloseTo(R.combined.mean[i], 8);
      expect(s.lower["80"]).toBeCloseTo(R.combined.lower80[i], 8);
      expect(s.upper["95"]).toBeCloseTo(R.combined.upper95[i], 8);
    });
  });
});

describe("originPlan", () => {
  it("places the origins h steps before the end, step apart, longest first", () => {
    expect(originPlan(100, 10, 3, 5)).toEqual({ lengths: [90, 89, 88], horizon: 10 });
    expect(originPlan(100, 10, 3, 5, 4)).toEqual({ lengths: [90, 86, 82], horizon: 10 });
  });
});
