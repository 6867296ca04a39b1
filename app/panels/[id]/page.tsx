import type { Metadata } from "next";
import { notFound, redirect } from "next/navigation";
import { NotFoundError } from "@/lib/errors";
import { listAuditEvents } from "@/lib/panels/audit";
import { listInvitations } from "@/lib/panels/invitations";
import { getPanel, getPanelMilestones, listShares } from "@/lib/panels/panels";
import { smtpConfigured } from "@/lib/mail/smtp";
import { listOutbox } from "@/lib/panels/messages";
import { panelSteps, type StepId } from "@/lib/ui/panel-steps";
import { MIN_OUTCOMES_FOR_WEIGHTS } from "@/lib/blend";
import { getPanelBlendRule } from "@/lib/triangulation/report-views";
import { listRoster } from "@/lib/panels/roster";
import { getProgress } from "@/lib/panels/rounds";
import { getConvergencePage } from "@/lib/panels/views";
import { STOPPING_RULE_DEFAULTS as D } from "@/lib/stats/stopping-rules";
import ActionForm, { FieldError } from "@/lib/ui/action-form";
import ConvergenceView from "@/lib/ui/convergence-view";
import DeadlineInput from "@/lib/ui/deadline-input";
import { countOf, formatDateTime, formatNumber, formatPercent } from "@/lib/ui/format";
import InvitationActions from "@/lib/ui/invitation-actions";
import LiveProgress from "@/lib/ui/live-progress";
import QuestionFields from "@/lib/ui/question-fields";
import { requireSignedIn } from "@/lib/ui/require-user";
import RuleSource from "@/lib/ui/rule-source";
import {
  addQuestionAction,
  closeRoundAction,
  deleteQuestionAction,
  finishPanelAction,
  inviteAction,
  nextRoundAction,
  openRoundAction,
  panelBlendRuleAction,
  reissueInvitationAction,
  revealNamesAction,
  revokeInvitationAction,
  sendNoticesAction,
  shareAction,
  trueValueAction,
  unshareAction,
  updateQuestionAction,
  updateRulesAction,
} from "./actions";

export const metadata: Metadata = { title: "Panel" };

const MEASURE = { cv: "coefficient of variation", "relative-iqr": "relative IQR" } as const;

