/**
 * Anonymity while names are hidden (issue 11, item 2; THREATS.md "Pseudonyms matched to named
 * track records"). The demo (`triangulate demo`: three earlier panels with recorded outcomes, the Wren-2 panel
 * with two closed rounds) gives seven panelists track records. The organiser sees the named
 * records on `/api/v1/track-records`; until the audited reveal, no figure shown next to a
 * pseudonym — in the report JSON, CSV and page, the question page, the triangulation and the
 * outcome — may equal one of those named figures (or a ratio of two figures of one
 * pseudonym, such as corrected answer / answer = bias factor). Revoking an invitation must not
 * remove its pseudonym from live progress.
 *
 * The detector is checked against the revealed view at the end: after the reveal the same
 * search finds the named figures next to pseudonyms, so the hidden checks are not vacuous.
 * Names, company and figures are the demo's invented data (lib/cli/demo.ts).
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { api, clearDatabase, cli, signIn } from "./api-client";

let organiser = "";
let reviewer = "";
let wrenId = "";
/** Every (panel, question) of the demo organiser. */
let questions: { panelId: string; questionId: string }[] = [];
/** Non-integer figures of the named track records. */
let named: number[] = [];

const PSEUDONYM = /^Panelist [A-Z2-9]{3}\b/;

async function get(path: string, cookie: string) {
  const res = await api("GET", path, { cookie });
  if (res.status !== 200) throw new Error(`GET ${path} → ${res.status}: ${res.text.slice(0, 300)}`);
  return res;
}

function matchesNamed(x: number): boolean {
  return named.some((f) => Math.abs(x - f) <= 1e-9 * Math.max(1, Math.abs(f)));
}

/** The figures and the ratios of two figures of one pseudonym. */
function suspects(values: readonly number[]): number[] {
  const finite = values.filter((v) => Number.isFinite(v) && v !== 0);
  const out = [...finite];
  for (const a of finite) for (const b of finite) if (a !== b) out.push(a / b);
  return out;
}

/** Named figures found in any JSON object that carries a pseudonym. */
function leaksInJson(value: unknown, where: string, found: string[] = []): string[] {
  if (Array.isArray(value)) {
    value.forEach((v, i) => leaksInJson(v, `${where}.${i}`, found));
  } else if (value && typeof value === "object") {
    const o = value as Record<string, unknown>;
    if (typeof o.pseudonym === "string") {
      const numbers: number[] = [];
      const collect = (v: unknown) => {
        if (typeof v === "number") numbers.push(v);
        else if (v && typeof v === "object") Object.values(v).forEach(collect);
      };
      collect(o);
      for (const x of suspects(numbers)) if (matchesNamed(x)) found.push(`${where} (${o.pseudonym}): ${x}`);
    } else {
      for (const [k, v] of Object.entries(o)) leaksInJson(v, `${where}.${k}`, found);
    }
  }
  return found;
}

/** RFC 4180 rows (quoted cells may hold commas, quotes and line breaks). */
function csvRows(text: string): string[][] {
  const rows: string[][] = [];
  let row: string[] = [];
  let cell = "";
  let quoted = false;
  for (let i = 0; i < text.length; i++) {
    const c = text[i];
    if (quoted) {
      if (c === '"' && text[i + 1] === '"') (cell += '"'), i++;
      else if (c === '"') quoted = false;
      else cell += c;
    } else if (c === '"') quoted = true;
    else if (c === ",") row.push(cell), (cell = "");
    else if (c === "\n") row.push(cell.replace(/\r$/, "")), rows.push(row), (row = []), (cell = "");
    else cell += c;
  }
  return rows;
}

function leaksInCsv(text: string, where: string): string[] {
  const byItem = new Map<string, number[]>();
  const found: string[] = [];
  for (const [, item, , value] of csvRows(text)) {
    const m = PSEUDONYM.exec(item ?? "");
    if (!m || value === "" || !Number.isFinite(Number(value))) continue;
    byItem.set(m[0], [...(byItem.get(m[0]) ?? []), Number(value)]);
    // The CSV rounds figures as the pages show them: a cell with 3 or more decimals matches a
    // named figure within half a unit of its last digit, as on a page (leaksInPage).
    const decimals = /\.(\d{3,})$/.exec(value)?.[1];
    if (decimals && named.some((f) => Math.abs(Number(value) - f) <= 0.5 * 10 ** -decimals.length * 1.000001)) found.push(`${where} (${m[0]}): ${value}`);
  }
  for (const [who, values] of byItem) for (const x of suspects(values)) if (matchesNamed(x)) found.push(`${where} (${who}): ${x}`);
  return found;
}

