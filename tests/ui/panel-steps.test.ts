/**
 * The organiser's step list (lib/ui/panel-steps.ts). Expected orders follow the Delphi
 * procedure's sequence (questions, panel, rounds until the stopping rules say stop; docs/methods.md
 * and Linstone & Turoff 1975, from memory) and then the triangulation steps of this app; the cases are
 * hand-written, not derived from the code.
 */
import { describe, expect, it } from "vitest";
import { panelSteps, type PanelStepInput } from "../../lib/ui/panel-steps";

const nextOf = (i: PanelStepInput) => panelSteps(i).find((s) => s.state === "next")?.id;
const base: PanelStepInput = { questions: 0, invitations: 0, finished: false, baselines: 0, outcomes: 0 };

describe("panelSteps", () => {
  it("lists questions, invitations, rounds, baseline/blend, outcome, report in that order", () => {
    expect(panelSteps(base).map((s) => s.id)).toEqual(["questions", "invite", "rounds", "blend", "outcome", "report"]);
  });

  it("moves the next step along as the panel progresses", () => {
    expect(nextOf(base)).toBe("questions");
    expect(nextOf({ ...base, questions: 2 })).toBe("invite");
    expect(nextOf({ ...base, questions: 2, invitations: 5 })).toBe("rounds");
    expect(nextOf({ ...base, questions: 2, invitations: 5, finished: true })).toBe("blend");
    expect(nextOf({ ...base, questions: 2, invitations: 5, finished: true, baselines: 1 })).toBe("blend");
    expect(nextOf({ ...base, questions: 2, invitations: 5, finished: true, baselines: 2 })).toBe("outcome");
    expect(nextOf({ ...base, questions: 2, invitations: 5, finished: true, baselines: 2, outcomes: 2 })).toBe("report");
  });

  it("marks exactly one step next, the ones before it done when they are", () => {
    const steps = panelSteps({ ...base, questions: 2, invitations: 5, finished: true });
    expect(steps.filter((s) => s.state === "next")).toHaveLength(1);
    expect(steps.map((s) => s.state)).toEqual(["done", "done", "done", "next", "todo", "todo"]);
  });

  it("treats negative or non-finite counts as none", () => {
    expect(nextOf({ ...base, questions: Number.NaN })).toBe("questions");
    expect(nextOf({ ...base, questions: 1, invitations: -3 })).toBe("invite");
  });
});