export default async function PanelPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const user = await requireSignedIn(`/panels/${id}`);
  if (user.role === "reviewer") redirect(`/reports/${id}`);
  let panel;
  try {
    panel = await getPanel(user, id);
  } catch (error) {
    if (error instanceof NotFoundError) notFound();
    throw error;
  }
  if (panel.role === "reviewer") redirect(`/reports/${id}`);
  const [invitations, roster, progress, convergence, shares, audit, blendRule, milestones, outbox] = await Promise.all([
    listInvitations(user, id),
    listRoster(user),
    getProgress(user, id),
    getConvergencePage(user, id),
    listShares(user, id),
    listAuditEvents(user, id),
    getPanelBlendRule(user, id),
    getPanelMilestones(user, id),
    listOutbox(user, id),
  ]);
  const smtp = smtpConfigured();
  const finished = panel.status === "finished";
  const draft = panel.status === "draft";
  const openRound = panel.rounds.find((r) => r.status === "open") ?? null;
  const draftRound = panel.rounds.find((r) => r.status === "draft") ?? null;
  const lastRound = panel.rounds.at(-1) ?? null;
  const canStartNext = !finished && !openRound && !draftRound && lastRound?.status === "closed";
  const invitedIds = new Set(invitations.map((i) => i.rosterMemberId));
  const notInvited = roster.filter((m) => !invitedIds.has(m.id));
  const activeInvitations = invitations.filter((i) => i.status === "active").length;
  const reveal = revealNamesAction.bind(null, id);
  const limitReached = lastRound !== null && lastRound.number >= panel.roundLimit;
  // After a closed round: the stopping rules (or the round limit) say whether to stop.
  const rulesSayStop = canStartNext && (limitReached || convergence.evaluation?.recommendation === "stop");
  // Calibration questions need no baseline or outcome; a panel of only calibration questions counts them all.
  const targetQuestions = panel.questions.filter((q) => !q.calibration).length || panel.questions.length;
  const steps = panelSteps({ questions: targetQuestions, invitations: invitations.length, finished, ...milestones });
  const next = steps.find((s) => s.state === "next")!.id;
  const questionPage = (qid: string | null) => (qid ? `/panels/${id}/questions/${qid}` : `/panels/${id}`);
  const stepHref: Record<StepId, string> = {
    questions: "#questions",
    invite: "#invitations",
    rounds: "#rounds",
    blend: questionPage(milestones.firstWithoutBaseline),
    outcome: questionPage(milestones.firstWithoutOutcome),
    report: `/reports/${id}`,
  };
  const finishForm = (primary: boolean) => (
    <ActionForm
      action={finishPanelAction}
      submitLabel="Finish the panel"
      submitClassName={primary ? undefined : "secondary"}
      confirm="Finish the panel? No further rounds can be run."
      ariaLabel="Finish panel"
    >
      <input type="hidden" name="panelId" value={id} />
    </ActionForm>
  );

  return (
    <article className="panel-page">
      <p className="muted small">
        <a href="/panels">Panels</a> /
      </p>
      <h1>{panel.title}</h1>
      <p>
        <span className="status" data-panel-status={panel.status}>
          {panel.status}
        </span>{" "}
        <span className="muted small">
          {panel.role === "owner" ? "You own this panel." : "Shared with you as co-organiser."} Created {formatDateTime(panel.createdAt)}.
        </span>
      </p>
      {panel.description ? <p className="lead">{panel.description}</p> : null}

      <nav aria-label="Steps of this panel">
        <ol className="steps">
          {steps.map((s) => (
            <li key={s.id} data-step={s.id} data-step-state={s.state} aria-current={s.state === "next" ? "step" : undefined}>
              <a href={stepHref[s.id]}>{s.label}</a>
            </li>
          ))}
        </ol>
      </nav>
      <div className="card" data-next-step={next}>
        <h2 id="next-h">Next: {steps.find((s) => s.id === next)!.label}</h2>
        {next === "questions" ? (
          <>
            <p>Write the questions the panel will answer: each with a unit, a target period and a plausible range.</p>
            <a className="button" href="#questions">Add a question</a>
          </>
        ) : next === "invite" ? (
          <>
            <p>Invite people from your expert roster. Each gets a private link, by e-mail or through the outbox.</p>
            <a className="button" href="#invitations">Invite panelists</a>
          </>
        ) : next === "rounds" ? (
          rulesSayStop ? (
            <>
              <p>{limitReached ? `The round limit of ${panel.roundLimit} is reached.` : "The stopping rules say the panel can stop."} Finish it to go on to the baseline and blend.</p>
              <a className="button" href="#rounds">
                Finish the panel
              </a>
            </>
          ) : (
            <>
              <p>
                {openRound
                  ? `Round ${openRound.number} is open: follow the progress, remind those who have not answered, and close it when enough have.`
                  : draftRound
                    ? `Open round ${draftRound.number} so the panelists can answer.`
                    : lastRound
                      ? `The stopping rules suggest another round after round ${lastRound.number}.`
                      : "Open round 1 so the panelists can answer."}
              </p>
              <a className="button" href="#rounds">
                {openRound ? `Round ${openRound.number}` : draftRound ? `Open round ${draftRound.number}` : lastRound ? `Start round ${lastRound.number + 1}` : "Rounds"}
              </a>
            </>
          )
        ) : next === "blend" ? (
          <>
            <p>Attach a statistical baseline (the history of the quantity) to each question and read how it blends with the panel.</p>
            <a className="button" href={stepHref.blend}>Baseline and blend</a>
          </>
        ) : next === "outcome" ? (
          <>
            <p>When the real value is known, record it: each figure is then scored against it.</p>
            <a className="button" href={stepHref.outcome}>Record the outcome</a>
          </>
        ) : (
          <>
            <p>Everything is in place: read the report and share it with reviewers.</p>
            <a className="button" href={stepHref.report}>Open the report</a>
          </>
        )}
      </div>

      <section aria-labelledby="questions-h" id="questions">
        <h2 id="questions-h">Questions</h2>
        {panel.questions.length === 0 ? <p className="muted">No questions yet.</p> : null}
        {panel.questions.map((q) => (
          <div className="card" key={q.id} data-question={q.id}>
            <h3>
              {q.position}. {q.text}
            </h3>
            <dl className="facts">
              <dt>Unit</dt>
              <dd>{q.unit}</dd>
              <dt>Target period</dt>
              <dd>{q.targetPeriod}</dd>
              <dt>Plausible range</dt>
              <dd>
                {formatNumber(q.lowerBound, 8)} to {formatNumber(q.upperBound, 8)} {q.unit}
              </dd>
              <dt>Answer format</dt>
              <dd>
                {q.answerFormat === "single" ? "single value" : q.calibration ? "low / median / high (P5 / P50 / P95)" : "low / median / high (P10 / P50 / P90)"}
              </dd>
              <dt>Aggregation</dt>
              <dd>{q.aggregation === "shared" ? "shared quantity (median)" : "sum of parts (total)"}</dd>
              {q.calibration ? (
                <>
                  <dt>Calibration question</dt>
                  <dd data-true-value={q.trueValue ?? ""}>
                    true value {q.trueValue === null ? "not given yet" : `${formatNumber(q.trueValue, 8)} ${q.unit}`} (never shown to panelists)
                  </dd>
                </>
              ) : null}
            </dl>
            {q.calibration ? (
              <details>
                <summary>{q.trueValue === null ? "Enter the true value" : "Change the true value"}</summary>
                <ActionForm action={trueValueAction} submitLabel="Save true value" ariaLabel={`True value of question ${q.position}`}>
                  <input type="hidden" name="panelId" value={id} />
                  <input type="hidden" name="questionId" value={q.id} />
                  <label className="narrow">
                    True value ({q.unit}; empty clears it)
                    <input name="trueValue" inputMode="decimal" defaultValue={q.trueValue ?? ""} />
                    <FieldError name="trueValue" />
                  </label>
                </ActionForm>
              </details>
            ) : (
              <p>
                <a href={`/panels/${id}/questions/${q.id}`} data-question-link={q.id}>
                  Baseline, blend and outcome of this question
                </a>{" "}
                · <a href={`/reports/${id}/questions/${q.id}`}>Reviewer report</a>
              </p>
            )}
            {draft ? (
              <details>
                <summary>Edit or remove this question</summary>
                <ActionForm action={updateQuestionAction} submitLabel="Save question">
                  <input type="hidden" name="panelId" value={id} />
                  <input type="hidden" name="questionId" value={q.id} />
                  <QuestionFields question={q} />
                </ActionForm>
                <ActionForm
                  action={deleteQuestionAction}
                  submitLabel="Remove question"
                  submitClassName="secondary"
                  confirm="Remove this question?"
                >
                  <input type="hidden" name="panelId" value={id} />
                  <input type="hidden" name="questionId" value={q.id} />
                </ActionForm>
              </details>
            ) : null}
          </div>
        ))}
        {draft ? (
          <div className="card">
            <h3>Add a question</h3>
            <ActionForm action={addQuestionAction} submitLabel="Add question" resetOnSuccess ariaLabel="Add a question">
              <input type="hidden" name="panelId" value={id} />
              <QuestionFields />
            </ActionForm>
          </div>
        ) : (
          <p className="hint">Questions are fixed once round 1 has opened, so that every answer matches its question.</p>
        )}
      </section>

      <section aria-labelledby="invitations-h" id="invitations">
        <h2 id="invitations-h">Panelists and invitations</h2>
        <p className="muted">
          Each panelist gets a private link; only a hash of it is stored, so a link is shown once, when it is created or
          re-issued, and e-mailed if you choose. Panelists see each other only as anonymous answers.
        </p>
        <p>
          <a href={`/panels/${id}/outbox`} data-outbox-count={outbox.length}>
            Outbox: {outbox.length === 0 ? "empty" : `${outbox.length} e-mail${outbox.length === 1 ? "" : "s"} to send by hand`}
          </a>
          {smtp ? null : <span className="muted small"> · no mail server is set up, so e-mails wait there</span>}
        </p>
        {invitations.length > 0 ? (
          <div className="table-scroll">
            <table>
              <thead>
                <tr>
                  <th>Name</th>
                  <th>Group</th>
                  <th>Status</th>
                  <th>Link expires</th>
                  <th>Link</th>
                </tr>
              </thead>
              <tbody>
                {invitations.map((i) => (
                  <tr key={i.id} data-invitation={i.email}>
                    <td>
                      {i.name}
                      <br />
                      <span className="muted small">{i.email}</span>
                    </td>
                    <td>{i.group || "—"}</td>
                    <td>{i.status}</td>
                    <td>{formatDateTime(i.expiresAt)}</td>
                    <td>
                      {finished ? null : (
                        <InvitationActions
                          panelId={id}
                          invitationId={i.id}
                          name={i.name}
                          active={i.status === "active"}
                          revoke={revokeInvitationAction}
                          reissue={reissueInvitationAction}
                        />
                      )}
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        ) : null}
        {finished ? null : (
          <div className="card">
            <h3>Invite from your expert roster</h3>
            {/* The form stays mounted after everyone is invited: it holds the links shown once. */}
            <ActionForm
              action={inviteAction}
              submitLabel="Create invitations"
              ariaLabel="Invite panelists"
              submitDisabled={notInvited.length === 0}
            >
              <input type="hidden" name="panelId" value={id} />
              {notInvited.length === 0 ? (
                <p className="muted">
                  Everyone on your roster is invited. Add people on the <a href="/roster">expert roster</a> page.
                </p>
              ) : (
                <>
                  <fieldset>
                    <legend>People to invite</legend>
                    {notInvited.map((m) => (
                      <label key={m.id} className="inline" style={{ display: "flex" }}>
                        <input type="checkbox" name="rosterMemberIds" value={m.id} />
                        {m.name} <span className="muted small">&nbsp;{m.group ? `· ${m.group}` : ""}</span>
                      </label>
                    ))}
                    <FieldError name="rosterMemberIds" />
                  </fieldset>
                  <label className="narrow">
                    Days until the links expire
                    <input name="expiresInDays" inputMode="numeric" defaultValue={30} />
                    <FieldError name="expiresInDays" />
                  </label>
                  <label className="inline">
                    <input type="checkbox" name="send" value="yes" defaultChecked /> E-mail each person their own link
                    {smtp ? "" : " (no mail server is set up: the e-mails wait in the outbox for you to send)"}
                  </label>
                </>
              )}
            </ActionForm>
          </div>
        )}
      </section>

      <section aria-labelledby="rounds-h" id="rounds">
        <h2 id="rounds-h">Rounds</h2>
        {panel.rounds.length === 0 ? <p className="muted">No rounds yet.</p> : null}
        <ul>
          {panel.rounds.map((r) => (
            <li key={r.number} data-round-status={r.status} data-round-number={r.number}>
              Round {r.number}: <span className={`status status-${r.status}`}>{r.status}</span>
              {r.openedAt ? ` · opened ${formatDateTime(r.openedAt)}` : ""}
              {r.deadline ? ` · deadline ${formatDateTime(r.deadline)}` : ""}
              {r.closedAt ? ` · closed ${formatDateTime(r.closedAt)}` : ""}
            </li>
          ))}
        </ul>
        {draftRound && !finished ? (
          <div className="card">
            <h3>Open round {draftRound.number}</h3>
            {panel.questions.length === 0 ? (
              <p className="muted">Add at least one question first.</p>
            ) : activeInvitations === 0 ? (
              <p className="muted">Nobody is invited yet; you can open the round now and invite people while it runs.</p>
            ) : (
              <p className="muted">
                {activeInvitations} panelist{activeInvitations === 1 ? "" : "s"} can answer once it is open.
                {draft ? " Questions can no longer be changed after round 1 opens." : ""}
              </p>
            )}
            <ActionForm action={openRoundAction} submitLabel={`Open round ${draftRound.number}`} ariaLabel="Open round">
              <input type="hidden" name="panelId" value={id} />
              <input type="hidden" name="roundNumber" value={draftRound.number} />
              <DeadlineInput />
              <FieldError name="deadline" />
            </ActionForm>
          </div>
        ) : null}
        {openRound ? (
          <div className="card" id="live-progress">
            <h3>Round {openRound.number} is open — live progress</h3>
            <LiveProgress
              url={`/api/v1/panels/${encodeURIComponent(id)}/progress`}
              initial={progress}
              checkedAt={new Date().toISOString()}
              reveal={reveal}
            />
            <ActionForm action={sendNoticesAction} submitLabel="Send e-mail" submitClassName="secondary" ariaLabel="E-mail the panelists">
              <input type="hidden" name="panelId" value={id} />
              <fieldset>
                <legend>E-mail the panelists about this round</legend>
                <label className="inline">
                  <input type="radio" name="kind" value="round-opened" defaultChecked /> Round {openRound.number} is open — to everyone whose link works
                </label>
                <label className="inline">
                  <input type="radio" name="kind" value="reminder" disabled={!smtp} /> Reminder — only to those who have not answered every question
                </label>
                <FieldError name="kind" />
                <p className="hint">
                  {smtp
                    ? "Each message goes to one person and names nobody else. You see how many reminders went, not to whom."
                    : "No mail server is set up (SMTP_URL), so notices wait in the outbox for you to send. Reminders need a mail server: in the outbox you would see who has not answered."}
                </p>
              </fieldset>
            </ActionForm>
            <ActionForm
              action={closeRoundAction}
              submitLabel={`Close round ${openRound.number}`}
              confirm={`Close round ${openRound.number} now? Panelists can no longer answer it, and its statistics are computed.`}
              ariaLabel="Close round"
            >
              <input type="hidden" name="panelId" value={id} />
              <input type="hidden" name="roundNumber" value={openRound.number} />
            </ActionForm>
          </div>
        ) : null}
        {canStartNext ? (
          <div className="card" data-after-round={lastRound!.number} data-rules-say={rulesSayStop ? "stop" : "another-round"}>
            <h3>After round {lastRound!.number}</h3>
            <p className="muted">
              {rulesSayStop
                ? limitReached
                  ? `The round limit of ${panel.roundLimit} is reached: finish the panel (or raise the limit under "Stopping rules" to run another round).`
                  : "The stopping rules say the panel can stop (see the convergence view below): finish the panel, or run another round if you have a reason to."
                : `The stopping rules suggest another round (see the convergence view below): panelists see the feedback of round ${lastRound!.number} and may revise their answers.`}
            </p>
            {rulesSayStop ? finishForm(true) : null}
            {limitReached ? null : (
              <ActionForm
                action={nextRoundAction}
                submitLabel={`Start round ${lastRound!.number + 1}`}
                submitClassName={rulesSayStop ? "secondary" : undefined}
                ariaLabel="Next round"
              >
                <input type="hidden" name="panelId" value={id} />
                <label className="inline">
                  <input type="checkbox" name="open" value="yes" defaultChecked /> Open it at once
                </label>
                <DeadlineInput />
                <FieldError name="deadline" />
              </ActionForm>
            )}
            {rulesSayStop ? null : finishForm(false)}
          </div>
        ) : null}
        {finished ? (
          <div className="notice" data-finished-next>
            <p>This panel is finished. What comes next:</p>
            <ol>
              <li>
                <a href={stepHref.blend}>Attach a statistical baseline and read the blend</a> for each question ({milestones.baselines} of{" "}
                {panel.questions.length} have a baseline);
              </li>
              <li>
                <a href={stepHref.outcome}>Record the outcome</a> of each question once it is known ({milestones.outcomes} of {panel.questions.length} recorded);
              </li>
              <li>
                <a href={stepHref.report}>Read and share the report</a>.
              </li>
            </ol>
          </div>
        ) : null}
      </section>

      <section aria-labelledby="convergence-h" id="convergence">
        <h2 id="convergence-h">Convergence</h2>
        <ConvergenceView view={convergence} />
      </section>

      <section aria-labelledby="rules-h">
        <h2 id="rules-h">Stopping rules</h2>
        <ul>
          <li>
            Consensus: {MEASURE[panel.consensusMeasure]} at or under {formatNumber(panel.consensusThreshold)}.{" "}
            <RuleSource rule={D.consensusThreshold[panel.consensusMeasure]} shown={String(D.consensusThreshold[panel.consensusMeasure].value)} />
          </li>
          <li>
            Stability: median and IQR each change by at most {formatPercent(panel.stabilityThreshold, 0)} between rounds.{" "}
            <RuleSource rule={D.stabilityThreshold} shown={formatPercent(D.stabilityThreshold.value, 0)} />
          </li>
          <li>
            Round limit: {panel.roundLimit}. <RuleSource rule={D.roundLimit} shown={String(D.roundLimit.value)} />
          </li>
        </ul>
        {finished ? null : (
          <details>
            <summary>Change the stopping rules</summary>
            <ActionForm action={updateRulesAction} submitLabel="Save rules">
              <input type="hidden" name="panelId" value={id} />
              <label className="inline">
                <input type="radio" name="consensusMeasure" value="cv" defaultChecked={panel.consensusMeasure === "cv"} /> Coefficient of
                variation
              </label>
              <label className="inline">
                <input type="radio" name="consensusMeasure" value="relative-iqr" defaultChecked={panel.consensusMeasure === "relative-iqr"} />{" "}
                Relative IQR
              </label>
              <div className="row">
                <label>
                  Consensus threshold
                  <input name="consensusThreshold" inputMode="decimal" defaultValue={panel.consensusThreshold} />
                  <FieldError name="consensusThreshold" />
                </label>
                <label>
                  Stability threshold (fraction)
                  <input name="stabilityThreshold" inputMode="decimal" defaultValue={panel.stabilityThreshold} />
                  <FieldError name="stabilityThreshold" />
                </label>
                <label>
                  Round limit
                  <input name="roundLimit" inputMode="numeric" defaultValue={panel.roundLimit} />
                  <FieldError name="roundLimit" />
                </label>
              </div>
            </ActionForm>
          </details>
        )}
      </section>

      <section aria-labelledby="blend-rule-h">
        <h2 id="blend-rule-h">Blend weight rule</h2>
        <p className="small">
          How much the panel counts against the statistical baseline in each question&apos;s blended figure, unless a question sets its own (
          {blendRule.questionsWithOwnRule} do). Now:{" "}
          <strong data-panel-blend-rule={blendRule.rule}>
            {blendRule.rule === "equal"
              ? "equal weights"
              : blendRule.rule === "inverse-mse"
                ? "inverse-MSE weights from your past outcomes"
                : `set by the organiser, w = ${blendRule.panelWeight}`}
          </strong>
          {blendRule.calibrationQuestions > 0 ? (
            <>
              ; panel leg:{" "}
              <strong data-panel-leg={blendRule.panelLeg}>{blendRule.panelLeg === "performance" ? "performance-weighted pool" : "every answer alike"}</strong>
            </>
          ) : null}
          .
        </p>
        <details>
          <summary>Change the rule for all questions</summary>
          <ActionForm action={panelBlendRuleAction} submitLabel="Save blend weight rule" ariaLabel="Panel blend weight rule">
            <input type="hidden" name="panelId" value={id} />
            <label className="inline">
              <input type="radio" name="rule" value="equal" defaultChecked={blendRule.rule === "equal"} /> Equal weights (50/50; Blattberg &amp; Hoch 1990)
            </label>
            <label className="inline">
              <input type="radio" name="rule" value="inverse-mse" defaultChecked={blendRule.rule === "inverse-mse"} /> Inverse-MSE from past outcomes (Bates
              &amp; Granger 1969; equal weights until {MIN_OUTCOMES_FOR_WEIGHTS} outcomes are recorded)
            </label>
            <label className="inline">
              <input type="radio" name="rule" value="organiser" defaultChecked={blendRule.rule === "organiser"} /> Set by me
            </label>
            <FieldError name="rule" />
            <label className="narrow">
              Panel weight w (0 to 1; only when set by you)
              <input name="panelWeight" inputMode="decimal" defaultValue={blendRule.panelWeight ?? ""} />
              <FieldError name="panelWeight" />
            </label>
            {blendRule.calibrationQuestions > 0 ? (
              <fieldset>
                <legend>Panel leg of three-point questions</legend>
                <label className="inline">
                  <input type="radio" name="panelLeg" value="equal" defaultChecked={blendRule.panelLeg === "equal"} /> Every panelist&apos;s answer alike
                </label>
                <label className="inline">
                  <input type="radio" name="panelLeg" value="performance" defaultChecked={blendRule.panelLeg === "performance"} /> Performance-weighted pool from
                  the {blendRule.calibrationQuestions} calibration question{blendRule.calibrationQuestions === 1 ? "" : "s"} (Cooke&apos;s classical model; see the
                  report for whether weighting helped on this panel)
                </label>
                <FieldError name="panelLeg" />
              </fieldset>
            ) : null}
          </ActionForm>
        </details>
      </section>

      {panel.role === "owner" ? (
        <section aria-labelledby="sharing-h">
          <h2 id="sharing-h">Sharing</h2>
          {shares.length === 0 ? (
            <p className="muted">Not shared with anyone.</p>
          ) : (
            <ul>
              {shares.map((s) => (
                <li key={s.email}>
                  {s.email} — {s.role === "reviewer" ? "reviewer, read only" : "co-organiser (read only for a reviewer account)"}
                  <ActionForm action={unshareAction} submitLabel="Stop sharing" submitClassName="secondary" confirm={`Stop sharing with ${s.email}?`}>
                    <input type="hidden" name="panelId" value={id} />
                    <input type="hidden" name="email" value={s.email} />
                  </ActionForm>
                </li>
              ))}
            </ul>
          )}
          <details>
            <summary>Share with a reviewer or co-organiser</summary>
            <ActionForm action={shareAction} submitLabel="Share" resetOnSuccess>
              <input type="hidden" name="panelId" value={id} />
              <label>
                Their e-mail (the account with it gets access, now or when it is created)
                <input name="email" type="email" />
                <FieldError name="email" />
              </label>
              <label className="inline">
                <input type="radio" name="role" value="reviewer" defaultChecked /> Reviewer (reads the reports)
              </label>
              <label className="inline">
                <input type="radio" name="role" value="organiser" /> Co-organiser (full control)
              </label>
              <FieldError name="role" />
            </ActionForm>
          </details>
        </section>
      ) : null}

      <section aria-labelledby="audit-h">
        <h2 id="audit-h">Audit log</h2>
        <details>
          <summary>{countOf(audit.length, "recorded action")} (opening and closing rounds, invitations, revealed names…)</summary>
          <table className="small">
            <tbody>
              {audit.map((e) => (
                <tr key={e.id}>
                  <td>{formatDateTime(e.createdAt)}</td>
                  <td>{e.sentence}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </details>
      </section>
    </article>
  );
}
