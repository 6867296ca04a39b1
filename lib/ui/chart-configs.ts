/**
 * chart.js configurations of the charts, as pure functions of the figures they draw (no canvas, no
 * registration), so that what a chart shows — datasets, styles, axis ranges, legends — is
 * unit-tested. The components in lib/ui register chart.js and pass these to `new Chart`.
 */
import type { ChartConfiguration, ChartDataset } from "chart.js";
import { legendOptions, lineStyle, OKABE_ITO, PROPORTIONAL_NOTE, proportionalRange } from "./chart-style";

export interface ConvergencePoint {
  readonly round: number;
  /** The panel figure of the round: the median, or the total of a sum-of-parts question. */
  readonly median: number | null;
  /** Quartiles; null draws no band (sum-of-parts questions). */
  readonly q1: number | null;
  readonly q3: number | null;
}

/** Fill and edge of interquartile bars (Okabe & Ito sky blue). */
const IQR_FILL = "rgba(86, 180, 233, 0.35)";

/**
 * The convergence chart: each round's interquartile range (Q1–Q3) as a bar from Q1 to Q3 — a bar,
 * not a band between rounds, so that one round shows it too — and the median (or the total of the
 * parts) as a line with markers over it. The y axis follows `proportionalRange`, said in its title.
 */
export function convergenceConfig(points: readonly ConvergencePoint[], unit: string, label = "Median"): ChartConfiguration<"line" | "bar", (number | null | [number, number])[], string> {
  const hasBand = points.some((p) => p.q1 !== null && p.q3 !== null);
  const iqr: ChartDataset<"bar", ([number, number] | null)[]> = {
    type: "bar",
    label: "Interquartile range (Q1–Q3)",
    data: points.map((p) => (p.q1 === null || p.q3 === null ? null : [p.q1, p.q3])),
    backgroundColor: IQR_FILL,
    borderColor: OKABE_ITO.skyBlue,
    borderWidth: 1,
    borderSkipped: false,
    pointStyle: "rect",
    barPercentage: 0.5,
    maxBarThickness: 56,
    categoryPercentage: 0.9,
    order: 2,
  };
  const median: ChartDataset<"line", (number | null)[]> = {
    type: "line",
    label,
    data: points.map((p) => p.median),
    ...lineStyle(0),
    borderColor: OKABE_ITO.black,
    backgroundColor: OKABE_ITO.black,
    pointRadius: 5,
    order: 1,
  };
  const range = proportionalRange(points.flatMap((p) => [p.median, p.q1, p.q3]));
  return {
    type: "line",
    data: {
      labels: points.map((p) => `Round ${p.round}`),
      datasets: [...(hasBand ? [iqr] : []), median] as ChartDataset<"line" | "bar", (number | null | [number, number])[]>[],
    },
    options: {
      responsive: true,
      maintainAspectRatio: false,
      animation: false,
      scales: {
        x: { offset: true },
        y: { beginAtZero: false, ...range, title: { display: true, text: `${unit} (${PROPORTIONAL_NOTE})` } },
      },
      plugins: {
        legend: legendOptions(),
        tooltip: { mode: "index", intersect: false },
      },
    },
  };
}

/** A note under the convergence chart when it has one round only; null otherwise. */
export function oneRoundNote(rounds: number, band: boolean): string | null {
  if (rounds !== 1) return null;
  return `One round so far${band ? ": the bar is its interquartile range" : ""}. Convergence can be judged from the second round on.`;
}

export interface DepartureSeries {
  readonly label: string;
  /** z per round, aligned with the rounds (null: no answer that round). */
  readonly z: readonly (number | null)[];
}

/**
 * The departure chart's guides: z of the baseline's own 80% and 95% bounds under its normal
 * predictive distribution, Φ⁻¹(0.90) = 1.2816 and Φ⁻¹(0.975) = 1.9600.
 */
export const DEPARTURE_GUIDES = [
  { y: 1.96, label: "+1.96 (95%)", dash: [6, 3] },
  { y: -1.96, label: "−1.96 (95%)", dash: [6, 3] },
  { y: 1.2816, label: "+1.28 (80%)", dash: [2, 3] },
  { y: -1.2816, label: "−1.28 (80%)", dash: [2, 3] },
] as const;

/**
 * The departure chart's lines: one per pseudonym, each with its own colour, marker shape and dash
 * (`seriesStyle` 1, 2, …), and the panel figure as a heavier solid black line with large circles
 * (style 0's shape and dash, so up to seven pseudonyms never share a shape or a dash with it).
 */
export function departureDatasets(answers: readonly DepartureSeries[], panel: readonly (number | null)[]): ChartDataset<"line", (number | null)[]>[] {
  return [
    ...answers.map((a, i) => ({ label: a.label, data: [...a.z], ...lineStyle(i + 1, 1.5) })),
    {
      label: "Panel figure",
      data: [...panel],
      ...lineStyle(0, 3.5),
      borderColor: OKABE_ITO.black,
      backgroundColor: OKABE_ITO.black,
      pointRadius: 6,
    },
  ];
}

/** The tracking-signal chart's lines: one style per figure (`seriesStyle`). */
export function signalDatasets(series: readonly { label: string; values: readonly (number | null)[] }[]): ChartDataset<"line", (number | null)[]>[] {
  return series.map((s, i) => ({ label: s.label, data: [...s.values], ...lineStyle(i) }));
}
