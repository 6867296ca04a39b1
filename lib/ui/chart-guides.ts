/**
 * A chart.js plugin that draws horizontal guide lines (e.g. z = ±1.96, tracking signal ±4)
 * across the whole plot area, whatever the number of categories (a one-round chart included),
 * with a small label at one end (neighbouring guides alternate ends, `guideLabelSides`, so their
 * labels never overlap). Pair it with `guideRange` so the y axis shows them;
 * `guidedLineChart` does both.
 */
import { Chart, CategoryScale, Legend, LinearScale, LineController, LineElement, PointElement, Tooltip, type ChartDataset, type Plugin } from "chart.js";
import { resizeForPrint } from "./chart-print";
import { guideLabelSides, legendOptions } from "./chart-style";

Chart.register(LineController, LineElement, PointElement, LinearScale, CategoryScale, Tooltip, Legend);

export interface Guide {
  readonly y: number;
  readonly label: string;
  readonly dash: readonly number[];
}

export function guidesPlugin(guides: readonly Guide[], color = "rgba(60, 60, 60, 0.85)"): Plugin {
  return {
    id: "horizontal-guides",
    afterDatasetsDraw(chart) {
      const { ctx, chartArea, scales } = chart;
      const y = scales.y;
      if (!y) return;
      ctx.save();
      ctx.strokeStyle = color;
      ctx.fillStyle = color;
      ctx.lineWidth = 1;
      ctx.font = "11px system-ui, sans-serif";
      const sides = guideLabelSides(guides.map((g) => g.y));
      guides.forEach((g, i) => {
        const py = y.getPixelForValue(g.y);
        if (py < chartArea.top - 1 || py > chartArea.bottom + 1) return;
        ctx.setLineDash([...g.dash]);
        ctx.beginPath();
        ctx.moveTo(chartArea.left, py);
        ctx.lineTo(chartArea.right, py);
        ctx.stroke();
        ctx.textAlign = sides[i];
        ctx.fillText(g.label, sides[i] === "right" ? chartArea.right - 4 : chartArea.left + 4, py - 3);
      });
      ctx.restore();
    },
  };
}

/** Axis bounds that include every value and every guide, with a little room. */
export function guideRange(values: readonly (number | null)[], guides: readonly Guide[]): { suggestedMin: number; suggestedMax: number } {
  const all = [...values.filter((v): v is number => v !== null && Number.isFinite(v)), ...guides.map((g) => g.y)];
  const lo = Math.min(...all);
  const hi = Math.max(...all);
  const pad = (hi - lo) * 0.08 || 1;
  return { suggestedMin: lo - pad, suggestedMax: hi + pad };
}

/**
 * A line chart on `canvas` with one category per label, the given lines, the y axis titled
 * `yTitle` and stretched to show every value and every guide, the guides drawn across, and a
 * tooltip for the whole category; redrawn at print size when printed. Returns the clean-up for a
 * React effect.
 */
export function guidedLineChart(
  canvas: HTMLCanvasElement,
  o: { labels: readonly string[]; datasets: ChartDataset<"line", (number | null)[]>[]; yTitle: string; guides: readonly Guide[] },
): () => void {
  const range = guideRange(o.datasets.flatMap((d) => d.data), o.guides);
  const chart = new Chart(canvas, {
    type: "line",
    data: { labels: [...o.labels], datasets: o.datasets },
    options: {
      responsive: true,
      maintainAspectRatio: false,
      animation: false,
      scales: { x: { offset: true }, y: { ...range, title: { display: true, text: o.yTitle } } },
      plugins: { legend: legendOptions(), tooltip: { mode: "index", intersect: false } },
    },
    plugins: [guidesPlugin(o.guides)],
  });
  const unprint = resizeForPrint(chart);
  return () => {
    unprint();
    chart.destroy();
  };
}
