"use client";
/**
 * Tracking signal of each figure (raw panel, corrected panel, baseline, blend) after each
 * resolved question, with the ±4 limits that common practice uses to flag a biased forecast
 * (no authoritative source; stated on the page). The values come from lib/blend
 * `accuracyHistory`; the chart only draws them.
 */
import { useEffect, useRef } from "react";
import { resizeForPrint } from "./chart-print";
import { guidesPlugin, guideRange } from "./chart-guides";
import { Chart, LineController, LineElement, PointElement, LinearScale, CategoryScale, Tooltip, Legend } from "chart.js";

Chart.register(LineController, LineElement, PointElement, LinearScale, CategoryScale, Tooltip, Legend);

export interface SignalSeries {
  readonly label: string;
  readonly values: readonly (number | null)[];
}

const STYLE = [
  { color: "#96a1ad", dash: [4, 3] },
  { color: "#1d232b", dash: [] },
  { color: "#2f6b3a", dash: [8, 3] },
  { color: "#8a4b14", dash: [] },
];

export default function TrackingSignalChart({ labels, series, limit }: { labels: readonly string[]; series: readonly SignalSeries[]; limit: number }) {
  const canvas = useRef<HTMLCanvasElement>(null);
  useEffect(() => {
    if (!canvas.current) return;
    const guides = [
      { y: limit, label: `+${limit} (common practice)`, dash: [6, 3] },
      { y: -limit, label: `−${limit}`, dash: [6, 3] },
    ];
    const range = guideRange(series.flatMap((s) => s.values), guides);
    const chart = new Chart(canvas.current, {
      type: "line",
      data: {
        labels: [...labels],
        datasets: [
          ...series.map((s, i) => ({
            label: s.label,
            data: [...s.values],
            borderColor: STYLE[i % STYLE.length].color,
            backgroundColor: STYLE[i % STYLE.length].color,
            borderDash: STYLE[i % STYLE.length].dash,
            borderWidth: 2,
            pointRadius: 3,
            fill: false,
          })),
        ],
      },
      options: {
        responsive: true,
        maintainAspectRatio: false,
        animation: false,
        scales: { x: { offset: true }, y: { ...range, title: { display: true, text: "tracking signal (cumulative error / MAD)" } } },
        plugins: { tooltip: { mode: "index", intersect: false } },
      },
      plugins: [guidesPlugin(guides)],
    });
    const unprint = resizeForPrint(chart);
    return () => {
      unprint();
      chart.destroy();
    };
  }, [labels, series, limit]);
  return (
    <div className="chart-box" data-chart="tracking-signal">
      <canvas ref={canvas} role="img" aria-label={`Tracking signal of each figure after each resolved question, with limits at plus and minus ${limit}`} />
    </div>
  );
}
