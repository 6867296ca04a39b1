/**
 * Plain warnings about a question's two legs (issue 12, item 1): the baseline's forecast or the
 * corrected panel figure outside the question's plausible range, and the two differing by a
 * factor of 10 or more (an order of magnitude: the usual sign that the baseline answers another
 * quantity than the question, e.g. one month instead of a year's total). Shown on the question
 * page, in the report's cautions and in the triangulation API.
 */
import { formatNumber } from "@/lib/ui/format";

/** Factor between the legs from which they are said to differ by an order of magnitude. */
export const MAGNITUDE_FACTOR = 10;

export function legWarnings(
  question: { readonly lowerBound: number; readonly upperBound: number; readonly unit: string },
  baseline: { readonly mean: number | null; readonly label: string } | null,
  panelFigure: number | null,
): string[] {
  const out: string[] = [];
  const range = `${formatNumber(question.lowerBound, 8)} to ${formatNumber(question.upperBound, 8)} ${question.unit}`;
  const outside = (v: number) => v < question.lowerBound || v > question.upperBound;
  const b = baseline?.mean ?? null;
  if (b !== null && Number.isFinite(b) && outside(b)) {
    out.push(`The baseline's forecast (${formatNumber(b)} ${question.unit}, the ${baseline!.label}) lies outside the question's plausible range, ${range}: check the history's period and what the baseline answers.`);
  }
  if (panelFigure !== null && Number.isFinite(panelFigure) && outside(panelFigure)) {
    out.push(`The corrected panel figure (${formatNumber(panelFigure)} ${question.unit}) lies outside the question's plausible range, ${range}.`);
  }
  if (b !== null && panelFigure !== null && b > 0 && panelFigure > 0) {
    const ratio = Math.max(b, panelFigure) / Math.min(b, panelFigure);
    if (ratio >= MAGNITUDE_FACTOR) {
      out.push(
        `The panel figure (${formatNumber(panelFigure)}) and the baseline (${formatNumber(b)}, the ${baseline!.label}) differ by a factor of ${formatNumber(ratio, 3)}: an order of magnitude. Check that both answer the same quantity.`,
      );
    }
  }
  return out;
}
