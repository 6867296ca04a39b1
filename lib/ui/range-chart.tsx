"use client";
/**
 * Ranges side by side: for each figure (raw panel, corrected panel, baseline, blend) its 95%
 * and 80% ranges as horizontal bars and the figure itself as a mark. The ranges come from the
 * report read model (lib/triangulation/report.ts); the chart only draws them.
 */
import { useEffect, useRef } from "react";
import { resizeForPrint } from "./chart-print";
import { legendOptions, OKABE_ITO, PROPORTIONAL_NOTE, proportionalRange } from "./chart-style";
import { Chart, BarController, BarElement, LinearScale, CategoryScale, Tooltip, Legend, type Plugin } from "chart.js";

Chart.register(BarController, BarElement, LinearScale, CategoryScale, Tooltip, Legend);

export interface RangeRow {
  readonly label: string;
  readonly figure: number | null;
  readonly lower80: number | null;
  readonly upper80: number | null;
  readonly lower95: number | null;
  readonly upper95: number | null;
}

export default function RangeChart({ rows, unit, actual }: { rows: readonly RangeRow[]; unit: string; actual?: number | null }) {
  const canvas = useRef<HTMLCanvasElement>(null);
  useEffect(() => {
    if (!canvas.current) return;
    const bar = (lo: number | null, hi: number | null): [number, number] | null => (lo === null || hi === null ? null : [lo, hi]);
    const marks: Plugin<"bar"> = {
      id: "figure-marks",
      afterDatasetsDraw(chart) {
        const { ctx, scales, chartArea } = chart;
        ctx.save();
        rows.forEach((r, i) => {
          if (r.figure === null) return;
          const x = scales.x.getPixelForValue(r.figure);
          const y = scales.y.getPixelForValue(i);
          ctx.strokeStyle = "#1d232b";
          ctx.lineWidth = 3;
          ctx.beginPath();
          ctx.moveTo(x, y - 11);
          ctx.lineTo(x, y + 11);
          ctx.stroke();
        });
        if (actual !== undefined && actual !== null) {
          const x = scales.x.getPixelForValue(actual);
          ctx.strokeStyle = OKABE_ITO.bluishGreen;
          ctx.setLineDash([5, 3]);
          ctx.lineWidth = 2;
          ctx.beginPath();
          ctx.moveTo(x, chartArea.top);
          ctx.lineTo(x, chartArea.bottom);
          ctx.stroke();
        }
        ctx.restore();
      },
    };
    const ends = rows.flatMap((r) => [r.lower95, r.upper95, r.lower80, r.upper80, r.figure]).concat(actual ?? null).filter((v): v is number => v !== null);
    const span = proportionalRange(ends);
    const chart = new Chart(canvas.current, {
      type: "bar",
      data: {
        labels: rows.map((r) => r.label),
        datasets: [
          { label: "95% range", data: rows.map((r) => bar(r.lower95, r.upper95)), backgroundColor: "rgba(86, 180, 233, 0.3)", pointStyle: "rect" as const, grouped: false, barPercentage: 0.7 },
          { label: "80% range", data: rows.map((r) => bar(r.lower80, r.upper80)), backgroundColor: "rgba(0, 114, 178, 0.75)", pointStyle: "rect" as const, grouped: false, barPercentage: 0.4 },
        ],
      },
      options: {
        indexAxis: "y",
        responsive: true,
        maintainAspectRatio: false,
        animation: false,
        scales: { x: { beginAtZero: false, ...span, title: { display: true, text: `${unit} (${PROPORTIONAL_NOTE})` } } },
        plugins: { legend: { display: true, ...legendOptions() } },
      },
      plugins: [marks],
    });
    const unprint = resizeForPrint(chart);
    return () => {
      unprint();
      chart.destroy();
    };
  }, [rows, unit, actual]);
  return (
    <figure className="chart-figure">
      <div className="chart-box chart-box-short" data-chart="ranges">
        <canvas ref={canvas} role="img" aria-label={`80% and 95% ranges of each figure in ${unit}; the black mark is the figure itself`} />
      </div>
      <figcaption className="muted small">
        Each bar is a range (wide and pale: 95%, narrow and dark: 80%); the black mark is the figure{actual !== undefined && actual !== null ? "; the dashed green line is the outcome" : ""}.
      </figcaption>
    </figure>
  );
}
