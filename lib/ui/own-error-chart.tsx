"use client";
/**
 * A panelist's errors over time (the "Your record" page): (answer − outcome)/outcome in percent
 * for each recorded outcome, in the order the outcomes were recorded, with a line at 0 (no error).
 * The values come from lib/triangulation/own-record.ts; the chart only draws them.
 */
import { useEffect, useRef } from "react";
import { guidedLineChart } from "./chart-guides";

export default function OwnErrorChart({ labels, values }: { labels: readonly string[]; values: readonly number[] }) {
  const canvas = useRef<HTMLCanvasElement>(null);
  useEffect(() => {
    if (!canvas.current) return;
    return guidedLineChart(canvas.current, {
      labels,
      datasets: [{ label: "your answer vs the outcome (%)", data: [...values], borderColor: "#1d232b", backgroundColor: "#1d232b", borderWidth: 2, pointRadius: 3, fill: false }],
      yTitle: "% above (+) or below (−) the outcome",
      guides: [{ y: 0, label: "on the outcome", dash: [6, 3] }],
    });
  }, [labels, values]);
  return (
    <div className="chart-box" data-chart="own-errors">
      <canvas ref={canvas} role="img" aria-label="Your answers above or below the outcome, in percent, one point per recorded outcome in the order recorded" />
    </div>
  );
}
