/**
 * A launch baseline as a reader can check it (docs/methods.md §19): each analogous product's Bass
 * fit with standard errors and cautions, the p and q carried to the new product, the market
 * potential and where it came from, and the forecast adoptions per period with their 80% range.
 */
import { countOf, formatNumber } from "./format";
import BaselineChart, { type BaselineChartStep } from "./baseline-chart";
import type { BaselineResult } from "@/lib/forecast/baseline";
import type { AnalogueFit } from "@/lib/forecast/launch";

export interface LaunchPreview {
  readonly analogues: readonly AnalogueFit[];
  readonly p: { readonly mean: number; readonly lower80: number; readonly upper80: number };
  readonly q: { readonly mean: number; readonly lower80: number; readonly upper80: number };
  readonly market: { readonly median: number; readonly low: number; readonly high: number; readonly how: string };
  readonly draws: number;
  readonly steps: readonly BaselineChartStep[];
}

/** The analogues' Bass fits and the launch forecast by period, as a table a reader can check. */
export default function LaunchTable({ launch, unit }: { launch: LaunchPreview; unit: string }) {
  const pm = (v: number, se: number) => `${formatNumber(v, 3)} ± ${Number.isFinite(se) ? formatNumber(se, 2) : "n/a"}`;
  return (
    <>
      <table className="small" data-launch-fits>
        <caption>Bass fits of the analogous products (estimate ± standard error)</caption>
        <thead>
          <tr>
            <th>Analogue</th>
            <th className="num">Periods</th>
            <th className="num">p (innovation)</th>
            <th className="num">q (imitation)</th>
            <th className="num">m (its market)</th>
            <th className="num">Peak period</th>
          </tr>
        </thead>
        <tbody>
          {launch.analogues.map((a) => (
            <tr key={a.name}>
              <td>{a.name}</td>
              <td className="num">{a.periods}</td>
              <td className="num">{pm(a.p, a.se.p)}</td>
              <td className="num">{pm(a.q, a.se.q)}</td>
              <td className="num">{pm(a.m, a.se.m)}</td>
              <td className="num">{formatNumber(a.peak, 2)}</td>
            </tr>
          ))}
        </tbody>
      </table>
      {launch.analogues.map((a) => (
        <BaselineChart
          key={a.name}
          labels={a.values.map((_, i) => String(i + 1))}
          history={a.values}
          fitted={a.fitted}
          fittedLabel="Fitted Bass curve"
          unit={unit}
          caption={`${a.name}: adoptions per period after its launch, and the fitted Bass curve`}
        />
      ))}
      {launch.analogues.flatMap((a) => a.notes.map((n) => (
        <p key={a.name + n} className="caution small">
          {a.name}: {n}
        </p>
      )))}
      <p className="small">
        Carried to the new product: p {formatNumber(launch.p.mean, 3)} (80% {formatNumber(launch.p.lower80, 3)} to {formatNumber(launch.p.upper80, 3)}), q{" "}
        {formatNumber(launch.q.mean, 3)} (80% {formatNumber(launch.q.lower80, 3)} to {formatNumber(launch.q.upper80, 3)}); market potential {launch.market.how}.{" "}
        {countOf(launch.draws, "simulated launch", "simulated launches")}. Analogues should share the new product&apos;s adoption drivers (price, channel, who adopts
        and why): the curve&apos;s shape comes from them alone.
      </p>
      <table className="small" data-launch-steps>
        <caption>Adoptions per period after launch ({unit})</caption>
        <thead>
          <tr>
            <th className="num">Period</th>
            <th className="num">Forecast</th>
            <th className="num">80% range</th>
          </tr>
        </thead>
        <tbody>
          {launch.steps.map((st) => (
            <tr key={st.step}>
              <td className="num">{st.step}</td>
              <td className="num">{formatNumber(st.mean)}</td>
              <td className="num">
                {formatNumber(st.lower80)} to {formatNumber(st.upper80)}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </>
  );
}

/** The table's data from a stored or previewed baseline result (undefined for other baselines). */
export function launchPreview(result: BaselineResult): LaunchPreview | undefined {
  const l = result.launch;
  if (!l) return undefined;
  return {
    analogues: l.analogues,
    p: { mean: l.p.mean, lower80: l.p.lower["80"], upper80: l.p.upper["80"] },
    q: { mean: l.q.mean, lower80: l.q.lower["80"], upper80: l.q.upper["80"] },
    market: { median: l.market.median, low: l.market.low, high: l.market.high, how: l.market.how },
    draws: l.draws,
    steps: result.forecast.map((st) => ({
      step: st.step,
      mean: st.mean,
      lower80: st.lower["80"] ?? null,
      upper80: st.upper["80"] ?? null,
      lower95: st.lower["95"] ?? null,
      upper95: st.upper["95"] ?? null,
    })),
  };
}
