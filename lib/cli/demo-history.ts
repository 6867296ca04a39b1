/**
 * The demo's history (invented): three earlier Quillmoor Instruments panels, 2023–2025, whose
 * eight questions have a recorded outcome, answered by the same roster members with their own
 * habits — Priya Lindqvist and Greta Solheim answer high, Owen Castellan and Felix Achterberg
 * low, Beatriz Nakamura and Hana Moravec close to the outcome — so that on first start the
 * track records, bias factors and inverse-MSE blend weights have something to show. Also the
 * baseline of the current Wren-2 question: the Wren-1's trailing-twelve-month unit sales by
 * quarter, scaled by a stated factor.
 *
 * Everything goes through the domain services, as the web app would; only the dates of the past
 * panels and outcomes are set afterwards, so that the history reads as 2023–2025. The
 * answers are computed from the invented outcome, each person's habit and a fixed wobble
 * (no randomness), so the demo is the same every time.
 */
import { db } from "../db";
import { actorFromInvitationToken, type Actor } from "../accounts/actor";
import { createPanel, type QuestionView } from "../panels/panels";
import { createInvitations } from "../panels/invitations";
import { closeRound, finishPanel, openRound } from "../panels/rounds";
import { submitAnswer } from "../panels/answers";
import { attachBaseline } from "../triangulation/baselines";
import { setPanelBlendRule } from "../triangulation/triangulation";
import { recordOutcome } from "../triangulation/outcome";
import type { RosterMemberView } from "../panels/roster";

/**
 * Each roster member's habit: their answers are the outcome × this (before the wobble), in
 * roster order. Invented.
 */
export const HABITS: readonly number[] = [1.28, 0.78, 1.0, 1.12, 0.97, 0.86, 1.18, 1.03];

interface PastQuestion {
  readonly text: string;
  readonly unit: string;
  readonly targetPeriod: string;
  readonly answerFormat: "single" | "three-point";
  /** The outcome value. */
  readonly outcomeValue: number;
  /** Where the baseline's last value sat relative to the outcome (invented). */
  readonly baselineRatio: number;
  readonly baselineNote: string;
}

interface PastPanel {
  readonly title: string;
  readonly description: string;
  /** Roster indices invited. */
  readonly invited: readonly number[];
  readonly createdAt: string;
  readonly outcomesRecordedAt: string;
  readonly questions: readonly PastQuestion[];
}

export const PAST_PANELS: readonly PastPanel[] = [
  {
    title: "2023 launches: the Fenwick-1 rain gauge and the Wren-1 battery kit",
    description: "Volumes for the two products launched in spring 2023, and the calibration contracts signed that year.",
    invited: [0, 1, 2, 3, 4, 5, 6],
    createdAt: "2023-01-16T09:00:00Z",
    outcomesRecordedAt: "2024-02-05T10:00:00Z",
    questions: [
      { text: "How many Fenwick-1 rain gauges will Quillmoor sell in the first twelve months after launch?", unit: "units", targetPeriod: "first 12 months after launch", answerFormat: "three-point", outcomeValue: 6400, baselineRatio: 0.92, baselineNote: "monthly orders of the older Fenwick gauge, annualised" },
      { text: "How many Wren-1 long-life battery kits will Quillmoor sell in 2023?", unit: "kits", targetPeriod: "calendar year 2023", answerFormat: "single", outcomeValue: 3100, baselineRatio: 1.09, baselineNote: "quarterly spare-battery sales, annualised" },
      { text: "How many annual calibration-service contracts will Quillmoor sign in 2023?", unit: "contracts", targetPeriod: "calendar year 2023", answerFormat: "single", outcomeValue: 420, baselineRatio: 0.9, baselineNote: "contracts signed per year since 2015" },
    ],
  },
  {
    title: "2024 volumes: the Wren-1 in its second year and the Heron-1 data logger",
    description: "Second-year volume of the Wren-1, the Heron-1 logger's launch year, and replacement probes.",
    invited: [0, 1, 2, 3, 4, 5, 6, 7],
    createdAt: "2024-01-22T09:00:00Z",
    outcomesRecordedAt: "2025-02-10T10:00:00Z",
    questions: [
      { text: "How many Wren-1 sensors will Quillmoor sell in 2024?", unit: "units", targetPeriod: "calendar year 2024", answerFormat: "three-point", outcomeValue: 11800, baselineRatio: 1.06, baselineNote: "Wren-1 trailing-twelve-month sales by quarter" },
      { text: "How many Heron-1 data loggers will Quillmoor sell in the first twelve months after launch?", unit: "units", targetPeriod: "first 12 months after launch", answerFormat: "single", outcomeValue: 2250, baselineRatio: 0.95, baselineNote: "first-year sales of earlier loggers, by launch" },
      { text: "How many replacement soil probes will Quillmoor sell in 2024?", unit: "probes", targetPeriod: "calendar year 2024", answerFormat: "single", outcomeValue: 5200, baselineRatio: 1.1, baselineNote: "probe sales per year" },
    ],
  },
  {
    title: "2025 volumes: the Kestrel-1 weather station and the Wren-1's first half",
    description: "Launch-year volume of the Kestrel-1 and Wren-1 sales in the first half of 2025.",
    invited: [0, 1, 2, 3, 4, 5, 6],
    createdAt: "2025-01-20T09:00:00Z",
    outcomesRecordedAt: "2025-09-15T10:00:00Z",
    questions: [
      { text: "How many Kestrel-1 weather stations will Quillmoor sell in the first twelve months after launch?", unit: "units", targetPeriod: "first 12 months after launch", answerFormat: "three-point", outcomeValue: 3900, baselineRatio: 0.94, baselineNote: "first-year sales of earlier stations, by launch" },
      { text: "How many Wren-1 sensors will Quillmoor sell from January to June 2025?", unit: "units", targetPeriod: "January–June 2025", answerFormat: "single", outcomeValue: 6100, baselineRatio: 1.04, baselineNote: "Wren-1 half-year sales" },
    ],
  },
];

