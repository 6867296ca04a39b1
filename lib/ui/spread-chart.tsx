"use client";
/**
 * Spread of one closed round's answers on a number line: a histogram of the answers (the
 * group's bins, lib/stats `histogram`), the interquartile range as a shaded box, the median as a
 * line, and the viewer's own answer as a diamond. The chart receives the bins and figures only:
 * no single answer, name, id or pseudonym reaches it.
 */
import { useEffect, useRef } from "react";
import { Chart, ScatterController, PointElement, LinearScale, Tooltip, Legend, type Plugin } from "chart.js";
import type { HistogramBin } from "@/lib/stats/histogram";
import { legendOptions, OKABE_ITO } from "./chart-style";
import { formatNumber } from "./format";

Chart.register(ScatterController, PointElement, LinearScale, Tooltip, Legend);

export interface SpreadChartProps {
  /** The round's answers as histogram bins (own answer included). */
  readonly bins: readonly HistogramBin[];
  /** The viewer's own answer, if they answered that round. */
  readonly own: number | null;
  /** Quartiles and median; null draws no box (sum-of-parts: the parts differ by design). */
  readonly q1: number | null;
  readonly median: number | null;
  readonly q3: number | null;
  readonly unit: string;
}

export default function SpreadChart({ bins, own, q1, median, q3, unit }: SpreadChartProps) {
  const canvas = useRef<HTMLCanvasElement>(null);
  const answers = bins.reduce((n, b) => n + b.count, 0);
  useEffect(() => {
    if (!canvas.current) return;
    const maxY = Math.max(1, ...bins.map((b) => b.count)) * 1.2;
    const ownBin = own === null ? undefined : bins.find((b) => own >= b.lower && own <= b.upper);
    const ownHeight = ownBin ? ownBin.count + maxY * 0.08 : maxY * 0.5;
    const box: Plugin<"scatter"> = {
      id: "iqr-box",
      beforeDatasetsDraw(chart) {
        const { ctx, chartArea, scales } = chart;
        ctx.save();
        ctx.fillStyle = "rgba(29, 35, 43, 0.45)";
        for (const b of bins) {
          const x0 = scales.x.getPixelForValue(b.lower);
          const x1 = scales.x.getPixelForValue(b.upper);
          const top = scales.y.getPixelForValue(b.count);
          const w = Math.max(4, x1 - x0 - 1);
          ctx.fillRect(x1 - x0 < 4 ? x0 - 2 : x0, top, w, scales.y.getPixelForValue(0) - top);
        }
        ctx.restore();
        if (q1 === null || q3 === null || median === null) return;
        const x1 = scales.x.getPixelForValue(q1);
        const x3 = scales.x.getPixelForValue(q3);
        const xm = scales.x.getPixelForValue(median);
        ctx.save();
        ctx.fillStyle = "rgba(86, 180, 233, 0.3)";
        ctx.fillRect(x1, chartArea.top, Math.max(1, x3 - x1), chartArea.bottom - chartArea.top);
        ctx.strokeStyle = "#1d232b";
        ctx.lineWidth = 2;
        ctx.beginPath();
        ctx.moveTo(xm, chartArea.top);
        ctx.lineTo(xm, chartArea.bottom);
        ctx.stroke();
        ctx.restore();
      },
    };
    const all = [...bins.flatMap((b) => [b.lower, b.upper]), ...(q1 === null || q3 === null ? [] : [q1, q3])];
    const lo = Math.min(...all);
    const hi = Math.max(...all);
    const pad = hi > lo ? (hi - lo) * 0.08 : Math.max(1, Math.abs(hi) * 0.1);
    const chart = new Chart(canvas.current, {
      type: "scatter",
      data: {
        datasets: [
          ...(own === null
            ? [{ label: "Panel answers", data: [] as { x: number; y: number }[] }]
            : [
                {
                  label: "Your answer",
                  data: [{ x: own, y: ownHeight }],
                  backgroundColor: OKABE_ITO.vermillion,
                  borderColor: OKABE_ITO.black,
                  pointStyle: "rectRot" as const,
                  pointRadius: 9,
                },
              ]),
        ],
      },
      options: {
        responsive: true,
        maintainAspectRatio: false,
        animation: false,
        scales: {
          x: { suggestedMin: lo - pad, suggestedMax: hi + pad, title: { display: true, text: unit } },
          y: { display: false, min: 0, max: maxY },
        },
        plugins: {
          legend: legendOptions(),
          tooltip: { callbacks: { label: (item) => `${item.dataset.label}: ${formatNumber(item.parsed.x)}` } },
        },
      },
      plugins: [box],
    });
    return () => chart.destroy();
  }, [bins, own, q1, median, q3, unit]);
  return (
    <div className="chart-box chart-box-short" data-chart="spread" data-answers={answers} data-own={own ?? ""}>
      <canvas
        ref={canvas}
        role="img"
        aria-label={`Histogram of the panel's ${answers} answers in ${unit}${q1 === null ? "" : ": shaded box from Q1 to Q3, line at the median"}${own === null ? "" : ", diamond at your answer"}`}
      />
    </div>
  );
}
