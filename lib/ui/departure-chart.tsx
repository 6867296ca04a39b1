"use client";
/**
 * Departure chart: each answer's z (difference from the baseline in baseline standard errors)
 * across rounds, one line per pseudonym, and the panel figure's z as a heavier line; dashed
 * guides at ±1.28 and ±1.96, the z of the baseline's own 80% and 95% bounds under its normal
 * predictive distribution (Φ⁻¹(0.90) = 1.2816, Φ⁻¹(0.975) = 1.9600). The z values come from
 * lib/blend `departure`; the chart only draws them.
 */
import { useEffect, useRef } from "react";
import { guidedLineChart } from "./chart-guides";

export interface DepartureSeries {
  readonly label: string;
  /** z per round, aligned with `rounds` (null: no answer that round). */
  readonly z: readonly (number | null)[];
}

const GREYS = ["#5b6673", "#7a8794", "#3f4954", "#96a1ad", "#2b333c", "#6b7785"];

export default function DepartureChart({ rounds, answers, panel }: { rounds: readonly number[]; answers: readonly DepartureSeries[]; panel: readonly (number | null)[] }) {
  const canvas = useRef<HTMLCanvasElement>(null);
  useEffect(() => {
    if (!canvas.current) return;
    const guides = [
      { y: 1.96, label: "+1.96 (95%)", dash: [6, 3] },
      { y: -1.96, label: "−1.96 (95%)", dash: [6, 3] },
      { y: 1.2816, label: "+1.28 (80%)", dash: [2, 3] },
      { y: -1.2816, label: "−1.28 (80%)", dash: [2, 3] },
    ];
    return guidedLineChart(canvas.current, {
      labels: rounds.map((r) => `Round ${r}`),
      datasets: [
        ...answers.map((a, i) => ({
          label: a.label,
          data: [...a.z],
          borderColor: GREYS[i % GREYS.length],
          backgroundColor: GREYS[i % GREYS.length],
          borderWidth: 1,
          pointRadius: 3,
          fill: false,
        })),
        { label: "Panel figure", data: [...panel], borderColor: "#8a4b14", backgroundColor: "#8a4b14", borderWidth: 3, pointRadius: 5, fill: false },
      ],
      yTitle: "z (baseline standard errors)",
      guides,
    });
  }, [rounds, answers, panel]);
  return (
    <figure className="chart-figure">
      <div className="chart-box" data-chart="departure">
        <canvas ref={canvas} role="img" aria-label="Each answer's z against the baseline across rounds, with guides at plus and minus 1.28 and 1.96" />
      </div>
      <figcaption className="muted small">
        z = (answer − baseline) / baseline standard error at the horizon. Beyond the dotted guides an answer lies outside the baseline&apos;s 80% interval;
        beyond the dashed ones, outside its 95% interval.
      </figcaption>
    </figure>
  );
}