/** A fixed wobble around 1 for person i on question k (invented; ±6%). */
export function wobble(i: number, k: number): number {
  return 1 + 0.06 * Math.sin(1.7 * i + 2.3 * k);
}

const round10 = (v: number) => Math.round(v / 10) * 10;

/** Person i's answer to past question k (single value, or low / median / high). */
export function pastAnswer(i: number, k: number, q: PastQuestion): { value: number; low?: number; high?: number } {
  const value = round10(q.outcomeValue * HABITS[i] * wobble(i, k));
  return q.answerFormat === "three-point" ? { value, low: round10(value * 0.78), high: round10(value * 1.3) } : { value };
}

/** A 12-point history whose last value is the outcome × baselineRatio, with a gentle rise and wobble. */
export function pastHistory(q: PastQuestion): number[] {
  const last = q.outcomeValue * q.baselineRatio;
  return Array.from({ length: 12 }, (_, j) => Math.round(last * (0.75 + (0.25 * j) / 11) * (1 + (j === 11 ? 0 : 0.04 * Math.sin(3 * j + 1)))));
}

/**
 * Wren-1 trailing-twelve-month unit sales, one value per quarter from its launch quarter on
 * (invented). The Wren-2 baseline uses it scaled by {@link WREN2_SCALE}.
 */
export const WREN1_TTM = [2100, 4300, 6500, 8200, 9100, 9800, 10400, 10900, 11300, 11600, 11800, 11900, 12150, 12300, 12250, 12400];
export const WREN2_SCALE = 1.15;
export const WREN2_SCALE_NOTE =
  "Wren-1 trailing-twelve-month sales by quarter; ×1.15 because the Wren-2 also reaches the long-range vineyard segment (about 15% more growers in the distributors' lists).";

/** Loads the three past panels, answers, baselines and outcomes (in time order). */
export async function loadPastPanels(actor: Actor, members: readonly RosterMemberView[]): Promise<void> {
  let k = 0;
  for (const past of PAST_PANELS) {
    const panel = await createPanel(actor, {
      title: past.title,
      description: past.description,
      consensusMeasure: "cv",
      questions: past.questions.map((q) => ({
        text: q.text,
        unit: q.unit,
        targetPeriod: q.targetPeriod,
        lowerBound: 0,
        upperBound: q.outcomeValue * 10,
        answerFormat: q.answerFormat,
        aggregation: "shared" as const,
      })),
    });
    await setPanelBlendRule(actor, panel.id, { rule: "inverse-mse" });
    const invited = past.invited.map((i) => members[i]);
    const issued = await createInvitations(actor, panel.id, { rosterMemberIds: invited.map((m) => m.id), expiresInDays: 1, send: false });
    await openRound(actor, panel.id, 1, {});
    const firstK = k;
    for (const i of past.invited) {
      const token = issued.find((x) => x.rosterMemberId === members[i].id)!.token;
      const panelist = await actorFromInvitationToken(token);
      for (let j = 0; j < past.questions.length; j++) {
        const q: QuestionView = panel.questions[j];
        await submitAnswer(panelist, { questionId: q.id, ...pastAnswer(i, firstK + j, past.questions[j]), rationale: "" });
      }
    }
    await closeRound(actor, panel.id, 1);
    await finishPanel(actor, panel.id);
    for (let j = 0; j < past.questions.length; j++, k++) {
      const q = past.questions[j];
      await attachBaseline(actor, panel.id, panel.questions[j].id, {
        values: pastHistory(q),
        valueColumn: "value",
        season: 1,
        method: "naive",
        horizon: 1,
        firstPeriod: 1,
        quantity: "value",
        period: "other",
        analogue: { scaleFactor: 1, note: q.baselineNote },
      });
      await recordOutcome(actor, panel.id, panel.questions[j].id, { outcomeValue: q.outcomeValue, note: "Quillmoor sales ledger (invented)", parts: [] });
      // Date the outcome as it was recorded, so the history reads in time order.
      await db.resolution.update({ where: { questionId: panel.questions[j].id }, data: { resolvedAt: new Date(Date.parse(past.outcomesRecordedAt) + j * 60_000) } });
    }
    await db.panel.update({ where: { id: panel.id }, data: { createdAt: new Date(past.createdAt) } });
  }
}

/** Attaches the Wren-2 question's baseline: the Wren-1's history scaled by {@link WREN2_SCALE}. */
export async function attachWren2Baseline(actor: Actor, panelId: string, questionId: string): Promise<void> {
  const csv = ["quarter,value", ...WREN1_TTM.map((v, i) => `Q${(i % 4) + 1} ${2021 + Math.floor(i / 4)},${v}`)].join("\n");
  await attachBaseline(actor, panelId, questionId, {
    csv,
    valueColumn: "value",
    season: 1,
    method: "auto",
    horizon: 4,
    firstPeriod: 1,
    quantity: "value",
    period: "quarter",
    analogue: { scaleFactor: WREN2_SCALE, note: WREN2_SCALE_NOTE },
  });
}
