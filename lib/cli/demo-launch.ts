/**
 * The demo's launch baseline (invented; docs/methods.md §19): a small panel on the Wren-2's
 * course by quarter. The panel is asked for the Wren-2's lifetime market (its market potential)
 * and for its first four quarters; the second question's baseline fits the Bass model to the
 * quarterly sales, from launch, of two earlier Quillmoor products sold to the same growers
 * through the same distributors, and takes the market potential from the panel's answers to the
 * first question. Quarterly figures agree with the first-year outcomes of the demo's history
 * (Fenwick-1 6,490 vs 6,400; Heron-1 2,280 vs 2,250). Answers are fixed, so the demo is the same
 * every time.
 */
import type { Actor } from "../accounts/actor";
import { actorFromInvitationToken } from "../accounts/actor";
import { createPanel } from "../panels/panels";
import { createInvitations } from "../panels/invitations";
import { closeRound, openRound } from "../panels/rounds";
import { submitAnswer } from "../panels/answers";
import { attachBaseline } from "../triangulation/baselines";

/** Fenwick-1 rain gauge: units sold per quarter from its launch (invented). */
export const FENWICK1_QUARTERS = [1080, 1410, 1760, 2240, 2180, 2140, 1910, 1370, 1080, 740, 470, 330, 200, 130];
/** Heron-1 data logger: units sold per quarter from its launch (invented). */
export const HERON1_QUARTERS = [400, 490, 600, 790, 800, 870, 890, 720, 660, 520, 370, 300];

/** Per panelist: lifetime market, first four quarters, and why (round 1). */
const LAUNCH_ANSWERS: readonly [number, number, string][] = [
  [42000, 12500, "The Wren-1 reached about 12,000 a year at its peak; the Wren-2 reaches the vineyards too."],
  [30000, 9000, "Most growers who wanted a sensor bought a Wren-1; the Wren-2 is largely a replacement."],
  [55000, 15000, "Export listings open two new markets of about the home market's size."],
  [38000, 11000, "Production caps the first quarter at about 1,500 a month; the lifetime figure follows the Wren-1's."],
  [45000, 13000, "Battery life and the radio make it the default choice for new irrigation contracts."],
];

/** Creates the launch panel with round 1 answered and closed, and attaches its launch baseline. */
export async function loadLaunchPanel(actor: Actor, memberIds: readonly string[]): Promise<void> {
  const panel = await createPanel(actor, {
    title: "The Wren-2's course by quarter",
    description:
      "How far and how fast will the Wren-2 spread? The panel gives the lifetime market; the launch baseline borrows the course of the Fenwick-1 and Heron-1 launches.",
    questions: [
      { text: "How many Wren-2 sensors will Quillmoor ever sell (its lifetime market)?", unit: "units", targetPeriod: "product lifetime", lowerBound: 5000, upperBound: 500000, answerFormat: "single", aggregation: "shared" },
      { text: "How many Wren-2 sensors will Quillmoor sell in its first four quarters?", unit: "units", targetPeriod: "first 4 quarters after launch", lowerBound: 1000, upperBound: 100000, answerFormat: "single", aggregation: "shared" },
    ],
  });
  const [market, firstYear] = panel.questions.map((q) => q.id);
  const invited = memberIds.slice(0, LAUNCH_ANSWERS.length);
  const issued = await createInvitations(actor, panel.id, { rosterMemberIds: [...invited], expiresInDays: 60, send: false });
  await openRound(actor, panel.id, 1, {});
  for (let i = 0; i < invited.length; i++) {
    const panelist = await actorFromInvitationToken(issued.find((x) => x.rosterMemberId === invited[i])!.token);
    const [lifetime, four, why] = LAUNCH_ANSWERS[i];
    await submitAnswer(panelist, { questionId: market, value: lifetime, rationale: why });
    await submitAnswer(panelist, { questionId: firstYear, value: four, rationale: "" });
  }
  await closeRound(actor, panel.id, 1);
  await attachBaseline(actor, panel.id, firstYear, {
    launch: {
      analogues: [
        { name: "Fenwick-1 rain gauge", values: FENWICK1_QUARTERS },
        { name: "Heron-1 data logger", values: HERON1_QUARTERS },
      ],
      market: { questionId: market },
      note: "sold to the same growers through the same distributors, at a similar price",
    },
    valueColumn: "value",
    season: 1,
    method: "bass",
    horizon: 4,
    firstPeriod: 1,
    quantity: "total",
    period: "quarter",
  });
}
