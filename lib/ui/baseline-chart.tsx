"use client";
/**
 * Baseline chart: the history as read (or as scaled for an analogous product), the method's
 * one-step fitted values, and the forecast fan — the point forecast with its 80% and 95%
 * prediction intervals shaded — for the steps up to the target period. Without a forecast it
 * is the preview of what was read. The figures come from lib/forecast (via the stored baseline);
 * the chart only draws them, and a table beside it carries the same numbers.
 */
import { useEffect, useRef } from "react";
import { resizeForPrint } from "./chart-print";
import { legendOptions, OKABE_ITO, PROPORTIONAL_NOTE, proportionalRange } from "./chart-style";
import { Chart, LineController, LineElement, PointElement, LinearScale, CategoryScale, Filler, Tooltip, Legend } from "chart.js";

Chart.register(LineController, LineElement, PointElement, LinearScale, CategoryScale, Filler, Tooltip, Legend);

export interface BaselineChartStep {
  readonly step: number;
  readonly mean: number | null;
  readonly lower80: number | null;
  readonly upper80: number | null;
  readonly lower95: number | null;
  readonly upper95: number | null;
}

export interface BaselineChartProps {
  /** Row labels of the history (CSV row numbers or positions). */
  readonly labels: readonly string[];
  /** The history's values (null: missing). */
  readonly history: readonly (number | null)[];
  /** One-step fitted values aligned with the history's end (optional). */
  readonly fitted?: readonly (number | null)[];
  /** Forecast steps 1…h (optional). */
  readonly forecast?: readonly BaselineChartStep[];
  readonly unit: string;
  /** Marks the target period's step. */
  readonly targetStep?: number;
  readonly caption: string;
  /** A launch baseline: no history of its own, steps are periods after launch. */
  readonly launch?: boolean;
  /** Legend of the fitted values (default: one-step fitted values). */
  readonly fittedLabel?: string;
}

export default function BaselineChart({ labels, history, fitted = [], forecast = [], unit, targetStep, caption, launch = false, fittedLabel = "Fitted (one step ahead)" }: BaselineChartProps) {
  const canvas = useRef<HTMLCanvasElement>(null);
  useEffect(() => {
    if (!canvas.current) return;
    const n = history.length;
    const h = forecast.length;
    const stepLabel = (step: number) => (launch ? `${step}` : `+${step}`);
    const allLabels = [...labels, ...forecast.map((s) => (s.step === targetStep ? `${stepLabel(s.step)} (target)` : stepLabel(s.step)))];
    const pad = (values: readonly (number | null)[], before: number, after: number) => [
      ...Array<number | null>(before).fill(null),
      ...values,
      ...Array<number | null>(after).fill(null),
    ];
    // Fitted values are aligned with the end of the history (the prepared series may drop leading gaps).
    const fit = fitted.length > 0 ? pad(fitted.slice(-n), Math.max(0, n - fitted.length), h) : [];
    // The fan starts at the last observation so that it joins the history (a launch has none).
    const last = history[n - 1] ?? null;
    const fan = (pick: (s: BaselineChartStep) => number | null) =>
      h === 0 ? [] : n === 0 ? forecast.map(pick) : [...Array<number | null>(n - 1).fill(null), last, ...forecast.map(pick)];
    const chart = new Chart(canvas.current, {
      type: "line",
      data: {
        labels: allLabels,
        datasets: [
          ...(h > 0
            ? [
                { label: "95% lower", data: fan((s) => s.lower95), borderColor: "rgba(230, 159, 0, 0.4)", pointRadius: 0, borderWidth: 1, fill: false },
                {
                  label: "95% interval",
                  data: fan((s) => s.upper95),
                  borderColor: "rgba(230, 159, 0, 0.4)",
                  backgroundColor: "rgba(230, 159, 0, 0.15)",
                  pointStyle: "rect" as const,
                  pointRadius: 0,
                  borderWidth: 1,
                  fill: "-1" as const,
                },
                { label: "80% lower", data: fan((s) => s.lower80), borderColor: "rgba(230, 159, 0, 0.7)", pointRadius: 0, borderWidth: 1, fill: false },
                {
                  label: "80% interval",
                  data: fan((s) => s.upper80),
                  borderColor: "rgba(230, 159, 0, 0.7)",
                  backgroundColor: "rgba(230, 159, 0, 0.35)",
                  pointStyle: "rect" as const,
                  pointRadius: 0,
                  borderWidth: 1,
                  fill: "-1" as const,
                },
                { label: "Forecast", data: fan((s) => s.mean), borderColor: OKABE_ITO.vermillion, backgroundColor: OKABE_ITO.vermillion, borderDash: [8, 4], pointStyle: "triangle" as const, borderWidth: 2, pointRadius: 4, fill: false },
              ]
            : []),
          ...(fit.length > 0
            ? [{ label: fittedLabel, data: fit, borderColor: OKABE_ITO.blue, backgroundColor: OKABE_ITO.blue, borderDash: [2, 3], pointStyle: "line" as const, borderWidth: 1.5, pointRadius: 0, fill: false }]
            : []),
          ...(n > 0 ? [{ label: "History", data: pad(history, 0, h), borderColor: OKABE_ITO.black, backgroundColor: OKABE_ITO.black, pointStyle: "circle" as const, borderWidth: 2, pointRadius: 2.5, fill: false }] : []),
        ],
      },
      options: {
        responsive: true,
        maintainAspectRatio: false,
        animation: false,
        spanGaps: false,
        scales: { y: { ...proportionalRange([...history, ...fitted, ...forecast.flatMap((s) => [s.mean, s.lower95, s.upper95])]), title: { display: true, text: `${unit} (${PROPORTIONAL_NOTE})` } }, x: { title: { display: true, text: launch ? "period after launch" : "row / steps after the last observation" } } },
        plugins: {
          legend: legendOptions((text) => !text.endsWith("lower")),
          tooltip: { mode: "index", intersect: false },
        },
      },
    });
    const unprint = resizeForPrint(chart);
    return () => {
      unprint();
      chart.destroy();
    };
  }, [labels, history, fitted, forecast, unit, targetStep, launch, fittedLabel]);
  return (
    <figure className="chart-figure">
      <div className="chart-box" data-chart="baseline" data-points={history.length} data-steps={forecast.length}>
        <canvas ref={canvas} role="img" aria-label={caption} />
      </div>
      <figcaption className="muted small">{caption}</figcaption>
    </figure>
  );
}
