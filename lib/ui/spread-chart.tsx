"use client";
/**
 * Spread of one closed round's answers on a number line: each anonymous answer is a dot
 * (equal answers are stacked), the interquartile range is a shaded box, the median a line,
 * and the viewer's own answer a larger diamond. The chart receives bare numbers only: no
 * names, ids or pseudonyms ever reach it.
 */
import { useEffect, useRef } from "react";
import { Chart, ScatterController, PointElement, LinearScale, Tooltip, Legend, type Plugin } from "chart.js";

Chart.register(ScatterController, PointElement, LinearScale, Tooltip, Legend);

export interface SpreadChartProps {
  /** Every answer of the round, own included, in any order. */
  readonly values: readonly number[];
  /** The viewer's own answer, if they answered that round. */
  readonly own: number | null;
  /** Quartiles and median; null draws no box (sum-of-parts: the parts differ by design). */
  readonly q1: number | null;
  readonly median: number | null;
  readonly q3: number | null;
  readonly unit: string;
}

/** Stacks equal values: the k-th occurrence of a value is drawn at height k. */
function stack(values: readonly number[]): { x: number; y: number }[] {
  const seen = new Map<number, number>();
  return [...values]
    .sort((a, b) => a - b)
    .map((x) => {
      const k = (seen.get(x) ?? 0) + 1;
      seen.set(x, k);
      return { x, y: k };
    });
}

export default function SpreadChart({ values, own, q1, median, q3, unit }: SpreadChartProps) {
  const canvas = useRef<HTMLCanvasElement>(null);
  useEffect(() => {
    if (!canvas.current) return;
    const others = [...values];
    if (own !== null) {
      const i = others.indexOf(own);
      if (i >= 0) others.splice(i, 1);
    }
    const dots = stack(others);
    const ownHeight = own === null ? 0 : dots.filter((d) => d.x === own).length + 1;
    const maxY = Math.max(2, ...dots.map((d) => d.y), ownHeight) + 1;
    const box: Plugin<"scatter"> = {
      id: "iqr-box",
      beforeDatasetsDraw(chart) {
        if (q1 === null || q3 === null || median === null) return;
        const { ctx, chartArea, scales } = chart;
        const x1 = scales.x.getPixelForValue(q1);
        const x3 = scales.x.getPixelForValue(q3);
        const xm = scales.x.getPixelForValue(median);
        ctx.save();
        ctx.fillStyle = "rgba(138, 75, 20, 0.15)";
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
    const all = [...values, ...(q1 === null || q3 === null ? [] : [q1, q3])];
    const lo = Math.min(...all);
    const hi = Math.max(...all);
    const pad = hi > lo ? (hi - lo) * 0.08 : Math.max(1, Math.abs(hi) * 0.1);
    const chart = new Chart(canvas.current, {
      type: "scatter",
      data: {
        datasets: [
          {
            label: "Panel answers",
            data: dots,
            backgroundColor: "rgba(29, 35, 43, 0.55)",
            pointRadius: 5,
          },
          ...(own === null
            ? []
            : [
                {
                  label: "Your answer",
                  data: [{ x: own, y: ownHeight }],
                  backgroundColor: "#8a4b14",
                  borderColor: "#1d232b",
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
          tooltip: { callbacks: { label: (item) => `${item.dataset.label}: ${item.parsed.x}` } },
        },
      },
      plugins: [box],
    });
    return () => chart.destroy();
  }, [values, own, q1, median, q3, unit]);
  return (
    <div className="chart-box chart-box-short" data-chart="spread" data-answers={values.length} data-own={own ?? ""}>
      <canvas
        ref={canvas}
        role="img"
        aria-label={`Spread of the panel's answers in ${unit}${q1 === null ? "" : ": shaded box from Q1 to Q3, line at the median"}${own === null ? "" : ", diamond at your answer"}`}
      />
    </div>
  );
}
