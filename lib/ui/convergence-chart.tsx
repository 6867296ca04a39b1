"use client";
/**
 * Convergence chart: the panel median across rounds, with the interquartile band (Q1–Q3)
 * shaded behind it. Figures come from the stored round statistics (lib/stats, Hyndman & Fan
 * type 7 quartiles); the chart only draws them. A table beside it carries the same numbers.
 */
import { useEffect, useRef } from "react";
import { resizeForPrint } from "./chart-print";
import {
  Chart,
  LineController,
  LineElement,
  PointElement,
  LinearScale,
  CategoryScale,
  Filler,
  Tooltip,
  Legend,
} from "chart.js";

Chart.register(LineController, LineElement, PointElement, LinearScale, CategoryScale, Filler, Tooltip, Legend);

export interface ConvergencePoint {
  readonly round: number;
  /** The panel figure of the round: the median, or the total of a sum-of-parts question. */
  readonly median: number | null;
  /** Quartiles; null draws no band (sum-of-parts questions). */
  readonly q1: number | null;
  readonly q3: number | null;
}

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
  useEffect(() => {
    if (!canvas.current) return;
    const labels = points.map((p) => `Round ${p.round}`);
    const band = points.some((p) => p.q1 !== null && p.q3 !== null);
    const chart = new Chart(canvas.current, {
      type: "line",
      data: {
        labels,
        datasets: [
          ...(band ? [
          {
            label: "Q1",
            data: points.map((p) => p.q1),
            borderColor: "rgba(138, 75, 20, 0.35)",
            borderDash: [4, 4],
            // With one round there is no band to shade: show the quartiles as points instead.
            pointRadius: points.length === 1 ? 4 : 0,
            pointStyle: "line" as const,
            fill: false,
          },
          {
            label: "Interquartile range (Q1–Q3)",
            data: points.map((p) => p.q3),
            borderColor: "rgba(138, 75, 20, 0.35)",
            borderDash: [4, 4],
            backgroundColor: "rgba(138, 75, 20, 0.15)",
            pointRadius: points.length === 1 ? 4 : 0,
            pointStyle: "line" as const,
            fill: "-1" as const,
          },
          ] : []),
          {
            label,
            data: points.map((p) => p.median),
            borderColor: "#1d232b",
            backgroundColor: "#1d232b",
            pointRadius: 4,
            borderWidth: 2,
            fill: false,
          },
        ],
      },
      options: {
        responsive: true,
        maintainAspectRatio: false,
        animation: false,
        scales: {
          x: { offset: true },
          y: { title: { display: true, text: unit } },
        },
        plugins: {
          legend: { labels: { filter: (item) => item.text !== "Q1" } },
          tooltip: { mode: "index", intersect: false },
        },
      },
    });
    const unprint = resizeForPrint(chart);
    return () => {
      unprint();
      chart.destroy();
    };
  }, [points, unit, label]);
  return (
    <div className="chart-box">
      <canvas ref={canvas} role="img" aria-label={`${label} and interquartile range across rounds, in ${unit}`} />
    </div>
  );
}
