/**
 * The demo scenario (invented): Quillmoor Instruments is launching the Wren-2 soil-moisture
 * sensor and asks seven people from sales, engineering and operations how many units it will
 * sell in its first year. Two rounds are closed (the answers converge, with rationales) and a
 * third is open. Three earlier panels (2023–2025) with eight recorded outcomes give the roster
 * members track records (lib/cli/demo-history.ts), and the first question has a baseline from
 * the Wren-1's history scaled by a stated factor, blended with inverse-MSE weights. Everything
 * goes through the domain services, as the web app would.
 *
 * People, company and product are fictional; e-mail addresses use the reserved .example domain.
 */
import { randomBytes } from "node:crypto";
import { db, dialect, isUniqueViolation } from "../db";
import { ConflictError } from "../errors";
import { actorFromInvitationToken, actorFromUserId, type Actor } from "../accounts/actor";
import { createUser } from "../accounts/users";
import { addRosterMember } from "../panels/roster";
import { createPanel, sharePanel } from "../panels/panels";
import { createInvitations } from "../panels/invitations";
import { closeRound, openRound, startNextRound } from "../panels/rounds";
import { submitAnswer } from "../panels/answers";
import { setPanelBlendRule } from "../triangulation/triangulation";
import type { CommandIo } from "./main";
import { attachWren2Baseline, loadPastPanels, PAST_PANELS } from "./demo-history";
import { loadLaunchPanel } from "./demo-launch";

const ROSTER = [
  { name: "Priya Lindqvist", group: "sales" },
  { name: "Owen Castellan", group: "sales" },
  { name: "Beatriz Nakamura", group: "sales" },
  { name: "Tobias Renwick", group: "engineering" },
  { name: "Hana Moravec", group: "engineering" },
  { name: "Felix Achterberg", group: "engineering" },
  { name: "Greta Solheim", group: "operations" },
  { name: "Rafael Underhill", group: "operations" },
] as const;

const email = (name: string) => `${name.toLowerCase().replace(/[^a-z]+/g, ".")}@quillmoor.example`;

/** Per invited person (first seven of the roster): [low, median, high] and own part, per round. */
const ANSWERS: readonly {
  total: readonly [number, number, number][];
  part: readonly number[];
  why: readonly string[];
}[] = [
  {
    total: [[9000, 14000, 22000], [10000, 13500, 19000], [10500, 13500, 18500]],
    part: [2600, 2400, 2400],
    why: [
      "The Wren-1 sold about 11,000 units in its first year; the Wren-2 adds the long-range radio our growers asked for.",
      "Kept close to the group: the distributor pre-orders look like Wren-1 plus a fifth.",
    ],
  },
  {
    total: [[6000, 9500, 15000], [8500, 11500, 16000], [9000, 12000, 16500]],
    part: [1800, 1900, 2000],
    why: [
      "Irrigation budgets in the south are flat this year; I expect a slow first half.",
      "Moved up after reading the others' notes on the vineyard pilots, but the price rise still worries me.",
    ],
  },
  {
    total: [[15000, 21000, 30000], [13000, 17000, 23000], [12500, 16000, 21500]],
    part: [3400, 3000, 2900],
    why: [
      "Three large co-operatives have asked for quotes already, which we never saw before the Wren-1 launch.",
      "The co-operative quotes are real, but I accept they may slip into year two.",
    ],
  },
  {
    total: [[8000, 12000, 17000], [9000, 12500, 17000], [9500, 13000, 17500]],
    part: [1500, 1600, 1600],
    why: [
      "Production can make about 1,500 a month from March; demand is not the only limit.",
      "Same view: supply caps the first quarter.",
    ],
  },
  {
    total: [[11000, 16000, 24000], [10500, 14500, 20000], [11000, 14500, 19500]],
    part: [2200, 2100, 2100],
    why: [
      "Battery life doubled; field trials show fewer support calls, which sells in the second season.",
      "Trimmed the high end: the second season mostly falls outside the first twelve months.",
    ],
  },
  {
    total: [[5000, 8000, 13000], [8000, 11000, 15500], [8500, 11500, 16000]],
    part: [1200, 1400, 1500],
    why: [
      "New sensors usually wait a season while growers test them on a few fields.",
      "I still think adoption is cautious, but the pilot results are better than I assumed.",
    ],
  },
  {
    total: [[12000, 18000, 26000], [11000, 15000, 21000], [11000, 14500, 20000]],
    part: [2900, 2700, 2600],
    why: [
      "Export partners in two new countries are ready to list the Wren-2 at launch.",
      "One export partner has delayed its listing to the autumn, so I came down.",
    ],
  },
];

async function answerRound(tokens: readonly string[], round: number, questionIds: readonly [string, string], count = tokens.length) {
  for (let i = 0; i < count; i++) {
    const panelist: Actor = await actorFromInvitationToken(tokens[i]);
    const [low, median, high] = ANSWERS[i].total[round - 1];
    const rationale = ANSWERS[i].why[round - 1] ?? "Holding close to my round 2 figure: the reasons I gave then still apply.";
    await submitAnswer(panelist, { questionId: questionIds[0], value: median, low, high, rationale });
    await submitAnswer(panelist, { questionId: questionIds[1], value: ANSWERS[i].part[round - 1], rationale: "" });
  }
}

/**
 * Loads the demo. With `ifEmpty`, does nothing when any account exists, or when another process
 * creates the demo's organiser first (`npm start` on instances started together).
 * Returns the exit code; prints the accounts' passwords and the panelists' links.
 */
