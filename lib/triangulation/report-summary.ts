/**
 * The sentence a question's report leads with (issue 15): the figure and its 80% range, the
 * outcome when one is recorded, and the main disagreement, in plain words. Built from the report's
 * own figures (no new computation), rounded as the page shows them (`formatNumber`).
 *
 * The main disagreement: with both legs, the gap between the panel's corrected figure and the
 * baseline's forecast, as a percentage of the baseline (the two legs the blend weighs); without a
 * baseline, the spread of the panel's answers in the latest closed round (the middle half, from
 * the lower to the upper quartile; a shared quantity only, since a sum of parts has no spread
 * between panelists). Nothing is said about a disagreement the figures cannot show.
 */
import { formatNumber } from "@/lib/ui/format";
import type { QuestionReport } from "./report";

type SummaryInput = Pick<QuestionReport, "question" | "blend" | "legs" | "outcome" | "convergence">;

const finite = (x: number | null | undefined): x is number => typeof x === "number" && Number.isFinite(x);

export function reportSummary(r: SummaryInput): string {
  const unit = r.question.unit;
  const amount = (x: number) => `${formatNumber(x)} ${unit}`;
  const range = (iv: readonly { level: number; lower: number | null; upper: number | null }[] | undefined) => {
    const i = iv?.find((x) => x.level === 80);
    return i && finite(i.lower) && finite(i.upper) ? `, with an 80% range of ${formatNumber(i.lower)} to ${formatNumber(i.upper)}` : "";
  };
  const panel = r.legs.panel?.corrected;
  const period = r.question.targetPeriod;
  let sentence: string;
  if (r.blend && finite(r.blend.figure)) sentence = `The blended figure for ${period} is ${amount(r.blend.figure)}${range(r.blend.intervals)}`;
  else if (panel && finite(panel.figure))
    sentence = `There is no blended figure yet (${r.legs.baseline ? "the baseline gives no usable range" : "no baseline is attached"}); the panel's figure for ${period} is ${amount(panel.figure)}${range(panel.intervals)}`;
  else sentence = `There is no figure for ${period} yet: no closed round has answers`;

  if (r.outcome) sentence += `; the recorded outcome is ${amount(r.outcome.outcomeValue)}`;

  const base = r.legs.baseline?.target.mean;
  const last = r.convergence.rounds.at(-1);
  if (panel && finite(panel.figure) && finite(base) && base !== 0) {
    const pct = (100 * (panel.figure - base)) / Math.abs(base);
    const gap = Math.abs(pct) < 0.5 ? "within 1% of each other" : `${Math.round(Math.abs(pct))}% apart, the panel ${pct > 0 ? "above" : "below"} the baseline`;
    sentence += `; the main disagreement is between the panel's corrected figure (${formatNumber(panel.figure)}) and the baseline's forecast (${formatNumber(base)}): ${gap}`;
  } else if (r.question.aggregation === "shared" && last && last.n >= 2 && finite(last.q1) && finite(last.q3)) {
    sentence += `; the main disagreement is within the panel: the middle half of round ${last.round}'s ${last.n} answers runs from ${formatNumber(last.q1)} to ${formatNumber(last.q3)}`;
  }
  return `${sentence}.`;
}
