/**
 * The audit log in plain words (lib/panels/audit-text.ts): one case per action the services
 * record (the list is read from the sources, so a new action without a sentence fails here).
 * Expected sentences are written out by hand from the wording the audit issue asks for; numbers
 * in full with thousands commas (ECMAScript Number::toString, grouped), dates as
 * lib/ui/format.ts formatDateTime writes them ("4 Dec 2026, 12:00 UTC", en-GB, UTC).
 */
import { readdirSync, readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { auditSentence, todaysForm, type AuditQuestion } from "../../lib/panels/audit-text";

const questions = new Map<string, AuditQuestion>([
  ["q1", { text: "Wren-1 field units", unit: "units" }],
  ["q2", { text: "Units in year one", unit: "units" }],
]);
const ada = "Ada Fenwick";
const say = (action: string, detail: Record<string, unknown>, actorName: string | null = ada) => auditSentence({ action, actorName, detail }, questions);

/** [action, detail, actor, expected sentence] for every recorded action, old and new forms. */
const CASES: [string, Record<string, unknown>, string | null, string][] = [
  ["panel.created", { title: "Wren-2 launch volumes" }, ada, "Ada Fenwick created the panel 'Wren-2 launch volumes'."],
  ["panel.updated", { title: "Wren-2 volumes", roundLimit: 4, from: { title: "Wren-2 launch volumes", roundLimit: 3 } }, ada, "Ada Fenwick changed the title from 'Wren-2 launch volumes' to 'Wren-2 volumes'; the round limit from 3 to 4."],
  ["panel.updated", { consensusMeasure: "cv", stabilityThreshold: 0.15 }, ada, "Ada Fenwick changed the consensus measure to coefficient of variation; the stability threshold to 15%."],
  ["panel.deleted", { title: "Wren-2 launch volumes" }, ada, "Ada Fenwick deleted the panel 'Wren-2 launch volumes'."],
  ["panel.finished", {}, ada, "Ada Fenwick finished the panel."],
  ["panel.shared", { email: "bo@quillmoor.example", role: "reviewer" }, ada, "Ada Fenwick shared the panel with bo@quillmoor.example as reviewer."],
  ["panel.unshared", { email: "bo@quillmoor.example" }, ada, "Ada Fenwick stopped sharing the panel with bo@quillmoor.example."],
  ["panel.blend-rule", { fromRule: "equal", fromPanelWeight: null, rule: "organiser", panelWeight: 0.4, panelLeg: "equal" }, ada, "Ada Fenwick changed the blend rule from equal weights (50/50) to the organiser's weight of 40% on the panel; panel leg of three-point questions: equal weights."],
  ["panel.blend-rule", { rule: "inverse-mse", panelWeight: null }, ada, "Ada Fenwick set the blend rule to inverse-MSE weights."],
  ["question.blend-rule", { questionId: "q2", fromRule: "panel", fromPanelWeight: null, rule: "equal", panelWeight: null }, ada, "Ada Fenwick changed the blend rule of 'Units in year one' from the panel's rule to equal weights (50/50)."],
  ["question.blend-rule", { questionId: "q2", rule: "panel", panelWeight: null }, ada, "Ada Fenwick set the blend rule of 'Units in year one' back to the panel's rule."],
  ["question.created", { questionId: "q1", text: "Wren-1 field units", unit: "units" }, ada, "Ada Fenwick added the question 'Wren-1 field units'."],
  ["question.updated", { questionId: "q2", upperBound: 25000, answerFormat: "three-point", from: { upperBound: 20000, answerFormat: "single" } }, ada, "Ada Fenwick changed the question 'Units in year one': the upper bound from 20,000 to 25,000; the answer format from single value to low / median / high."],
  ["question.updated", { questionId: "q2", unit: "units" }, ada, "Ada Fenwick changed the question 'Units in year one': the unit to 'units'."],
  ["question.deleted", { questionId: "q9", text: "Returns in year one" }, ada, "Ada Fenwick deleted the question 'Returns in year one'."],
  ["question.true-value", { questionId: "q1", from: 410, trueValue: 412 }, ada, "Ada Fenwick changed the true value of 'Wren-1 field units' from 410 to 412."],
  ["question.true-value", { questionId: "q1", from: null, trueValue: 410 }, ada, "Ada Fenwick set the true value of 'Wren-1 field units' to 410."],
  ["question.true-value", { questionId: "q1", trueValue: 410 }, ada, "Ada Fenwick set the true value of 'Wren-1 field units' to 410."],
  ["question.true-value", { questionId: "q1", from: 412, trueValue: null }, ada, "Ada Fenwick cleared the true value of 'Wren-1 field units' (was 412)."],
  ["outcome.recorded", { questionId: "q2", outcomeValue: 11400, parts: 0 }, ada, "Ada Fenwick recorded the outcome of 'Units in year one': 11,400 units."],
  ["outcome.corrected", { questionId: "q2", from: 11400, to: 11250.5, reason: "late returns counted" }, ada, "Ada Fenwick corrected the outcome of 'Units in year one' from 11,400 to 11,250.5 units (reason: late returns counted)."],
  ["baseline.attached", { questionId: "q2", method: "holt-winters" }, ada, "Ada Fenwick attached a baseline forecast to 'Units in year one'."],
  ["baseline.replaced", { questionId: "q2", method: "holt" }, ada, "Ada Fenwick replaced the baseline forecast of 'Units in year one'."],
  ["baseline.removed", { questionId: "q7" }, ada, "Ada Fenwick removed the baseline forecast of a removed question."],
  ["round.created", { round: 2 }, ada, "Ada Fenwick prepared round 2 (not yet open)."],
  ["round.opened", { round: 2, deadline: "2026-12-04T12:00:00.000Z" }, ada, "Ada Fenwick opened round 2, closing 4 Dec 2026, 12:00 UTC."],
  ["round.opened", { round: 1 }, ada, "Ada Fenwick opened round 1."],
  ["round.closed", { round: 2, by: "deadline" }, null, "Round 2 closed at its deadline."],
  ["round.closed", { round: 2, by: "organiser" }, ada, "Ada Fenwick closed round 2."],
  ["identities.revealed", { reason: "data request", count: 7 }, ada, "Ada Fenwick revealed the names behind 7 pseudonyms (reason: data request)."],
  ["invitation.created", { count: 1 }, ada, "Ada Fenwick invited 1 panelist."],
  ["invitation.revoked", { invitationId: "inv1" }, ada, "Ada Fenwick withdrew an invitation."],
  ["invitation.reissued", { invitationId: "inv1" }, ada, "Ada Fenwick sent a new link for an invitation."],
  ["messages.round-opened", { kind: "round-opened", roundNumber: 1, recipients: 7, sent: 6, outbox: 0, failed: 1 }, ada, "Ada Fenwick sent the round-opened message for round 1 to 7 panelists (6 sent, 0 in the outbox, 1 failed)."],
  ["messages.reminder", { kind: "reminder", roundNumber: 2, recipients: 1, sent: 0, outbox: 1, failed: 0 }, ada, "Ada Fenwick sent a reminder for round 2 to 1 panelist (0 sent, 1 in the outbox, 0 failed)."],
];

/** The actions the services record: the `action: "…"` literals beside recordAudit in lib/panels and lib/triangulation. */
function recordedActions(): Set<string> {
  const found = new Set<string>();
  const files = ["../../lib/panels", "../../lib/triangulation"].flatMap((d) => {
    const dir = join(__dirname, d);
    return readdirSync(dir).filter((n) => n.endsWith(".ts")).map((n) => join(dir, n));
  });
  for (const file of files) {
    const src = readFileSync(file, "utf8");
    if (!src.includes("recordAudit(tx")) continue;
    for (const m of src.matchAll(/"([a-z]+\.[a-z-]+)"/g)) if (/^(panel|question|outcome|baseline|round|identities|invitation)\./.test(m[1])) found.add(m[1]);
  }
  // messages.<kind>, written from the message kind
  for (const kind of ["round-opened", "reminder"]) found.add(`messages.${kind}`);
  return found;
}

describe("auditSentence", () => {
  it.each(CASES)("%s %j", (action, detail, actor, expected) => {
    expect(say(action, detail, actor)).toBe(expected);
  });

  it("has a case for every action the services record", () => {
    const recorded = recordedActions();
    expect(recorded.size).toBeGreaterThanOrEqual(26);
    const covered = new Set(CASES.map((c) => c[0]));
    expect([...recorded].filter((a) => !covered.has(a))).toEqual([]);
  });

  it("never shows the raw action id or the detail JSON", () => {
    for (const [action, detail, actor] of CASES) {
      const s = say(action, detail, actor);
      expect(s).not.toContain(action);
      expect(s).not.toMatch(/[{}"]/);
      expect(s).not.toContain("inv1");
    }
  });

  it("reads an unknown action without its id", () => {
    expect(say("panel.archived", {})).toBe("Ada Fenwick made a change to the panel.");
  });

  it("reads events stored under the earlier outcome action ids as today's", () => {
    const recorded = todaysForm("question.resolved", { questionId: "q2", actual: 11400, parts: 0 });
    expect(recorded).toEqual({ action: "outcome.recorded", detail: { questionId: "q2", outcomeValue: 11400, parts: 0 } });
    expect(say(recorded.action, recorded.detail)).toBe("Ada Fenwick recorded the outcome of 'Units in year one': 11,400 units.");
    const corrected = todaysForm("resolution.corrected", { questionId: "q2", from: 11400, to: 11250.5, reason: "late returns counted" });
    expect(corrected.action).toBe("outcome.corrected");
    expect(corrected.detail).toEqual({ questionId: "q2", from: 11400, to: 11250.5, reason: "late returns counted" });
    // Today's ids pass through unchanged.
    expect(todaysForm("round.closed", { by: "deadline" })).toEqual({ action: "round.closed", detail: { by: "deadline" } });
  });
});
