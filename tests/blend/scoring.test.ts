import { describe, expect, it } from "vitest";
import { TRACKING_SIGNAL_LIMIT, accuracyHistory, scoreFigure, scoreOutcome, trackingAlarm } from "../../lib/blend";
import { trackingSignalSeries } from "../../lib/forecast/accuracy";
import { referenceCsv } from "../stats/reference-data";
import { runR, rVector } from "../stats/rscript";

describe("accuracyHistory and the tracking signal on relative errors, docs/methods.md §8 [COMPUTED-ONLY]", () => {
  // §8: actual 100, 105, 98, 110, 112, 115, 120; forecast 102, 100, 100, 104, 106, 108, 110.
  const actual = [100, 105, 98, 110, 112, 115, 120];
  const baseline = [102, 100, 100, 104, 106, 108, 110];
  const rawPanel = [95, 104, 101, 112, 108, 118, 117];
  const correctedPanel = [99, 107, 100, 113, 111, 117, 121];
  const blend = baseline.map((b, i) => 0.5 * b + 0.5 * rawPanel[i]);
  const entries = actual.map((a, i) => ({
    actual: a,
    rawPanel: rawPanel[i],
    correctedPanel: correctedPanel[i],
    baseline: baseline[i],
    blend: blend[i],
  }));

  it("baseline: TS on relative errors by hand from the §8 series; first beyond ±4 at period 6", () => {
    const h = accuracyHistory(entries);
    // §8 relative errors r = e/|a|, e = −2, 5, −2, 6, 6, 7, 10 (hand): TS_t = Σr / (Σ|r|/t).
    const r = [-2 / 100, 5 / 105, -2 / 98, 6 / 110, 6 / 112, 7 / 115, 10 / 120];
    const expected = r.map((_, t) => {
      const w = r.slice(0, t + 1);
      return w.reduce((a, b) => a + b, 0) / (w.reduce((a, b) => a + Math.abs(b), 0) / (t + 1));
    });
    h.baseline.trackingSignal.forEach((v, i) => expect(v).toBeCloseTo(expected[i], 12));
    // TS_1 = −1 and TS_6 = 6·(Σr)/(Σ|r|) > 4, as with raw errors (same signs throughout).
    expect(h.baseline.trackingSignal[0]).toBe(-1);
    expect(TRACKING_SIGNAL_LIMIT).toBe(4); // common practice (§8: no authoritative source)
    expect(h.baseline.alarm).toEqual({ firstBreach: 6, value: h.baseline.trackingSignal[5], limit: 4 });
    expect(h.baseline.accuracy.trackingSignal).toBe(h.baseline.trackingSignal[6]);
    // §8 running MAD at period 7 is 5.4285714 = the MAE over the seven errors; ME = 30/7 (CFE 30).
    expect(h.baseline.accuracy.mae).toBeCloseTo(5.4285714, 7);
    expect(h.baseline.accuracy.me).toBeCloseTo(30 / 7, 12);
    expect(h.n).toBe(7);
  });

  it("questions of different sizes: raw and relative signals of opposite sign (docs/methods.md §8, by hand)", () => {
    // Actuals 100, 100, 10 000; figures 90, 90, 10 500: two of three figures too low by 10%, one
    // too high by 5%. Raw errors 10, 10, −500 → TS_3 = −480/(520/3) = −2.7692308 (the large
    // question decides the sign); relative 0.1, 0.1, −0.05 → TS_3 = 0.15/(0.25/3) = 1.8.
    const rows = [
      [100, 90],
      [100, 90],
      [10000, 10500],
    ];
    const h = accuracyHistory(rows.map(([a, f]) => ({ actual: a, rawPanel: f, correctedPanel: f, baseline: f, blend: f })));
    expect(trackingSignalSeries([100, 100, 10000], [90, 90, 10500])[2]).toBeCloseTo(-480 / (520 / 3), 12);
    expect(h.blend.trackingSignal[0]).toBeCloseTo(1, 12);
    expect(h.blend.trackingSignal[1]).toBeCloseTo(2, 12);
    expect(h.blend.trackingSignal[2]).toBeCloseTo(1.8, 12);
    expect(h.blend.accuracy.trackingSignal).toBeCloseTo(1.8, 12);
  });

  it("an actual of 0 has no relative error: left out of the signal, NaN at that question (§8 policy)", () => {
    // Errors r = 0.1, (none), −0.05 → TS = 1, NaN, 0.05/(0.15/2) = 0.6666667 (hand).
    const h = accuracyHistory(
      [
        [100, 90],
        [0, 5],
        [1000, 1050],
      ].map(([a, f]) => ({ actual: a, rawPanel: f, correctedPanel: f, baseline: f, blend: f })),
    );
    expect(h.blend.trackingSignal[0]).toBeCloseTo(1, 12);
    expect(h.blend.trackingSignal[1]).toBeNaN();
    expect(h.blend.trackingSignal[2]).toBeCloseTo(0.05 / 0.075, 12);
    expect(h.blend.alarm.firstBreach).toBeNull();
  });

  it("the other figures' ME, MAE, RMSE, MAPE, sMAPE and running TS on relative errors agree with R", () => {
    const h = accuracyHistory(entries);
    for (const [name, f] of [
      ["rawPanel", rawPanel],
      ["correctedPanel", correctedPanel],
      ["blend", blend],
    ] as const) {
      const [[me, mae, rmse, mape, smape], ts] = runR(`a <- ${rVector(actual)}; f <- ${rVector(f)}; e <- a - f
out(c(mean(e), mean(abs(e)), sqrt(mean(e^2)), mean(abs(100 * e / a)), mean(200 * abs(e) / (abs(a) + abs(f)))))
r <- e / abs(a)
out(cumsum(r) / (cumsum(abs(r)) / seq_along(r)))`);
      const acc = h[name].accuracy;
      [acc.me, acc.mae, acc.rmse, acc.mape, acc.smape].forEach((v, i) =>
        expect(Math.abs(v - [me, mae, rmse, mape, smape][i]), `${name} measure ${i}`).toBeLessThan(1e-12 * Math.max(1, Math.abs(v))),
      );
      h[name].trackingSignal.forEach((v, i) => expect(v).toBeCloseTo(ts[i], 12));
      const breach = ts.findIndex((v) => Math.abs(v) > 4);
      expect(h[name].alarm.firstBreach).toBe(breach === -1 ? null : breach + 1);
    }
  });

  it("docs/methods.md §4 small example as a history: MAE 10, RMSE 10, MAPE 11.6666667, sMAPE 10.9446109 [COMPUTED-ONLY]", () => {
    const y = [100, 200, 50];
    const f = [110, 190, 60];
    const h = accuracyHistory(y.map((a, i) => ({ actual: a, rawPanel: f[i], correctedPanel: f[i], baseline: f[i], blend: f[i] })));
    expect(h.blend.accuracy.mae).toBeCloseTo(10, 12);
    expect(h.blend.accuracy.rmse).toBeCloseTo(10, 12);
    expect(h.blend.accuracy.mape).toBeCloseTo(11.6666667, 7);
    expect(h.blend.accuracy.smape).toBeCloseTo(10.9446109, 7);
  });

  it("policy: an empty history or a non-finite figure throws, naming the entry and field", () => {
    expect(() => accuracyHistory([])).toThrow(RangeError);
    expect(() => accuracyHistory([{ ...entries[0], blend: NaN }])).toThrow(/entries\[0\]\.blend/);
  });
});