/**
 * Named figures on a page. In a table row that carries a pseudonym (its markup included: a
 * figure's exact value is in `data-value`), a number with d ≥ 3 decimals matches a named figure
 * within half a unit of its last digit (integers and one- or two-decimal numbers are answers,
 * rounds and percentages). Anywhere on the page (the serialised props included), a named figure
 * written out in full (String(f), at least 8 significant digits) is a match.
 */
function leaksInPage(html: string, where: string): string[] {
  const found: string[] = [];
  for (const [tr] of html.matchAll(/<tr\b[\s\S]*?<\/tr>/g)) {
    const who = /Panelist [A-Z2-9]{3}\b/.exec(tr.replace(/<[^>]+>/g, " "));
    if (!who) continue;
    for (const [token, decimals] of tr.matchAll(/[−-]?\d[\d,]*\.(\d{3,})/g)) {
      const x = Number(token.replace(/,/g, "").replace("−", "-"));
      const half = 0.5 * 10 ** -decimals.length;
      if (named.some((f) => Math.abs(x - f) <= half * 1.000001)) found.push(`${where} (${who[0]}): ${token}`);
    }
  }
  for (const f of named) {
    const full = String(f);
    if (full.replace(/^[-0.]+/, "").replace(".", "").length >= 8 && html.includes(full)) found.push(`${where}: ${full} on the page`);
  }
  return found;
}

/** Every report, triangulation and outcome of the panels this viewer can read. */
async function allLeaks(cookie: string): Promise<string[]> {
  const found: string[] = [];
  const readable = new Set(((await get("/api/v1/panels", cookie)).body as { id: string }[]).map((p) => p.id));
  const mine = questions.filter((q) => readable.has(q.panelId));
  expect(mine.length).toBeGreaterThan(0);
  for (const { panelId, questionId } of mine) {
    const q = `/api/v1/panels/${panelId}/questions/${questionId}`;
    found.push(...leaksInJson((await get(`${q}/report.json`, cookie)).body, `report.json ${questionId}`));
    found.push(...leaksInJson((await get(`${q}/triangulation`, cookie)).body, `triangulation ${questionId}`));
    found.push(...leaksInCsv((await get(`${q}/report.csv`, cookie)).text, `report.csv ${questionId}`));
    const outcome = await api("GET", `${q}/outcome`, { cookie });
    if (outcome.status === 200) found.push(...leaksInJson(outcome.body, `outcome ${questionId}`));
    found.push(...leaksInPage((await get(`/reports/${panelId}/questions/${questionId}`, cookie)).text, `report page ${questionId}`));
  }
  for (const panelId of readable) {
    found.push(...leaksInPage((await get(`/reports/${panelId}`, cookie)).text, `panel report page ${panelId}`));
  }
  return found;
}

beforeAll(async () => {
  await clearDatabase();
  const out = cli(["demo"]);
  const password = (role: string) => new RegExp(`${role}\\s+(\\S+@quillmoor\\.example)\\s+password: (\\S+)`).exec(out)!;
  const [, oEmail, oPassword] = password("organiser");
  const [, rEmail, rPassword] = password("reviewer");
  organiser = await signIn({ email: oEmail, password: oPassword, name: "organiser" });
  reviewer = await signIn({ email: rEmail, password: rPassword, name: "reviewer" });

  const records = (await get("/api/v1/track-records", organiser)).body as { record: Record<string, any> }[];
  for (const { record } of records) {
    for (const v of [record.meanError, record.meanLogRatio, record.mape, record.bias?.factor, record.bias?.raw]) {
      if (typeof v === "number" && Number.isFinite(v) && !Number.isInteger(v)) named.push(v);
    }
  }
  const panels = (await get("/api/v1/panels", organiser)).body as { id: string; title: string }[];
  for (const p of panels) {
    const panel = (await get(`/api/v1/panels/${p.id}`, organiser)).body as { questions: { id: string }[] };
    for (const q of panel.questions) questions.push({ panelId: p.id, questionId: q.id });
    if (p.title.includes("Wren-2")) wrenId = p.id;
  }
}, 300_000);

