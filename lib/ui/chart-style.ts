/**
 * Shared chart style: a colour-blind-safe palette, one marker shape and one line dash per series
 * (so that no information is carried by colour alone), legends drawn with the markers' own point
 * style, and the axis-range rule that keeps a change in proportion. Pure: inputs → plain values
 * for chart.js options; no chart.js registration, so it is unit-tested without a canvas.
 */
import type { PointStyle } from "chart.js";

/**
 * The eight colours of Okabe & Ito (2008), "Color Universal Design (CUD): how to make figures and
 * presentations that are friendly to colorblind people", distinguishable under protanopia,
 * deuteranopia and tritanopia. Yellow (#F0E442) is left out: it is too pale on a white page.
 */
export const OKABE_ITO = {
  black: "#000000",
  orange: "#E69F00",
  skyBlue: "#56B4E9",
  bluishGreen: "#009E73",
  yellow: "#F0E442",
  blue: "#0072B2",
  vermillion: "#D55E00",
  reddishPurple: "#CC79A7",
} as const;

export interface SeriesStyle {
  readonly color: string;
  readonly pointStyle: PointStyle;
  readonly dash: readonly number[];
}

/**
 * One style per series: colour, marker shape and dash all differ between any two of the first
 * eight series, so a reader who cannot tell the colours apart still tells the lines apart.
 */
export const SERIES_STYLES: readonly SeriesStyle[] = [
  { color: OKABE_ITO.blue, pointStyle: "circle", dash: [] },
  { color: OKABE_ITO.vermillion, pointStyle: "triangle", dash: [8, 4] },
  { color: OKABE_ITO.bluishGreen, pointStyle: "rect", dash: [2, 3] },
  { color: OKABE_ITO.reddishPurple, pointStyle: "rectRot", dash: [10, 3, 2, 3] },
  { color: OKABE_ITO.orange, pointStyle: "star", dash: [4, 4] },
  { color: OKABE_ITO.skyBlue, pointStyle: "crossRot", dash: [12, 6] },
  { color: OKABE_ITO.black, pointStyle: "rectRounded", dash: [1, 2] },
  { color: "#6b6b6b", pointStyle: "cross", dash: [6, 2, 1, 2, 1, 2] },
];

/** The style of series `i`; past the eighth the styles repeat (more lines than that are unreadable anyway). */
export function seriesStyle(i: number): SeriesStyle {
  return SERIES_STYLES[((i % SERIES_STYLES.length) + SERIES_STYLES.length) % SERIES_STYLES.length];
}

/** chart.js line-dataset properties for series `i`. */
export function lineStyle(i: number, width = 2) {
  const s = seriesStyle(i);
  return {
    borderColor: s.color,
    backgroundColor: s.color,
    pointStyle: s.pointStyle,
    borderDash: [...s.dash],
    borderWidth: width,
    pointRadius: 4,
    pointHoverRadius: 6,
    fill: false as const,
  };
}

/** Legend options: entries drawn with each dataset's own point style, so swatches match markers. */
export function legendOptions(filter?: (text: string) => boolean) {
  return {
    labels: {
      usePointStyle: true,
      boxHeight: 8,
      ...(filter ? { filter: (item: { text: string }) => filter(item.text) } : {}),
    },
  };
}

/** The least share of the largest absolute value that an axis spans (see `proportionalRange`). */
export const MIN_AXIS_SHARE = 0.4;

/** The phrase added to an axis title that uses `proportionalRange`. */
export const PROPORTIONAL_NOTE = `axis spans ≥ ${MIN_AXIS_SHARE * 100}% of the value`;

/**
 * Axis bounds in which a change shows in proportion to the value: the values' own range with 5%
 * room, widened about its middle until it spans at least `share` of the largest absolute value
 * (so 11,300 → 11,800, a 4% change, fills an eighth of the axis instead of all of it), and kept on
 * the values' side of zero when they are all of one sign. Policy: non-finite values and nulls are
 * ignored; no finite value → undefined (chart.js picks its own); all values 0 → [−1, 1]. Given to
 * chart.js as suggested bounds, which it rounds outward to tidy ticks.
 */
export function proportionalRange(values: readonly (number | null | undefined)[], share = MIN_AXIS_SHARE): { suggestedMin: number; suggestedMax: number } | undefined {
  const v = values.filter((x): x is number => typeof x === "number" && Number.isFinite(x));
  if (v.length === 0) return undefined;
  let lo = Math.min(...v);
  let hi = Math.max(...v);
  const big = Math.max(Math.abs(lo), Math.abs(hi));
  if (big === 0) return { suggestedMin: -1, suggestedMax: 1 };
  const pad = (hi - lo) * 0.05;
  lo -= pad;
  hi += pad;
  const need = share * big;
  if (hi - lo < need) {
    const mid = (lo + hi) / 2;
    lo = mid - need / 2;
    hi = mid + need / 2;
  }
  const allPositive = v.every((x) => x >= 0);
  const allNegative = v.every((x) => x <= 0);
  if (allPositive && lo < 0) {
    hi -= lo;
    lo = 0;
  } else if (allNegative && hi > 0) {
    lo -= hi;
    hi = 0;
  }
  return { suggestedMin: lo, suggestedMax: hi };
}

/**
 * Which end of its line each guide's label goes to: guides taken in order of y alternate right,
 * left, right …, so two neighbouring guides (e.g. +1.28 and +1.96) never put their labels in the
 * same place, however short the chart. Returns one side per guide, in the guides' order.
 */
export function guideLabelSides(ys: readonly number[]): ("left" | "right")[] {
  const order = ys.map((y, i) => ({ y, i })).sort((a, b) => a.y - b.y);
  const sides: ("left" | "right")[] = Array(ys.length).fill("right");
  order.forEach((g, k) => {
    sides[g.i] = k % 2 === 0 ? "right" : "left";
  });
  return sides;
}