describe("trackingAlarm", () => {
  it("flags the first |TS| strictly above the limit; NaN never breaches; ±Infinity and bad limits throw", () => {
    expect(trackingAlarm([1, -4, -4.5, 6])).toEqual({ firstBreach: 3, value: -4.5, limit: 4 });
    expect(trackingAlarm([NaN, 1, 2]).firstBreach).toBeNull();
    expect(trackingAlarm([2.5, 3.5], 3).firstBreach).toBe(2);
    expect(() => trackingAlarm([])).toThrow(RangeError);
    expect(() => trackingAlarm([1, Infinity])).toThrow(/series\[1\]/);
    expect(() => trackingAlarm([1], 0)).toThrow(/limit/);
  });
});

describe("scoreOutcome: every figure of one question", () => {
  it("errors, percent errors and sMAPE by hand from the definitions (docs/methods.md §4)", () => {
    const s = scoreOutcome(120, {
      rawPanel: 100,
      correctedPanel: 110,
      baseline: 125,
      blend: 112.5,
      panelists: { "Panelist A": 90, "Panelist B": 130 },
    });
    // e = actual − forecast; APE = |100e/actual|; sAPE = 200|e|/(|a| + |f|).
    expect(s.rawPanel.error).toBe(20);
    expect(s.rawPanel.absolutePercentError).toBeCloseTo(100 * 20 / 120, 12);
    expect(s.rawPanel.symmetricPercentError).toBeCloseTo((200 * 20) / 220, 12);
    expect(s.correctedPanel.error).toBe(10);
    expect(s.baseline.error).toBe(-5);
    expect(s.baseline.percentError).toBeCloseTo((100 * -5) / 120, 12);
    expect(s.baseline.absoluteError).toBe(5);
    expect(s.blend.error).toBe(7.5);
    expect(s.panelists.map((p) => [p.label, p.error])).toEqual([
      ["Panelist A", 30],
      ["Panelist B", -10],
    ]);
    expect(s.blend.scaledError).toBeNaN(); // no training series given
  });

  it("scaled error uses the MASE scale of docs/methods.md §4: NIST 12-point series, scale 29/11 [COMPUTED-ONLY]", () => {
    const { y } = referenceCsv("nist_handbook_6431_ses12.csv");
    const s = scoreFigure("baseline", 73, 70, { training: y });
    expect(s.scaledError).toBeCloseTo(3 / (29 / 11), 12);
  });

  it("an actual of 0 leaves the percent errors NaN (undefined), not an error; NaN figures throw", () => {
    const s = scoreFigure("blend", 0, 5);
    expect(s.absolutePercentError).toBeNaN();
    expect(s.error).toBe(-5);
    expect(() => scoreOutcome(NaN, { rawPanel: 1, correctedPanel: 1, baseline: 1, blend: 1 })).toThrow(/actual/);
    expect(() => scoreOutcome(1, { rawPanel: 1, correctedPanel: 1, baseline: 1, blend: 1, panelists: { X: NaN } })).toThrow(/X/);
  });
});
