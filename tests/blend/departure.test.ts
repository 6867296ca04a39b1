import { describe, expect, it } from "vitest";
import { answerDepartures, departure, departureAcrossRounds } from "../../lib/blend";
import { runR, rVector } from "../stats/rscript";

const ANSWERS = Object.freeze([850, 960, 1000, 1105, 1150, 1240]);

describe("departure against a baseline with a given sd, vs R pnorm/qnorm", () => {
  it("difference, percent, z, percentile and the 80% / 95% flags agree with R", () => {
    const [z, pct, out80, out95] = runR(`x <- ${rVector(ANSWERS)}; m <- 1000; s <- 80
z <- (x - m) / s
out(z); out(100 * pnorm(x, m, s))
out(as.numeric(x < m - qnorm(0.9) * s | x > m + qnorm(0.9) * s))
out(as.numeric(x < qnorm(0.025, m, s) | x > qnorm(0.975, m, s)))`);
    const ds = answerDepartures(ANSWERS, { mean: 1000, sd: 80 });
    ds.forEach((d, i) => {
      const x = ANSWERS[i];
      expect(d.difference).toBe(x - 1000);
      expect(d.percent).toBeCloseTo((100 * (x - 1000)) / 1000, 12); // hand: 100·difference/baseline
      expect(d.z).toBeCloseTo(z[i], 14);
      expect(Math.abs(d.percentile - pct[i])).toBeLessThan(1e-12 * 100);
      expect(d.outside80).toBe(out80[i] === 1);
      expect(d.outside95).toBe(out95[i] === 1);
      expect(d.sdSource).toBe("sd");
    });
    // The set includes answers inside both intervals, outside 80% only, and outside both.
    expect(ds.map((d) => [d.outside80, d.outside95])).toEqual([
      [true, false],
      [false, false],
      [false, false],
      [true, false],
      [true, false],
      [true, true],
    ]);
  });

  it("with only an (asymmetric) 80% interval: sd from its width; percentile and flags from that one normal (R pnorm)", () => {
    const b = { mean: 1000, lower80: 930, upper80: 1100, lower95: 880, upper95: 1180 };
    const xs = [925, 935, 1095, 1105, 1190];
    const [[sd], pct, out80, out95] = runR(`s <- (1100 - 930) / (2 * qnorm(0.9)); x <- ${rVector(xs)}; p <- pnorm(x, 1000, s)
out(s); out(100 * p); out(as.numeric(p < 0.1 | p > 0.9)); out(as.numeric(p < 0.025 | p > 0.975))`);
    xs.forEach((x, i) => {
      const d = departure(x, b);
      expect(d.sdSource).toBe("80% interval");
      expect(d.sd).toBeCloseTo(sd, 12);
      expect(d.percentile).toBeCloseTo(pct[i], 10);
      expect(d.outside80).toBe(out80[i] === 1);
      expect(d.outside95).toBe(out95[i] === 1);
    });
    // 1095 lies inside the given upper80 of 1100 but at R's pnorm 92.8th percentile of the normal
    // the blend uses: one distribution decides, so it is outside 80% (issue 12).
    expect(departure(1095, b).outside80).toBe(true);
  });

  it("a value at the 99.5th percentile is never 'inside 95%' (R: qnorm(0.995, 1000, 80))", () => {
    const [[x]] = runR("out(qnorm(0.995, 1000, 80))");
    const d = departure(x, { mean: 1000, sd: 80, lower95: 700, upper95: 1300 });
    expect(d.percentile).toBeCloseTo(99.5, 10);
    expect(d.outside95).toBe(true);
  });

  it("a value on a bound is inside; a baseline of 0 gives percent NaN; a negative baseline divides by |baseline|", () => {
    const b = { mean: 1000, sd: 80, lower80: 900, upper80: 1100 };
    expect(departure(1100, b).outside80).toBe(false);
    expect(departure(0.5, { mean: 0, sd: 1 }).percent).toBeNaN();
    expect(departure(-90, { mean: -100, sd: 5 }).percent).toBeCloseTo(10, 12); // hand: 100·10/|−100|
  });
});

describe("departureAcrossRounds", () => {
  it("tracks the panel's difference and z round by round (hand: z = (figure − 1000)/80)", () => {
    const r = departureAcrossRounds([1200, 1150, 1160, 1080], { mean: 1000, sd: 80 });
    expect(r.rounds.map((d) => d.round)).toEqual([1, 2, 3, 4]);
    expect(r.rounds.map((d) => d.z)).toEqual([2.5, 1.875, 2, 1]);
    expect(r.rounds[0].zChange).toBeNaN();
    expect(r.rounds[0].closer).toBeNull();
    expect(r.rounds.slice(1).map((d) => d.zChange)).toEqual([-0.625, 0.125, -1]);
    expect(r.rounds.slice(1).map((d) => d.differenceChange)).toEqual([-50, 10, -80]);
    expect(r.rounds.slice(1).map((d) => d.closer)).toEqual([true, false, true]);
    expect(r.totalZChange).toBe(-1.5);
    expect(departureAcrossRounds([1040], { mean: 1000, sd: 80 }).totalZChange).toBe(0);
  });
});

describe("departure policy", () => {
  it("throws RangeError for empty, NaN or infinite input and for an invalid baseline", () => {
    expect(() => answerDepartures([], { mean: 1, sd: 1 })).toThrow(RangeError);
    expect(() => answerDepartures([1, NaN], { mean: 1, sd: 1 })).toThrow(/values\[1\]/);
    expect(() => departure(Infinity, { mean: 1, sd: 1 })).toThrow(/value/);
    expect(() => departure(1, { mean: 1, sd: -2 })).toThrow(/sd/);
    expect(() => departure(1, { mean: 1 })).toThrow(/give sd/);
    expect(() => departure(1, { mean: 1, lower95: 0 })).toThrow(/needs both/);
    expect(() => departure(1, { mean: 1, lower95: 3, upper95: 2 })).toThrow(/must be below/);
    expect(() => departureAcrossRounds([], { mean: 1, sd: 1 })).toThrow(RangeError);
  });
});
