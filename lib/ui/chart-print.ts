/**
 * Redraws a chart.js chart at the size the print stylesheet gives its box when the page is
 * printed, and back afterwards (chart.js sizes canvases for the screen; see its
 * "Printing resizable charts" note). Returns the clean-up for a React effect.
 */
import type { Chart } from "chart.js";

export function resizeForPrint(chart: Chart): () => void {
  const resize = () => chart.resize();
  window.addEventListener("beforeprint", resize);
  window.addEventListener("afterprint", resize);
  return () => {
    window.removeEventListener("beforeprint", resize);
    window.removeEventListener("afterprint", resize);
  };
}
