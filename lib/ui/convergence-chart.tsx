"use client";
/**
 * Convergence chart: the panel median across rounds, with each round's interquartile range
 * (Q1–Q3) as a bar behind it (lib/ui/chart-configs.ts `convergenceConfig`). Figures come from the
 * stored round statistics (lib/stats, Hyndman & Fan type 7 quartiles); the chart only draws them.
 * A table beside it carries the same numbers.
 */
import { useEffect, useRef } from "react";
import { resizeForPrint } from "./chart-print";
import { Chart, BarController, BarElement, LineController, LineElement, PointElement, LinearScale, CategoryScale, Tooltip, Legend, type ChartConfiguration } from "chart.js";
import { convergenceConfig, oneRoundNote, type ConvergencePoint } from "./chart-configs";

Chart.register(BarController, BarElement, LineController, LineElement, PointElement, LinearScale, CategoryScale, Tooltip, Legend);

export type { ConvergencePoint };

export default function ConvergenceChart({
  points,
  unit,
  label = "Median",
}: {
  points: readonly ConvergencePoint[];
  unit: string;
  label?: string;
}) {
  const canvas = useRef<HTMLCanvasElement>(null);
  const band = points.some((p) => p.q1 !== null && p.q3 !== null);
  useEffect(() => {
    if (!canvas.current) return;
    const chart = new Chart(canvas.current, convergenceConfig(points, unit, label) as ChartConfiguration);
    const unprint = resizeForPrint(chart);
    return () => {
      unprint();
      chart.destroy();
    };
  }, [points, unit, label]);
  const note = oneRoundNote(points.length, band);
  return (
    <figure className="chart-figure">
      <div className="chart-box" data-chart="convergence" data-rounds={points.length}>
        <canvas ref={canvas} role="img" aria-label={`${label}${band ? " and interquartile range" : ""} across rounds, in ${unit}`} />
      </div>
      {note ? <figcaption className="muted small">{note}</figcaption> : null}
    </figure>
  );
}