export async function loadDemo(options: { ifEmpty: boolean }, io: CommandIo): Promise<number> {
  if ((await db.user.count()) > 0) {
    if (options.ifEmpty) {
      io.out("demo: the database already has accounts; nothing loaded\n");
      return 0;
    }
    if (await db.user.findUnique({ where: { email: "organiser@quillmoor.example" } })) {
      io.err("triangulate: the demo is already loaded (organiser@quillmoor.example exists)\n");
      return 1;
    }
  }
  // The demo writes a few hundred small transactions (it goes through the domain services, each
  // with its own transaction, so it cannot be one transaction). Not waiting for the disk after
  // each (this connection only; the connection's own setting is restored below) loads it several
  // times faster. The price: a power cut or system crash during these seconds could leave the new
  // database file damaged; it holds nothing but the demo then, so delete it and start again. A
  // failure inside the app leaves a partial demo, as before. (PostgreSQL: loaded as it is.)
  if (dialect === "postgresql") return load(options, io);
  const [{ synchronous }] = await db.$queryRawUnsafe<{ synchronous: number | bigint }[]>("PRAGMA synchronous");
  await db.$queryRawUnsafe("PRAGMA synchronous = OFF");
  try {
    return await load(options, io);
  } finally {
    await db.$queryRawUnsafe(`PRAGMA synchronous = ${Number(synchronous)}`);
  }
}

async function load(options: { ifEmpty: boolean }, io: CommandIo): Promise<number> {
  const organiserPassword = randomBytes(12).toString("base64url");
  const reviewerPassword = randomBytes(12).toString("base64url");
  let organiser: Awaited<ReturnType<typeof createUser>>;
  try {
    organiser = await createUser({ email: "organiser@quillmoor.example", name: "Tamsin Okafor", password: organiserPassword });
  } catch (err) {
    // Instances started together each run `demo --if-empty`: the first to create the organiser
    // loads the demo, and the others, finding the e-mail taken, leave it to that one.
    if (options.ifEmpty && (err instanceof ConflictError || isUniqueViolation(err))) {
      io.out("demo: another process is loading the demo; nothing loaded\n");
      return 0;
    }
    throw err;
  }
  const reviewer = await createUser({ email: "reviewer@quillmoor.example", name: "Dorian Vale", password: reviewerPassword, role: "reviewer" });
  const actor = (await actorFromUserId(organiser.id))!;

  const members = [];
  for (const p of ROSTER) members.push(await addRosterMember(actor, { name: p.name, email: email(p.name), group: p.group }));
  await loadPastPanels(actor, members);

  const panel = await createPanel(actor, {
    title: "Year-one unit sales of the Wren-2",
    description:
      "Quillmoor Instruments launches the Wren-2 soil-moisture sensor next spring. How many units will it sell in its first twelve months, and how much will each territory or channel contribute?",
    consensusMeasure: "cv",
    questions: [
      {
        text: "How many Wren-2 sensors will Quillmoor sell in the first twelve months after launch?",
        unit: "units",
        targetPeriod: "first 12 months after launch",
        lowerBound: 1000,
        upperBound: 100000,
        answerFormat: "three-point",
        aggregation: "shared",
      },
      {
        text: "How many Wren-2 sensors will your own territory or channel sell in those twelve months?",
        unit: "units",
        targetPeriod: "first 12 months after launch",
        lowerBound: 0,
        upperBound: 50000,
        answerFormat: "single",
        aggregation: "sum-of-parts",
      },
    ],
  });
  await sharePanel(actor, panel.id, { email: reviewer.email, role: "reviewer" });
  const questionIds = [panel.questions[0].id, panel.questions[1].id] as const;

  const issued = await createInvitations(actor, panel.id, { rosterMemberIds: members.slice(0, 7).map((m) => m.id), expiresInDays: 60, send: false });
  const tokens = members.slice(0, 7).map((m) => issued.find((i) => i.rosterMemberId === m.id)!.token);

  await openRound(actor, panel.id, 1, {});
  await answerRound(tokens, 1, questionIds);
  await closeRound(actor, panel.id, 1);
  await startNextRound(actor, panel.id, { open: true });
  await answerRound(tokens, 2, questionIds);
  await closeRound(actor, panel.id, 2);
  const deadline = new Date(Date.now() + 14 * 24 * 60 * 60 * 1000).toISOString();
  await startNextRound(actor, panel.id, { open: true, deadline });
  await answerRound(tokens, 3, questionIds, 2);
  await attachWren2Baseline(actor, panel.id, questionIds[0]);
  await setPanelBlendRule(actor, panel.id, { rule: "inverse-mse" });
  await loadLaunchPanel(actor, members.map((m) => m.id));

  const lines = [
    "demo: loaded Quillmoor Instruments — panel \"Year-one unit sales of the Wren-2\" (rounds 1–2 closed, round 3 open)",
    "  and panel \"The Wren-2's course by quarter\" (a launch baseline: Bass diffusion from two earlier launches, market potential from the panel)",
    `  history: ${PAST_PANELS.length} earlier panels with ${PAST_PANELS.reduce((n, p) => n + p.questions.length, 0)} recorded outcomes (track records, bias factors, inverse-MSE weights)`,
    `  organiser  organiser@quillmoor.example  password: ${organiserPassword}`,
    `  reviewer   reviewer@quillmoor.example   password: ${reviewerPassword}`,
    "  panelist links (each is one person's secret; re-issue one on the panel page if it leaks):",
    ...issued.map((i) => `    ${i.name.padEnd(18)} ${process.env.NEXTAUTH_URL ?? ""}${i.link}`),
  ];
  io.out(lines.join("\n") + "\n");
  return 0;
}
