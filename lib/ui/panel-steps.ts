/**
 * The organiser's steps through a panel (docs/methods.md §14.2), in the order of the Delphi
 * method as docs/methods.md §14 describes it: write the questions, invite the panel, run rounds until the stopping rules say
 * stop (§ stopping rules), set the statistical baseline and the blend against it, record the
 * outcome once it is known, read the report. Each step is done, the next one, or to do; the
 * next is the first step not done. The report is never "done": it is the last step and is
 * always there to read.
 *
 * Policy: counts below 0 or not finite count as 0; "next" is always exactly one step.
 */
export type StepId = "questions" | "invite" | "rounds" | "blend" | "outcome" | "report";
export type StepState = "done" | "next" | "todo";

export interface PanelStepInput {
  readonly questions: number;
  /** Invitations whose link works (not revoked, not expired) or that have answered. */
  readonly invitations: number;
  readonly finished: boolean;
  /** Questions with a statistical baseline attached. */
  readonly baselines: number;
  /** Questions whose outcome is recorded. */
  readonly outcomes: number;
}

export interface PanelStep {
  readonly id: StepId;
  readonly label: string;
  readonly state: StepState;
}

const LABELS: Readonly<Record<StepId, string>> = {
  questions: "Questions",
  invite: "Invite panelists",
  rounds: "Rounds",
  blend: "Baseline and blend",
  outcome: "Outcome",
  report: "Report",
};

const count = (n: number) => (Number.isFinite(n) && n > 0 ? n : 0);

/** The steps with their states (see the module comment). */
export function panelSteps(i: PanelStepInput): PanelStep[] {
  const questions = count(i.questions);
  const done: Record<StepId, boolean> = {
    questions: questions > 0,
    invite: count(i.invitations) > 0,
    rounds: i.finished,
    blend: questions > 0 && count(i.baselines) >= questions,
    outcome: questions > 0 && count(i.outcomes) >= questions,
    report: false,
  };
  const order: StepId[] = ["questions", "invite", "rounds", "blend", "outcome", "report"];
  const next = order.find((id) => !done[id]) ?? "report";
  return order.map((id) => ({ id, label: LABELS[id], state: id === next ? "next" : done[id] ? "done" : "todo" }));
}
