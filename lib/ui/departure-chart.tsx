"use client";
/**
 * Departure chart: each answer's z (difference from the baseline in baseline standard errors)
 * across rounds, one line per pseudonym, and the panel figure's z as a heavier line; dashed
 * guides at ±1.28 and ±1.96 (lib/ui/chart-configs.ts `DEPARTURE_GUIDES`). Each line has its own
 * colour-blind-safe colour, marker shape and dash (`departureDatasets`). The z values come from
 * lib/blend `departure`; the chart only draws them.
 */
import { useEffect, useRef } from "react";
import { guidedLineChart } from "./chart-guides";
import { DEPARTURE_GUIDES, departureDatasets, type DepartureSeries } from "./chart-configs";

export type { DepartureSeries };

export default function DepartureChart({ rounds, answers, panel }: { rounds: readonly number[]; answers: readonly DepartureSeries[]; panel: readonly (number | null)[] }) {
  const canvas = useRef<HTMLCanvasElement>(null);
  useEffect(() => {
    if (!canvas.current) return;
    return guidedLineChart(canvas.current, {
      labels: rounds.map((r) => `Round ${r}`),
      datasets: departureDatasets(answers, panel),
      yTitle: "z (baseline standard errors)",
      guides: DEPARTURE_GUIDES,
    });
  }, [rounds, answers, panel]);
  return (
    <figure className="chart-figure">
      <div className="chart-box" data-chart="departure">
        <canvas ref={canvas} role="img" aria-label="Each answer's z against the baseline across rounds, with guides at plus and minus 1.28 and 1.96" />
      </div>
      <figcaption className="muted small">
        z = (answer − baseline) / baseline standard error at the horizon. Each pseudonym has its own marker shape and line pattern; the panel figure is the
        thick black line. Beyond the dotted guides an answer lies outside the baseline&apos;s 80% interval; beyond the dashed ones, outside its 95% interval.
      </figcaption>
    </figure>
  );
}
