"use client";
/**
 * Tracking signal of each figure (raw panel, corrected panel, baseline, blend) after each
 * recorded outcome, with the ±4 limits that common practice uses to flag a biased forecast
 * (no authoritative source; stated on the page). The signal is on relative errors
 * (docs/methods.md §8). Each figure has its own colour-blind-safe colour, marker shape and dash
 * (`signalDatasets`). The values come from lib/blend `accuracyHistory`; the chart only draws them.
 */
import { useEffect, useRef } from "react";
import { guidedLineChart } from "./chart-guides";
import { signalDatasets } from "./chart-configs";

export interface SignalSeries {
  readonly label: string;
  readonly values: readonly (number | null)[];
}

export default function TrackingSignalChart({ labels, series, limit }: { labels: readonly string[]; series: readonly SignalSeries[]; limit: number }) {
  const canvas = useRef<HTMLCanvasElement>(null);
  useEffect(() => {
    if (!canvas.current) return;
    const guides = [
      { y: limit, label: `+${limit} (common practice)`, dash: [6, 3] },
      { y: -limit, label: `−${limit}`, dash: [6, 3] },
    ];
    return guidedLineChart(canvas.current, {
      labels,
      datasets: signalDatasets(series),
      yTitle: "tracking signal (cumulative relative error / mean absolute relative error)",
      guides,
    });
  }, [labels, series, limit]);
  return (
    <div className="chart-box" data-chart="tracking-signal">
      <canvas ref={canvas} role="img" aria-label={`Tracking signal of each figure after each recorded outcome, with limits at plus and minus ${limit}`} />
    </div>
  );
}