afterAll(() => clearDatabase());

describe("while names are hidden", () => {
  it("the demo gives the organiser named track records to match against", () => {
    // The demo's seven panelists answered earlier questions with a recorded outcome (lib/cli/demo-history.ts).
    expect(named.length).toBeGreaterThanOrEqual(7 * 3);
    expect(wrenId).not.toBe("");
    expect(questions.length).toBeGreaterThan(2);
  });

  it("no figure next to a pseudonym equals a named track-record figure (organiser)", async () => {
    expect(await allLeaks(organiser)).toEqual([]);
  });

  it("no figure next to a pseudonym equals a named track-record figure (reviewer)", async () => {
    expect(await allLeaks(reviewer)).toEqual([]);
  });

  it("the question page shows no per-pseudonym figure from a track record", async () => {
    const found: string[] = [];
    for (const { panelId, questionId } of questions) {
      found.push(...leaksInPage((await get(`/panels/${panelId}/questions/${questionId}`, organiser)).text, `question page ${questionId}`));
    }
    expect(found).toEqual([]);
  });

  it("the report still gives the corrected panel figure and how many panelists had a usable record", async () => {
    const q = questions.find((x) => x.panelId === wrenId)!;
    const report = (await get(`/api/v1/panels/${q.panelId}/questions/${q.questionId}/report.json`, organiser)).body;
    expect(report.viewer.namesShown).toBe(false);
    expect(typeof report.legs.panel.corrected.figure).toBe("number");
    // All seven demo panelists answered earlier questions with a recorded outcome (lib/cli/demo-history.ts).
    expect(report.legs.trackRecord.panelistsWithRecord).toBe(7);
    expect(typeof report.legs.trackRecord.meanFactor).toBe("number");
  });

  it("revoking an invitation keeps its pseudonym in live progress", async () => {
    const before = (await get(`/api/v1/panels/${wrenId}/progress`, organiser)).body;
    const invitations = (await get(`/api/v1/panels/${wrenId}/invitations`, organiser)).body as { id: string }[];
    const revoked = await api("DELETE", `/api/v1/panels/${wrenId}/invitations/${invitations[3].id}`, { cookie: organiser });
    expect(revoked.status).toBe(200);
    const after = (await get(`/api/v1/panels/${wrenId}/progress`, organiser)).body;
    const names = (v: { panelists: { pseudonym: string }[] }) => v.panelists.map((p) => p.pseudonym);
    expect(before.panelists).toHaveLength(7);
    expect(names(after)).toEqual(names(before));
    expect(after.invited).toBe(before.invited);
    expect(after.panelists).toEqual(before.panelists);
  });
});

describe("after the audited reveal", () => {
  it("the organiser sees per-person figures, which the same search finds; the reviewer still does not", async () => {
    const res = await api("POST", `/api/v1/panels/${wrenId}/reveal`, { cookie: organiser, body: { reason: "checking the panel's bias correction" } });
    expect(res.status).toBe(200);
    const q = questions.find((x) => x.panelId === wrenId)!;
    const path = `/api/v1/panels/${q.panelId}/questions/${q.questionId}`;
    expect(leaksInJson((await get(`${path}/report.json`, organiser)).body, "report.json").length).toBeGreaterThan(0);
    expect(leaksInCsv((await get(`${path}/report.csv`, organiser)).text, "report.csv").length).toBeGreaterThan(0);
    expect(leaksInJson((await get(`${path}/triangulation`, organiser)).body, "triangulation").length).toBeGreaterThan(0);
    expect(leaksInPage((await get(`/reports/${q.panelId}/questions/${q.questionId}`, organiser)).text, "page").length).toBeGreaterThan(0);
    expect(leaksInJson((await get(`${path}/report.json`, reviewer)).body, "report.json")).toEqual([]);
  });
});
