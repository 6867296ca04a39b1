"use server";
/**
 * Server actions of the organiser's panel page. Each one: parse the form with the zod schema
 * from lib/validation, call one service, revalidate the page, return what the form shows.
 */
import { revalidatePath } from "next/cache";
import { headers } from "next/headers";
import { createInvitations, reissueInvitation, revokeInvitation, type IssuedInvitation } from "@/lib/panels/invitations";
import { deleteOutboxMessage, sendNotices } from "@/lib/panels/messages";
import { siteOrigin } from "@/lib/http/site";
import { addQuestion, deleteQuestion, setTrueValue, sharePanel, unsharePanel, updatePanel, updateQuestion } from "@/lib/panels/panels";
import { closeRound, finishPanel, openRound, revealIdentities, startNextRound } from "@/lib/panels/rounds";
import { getCurrentUser } from "@/lib/session";
import { setPanelBlendRule } from "@/lib/triangulation/triangulation";
import { panelBlendRuleInput } from "@/lib/validation/triangulation-inputs";
import {
  invitationCreate,
  invitationReissue,
  nextRoundInput,
  noticeInput,
  panelUpdate,
  params,
  questionInput,
  questionUpdate,
  revealInput,
  roundOpen,
  shareInput,
  trueValueInput,
} from "@/lib/validation/inputs";
import type { FormState } from "@/lib/actions/form-state";
import { formList, formObject, fromThrown, withNumbers } from "@/lib/actions/form-result";
import { plainMessage } from "@/lib/validation/messages";
import { NOT_SIGNED_IN, signedInAction } from "@/lib/actions/signed-in-action";
import { textProblems } from "@/lib/actions/action-guard";
import { limits } from "@/lib/http/rate-limit";

const QUESTION_NUMBERS = ["lowerBound", "upperBound", "trueValue"] as const;

/** The question form's input: the calibration checkbox as a boolean, the numbers read as typed. */
function questionBody(values: Record<string, string>): Record<string, unknown> {
  return withNumbers({ ...values, calibration: values.calibration === "yes" }, QUESTION_NUMBERS);
}

/** The site's own address, for the full private links shown once and e-mailed (lib/http/site.ts). */
async function origin(): Promise<string> {
  const h = await headers();
  const host = h.get("x-forwarded-host") ?? h.get("host") ?? "localhost";
  const proto = h.get("x-forwarded-proto") ?? (host.startsWith("localhost") || host.startsWith("127.") ? "http" : "https");
  return siteOrigin(`${proto}://${host}`);
}

/** What happened to the e-mails of `issued` (when they were e-mailed). */
function mailSummary(issued: readonly IssuedInvitation[]): string {
  const count = (d: string) => issued.filter((i) => i.delivery === d).length;
  if (!issued.some((i) => i.delivery)) return "Send each person their own link.";
  const parts = [count("sent") ? `${count("sent")} e-mailed` : "", count("outbox") ? `${count("outbox")} waiting in the outbox for you to send` : ""];
  return `${parts.filter(Boolean).join(", ")}.`;
}

/** The form without empty optional fields (an empty deadline means none). */
function withoutEmpty(values: Record<string, string>): Record<string, string> {
  return Object.fromEntries(Object.entries(values).filter(([, v]) => v.trim() !== ""));
}

function done(panelId: string, message?: string): FormState {
  revalidatePath(`/panels/${panelId}`);
  return { ok: true, message };
}

export async function addQuestionAction(_p: FormState, formData: FormData): Promise<FormState> {
  const values = formObject(formData);
  return signedInAction(values, params.panelId, async (user, id, question) => {
    await addQuestion(user, id.panelId, question);
    return done(id.panelId, "Question added.");
  }, [questionInput, questionBody(values)]);
}

export async function updateQuestionAction(_p: FormState, formData: FormData): Promise<FormState> {
  const values = formObject(formData);
  return signedInAction(values, params.question, async (user, id, question) => {
    await updateQuestion(user, id.panelId, id.questionId, question);
    return done(id.panelId, "Question saved.");
  }, [questionUpdate, questionBody(values)]);
}

export async function trueValueAction(_p: FormState, formData: FormData): Promise<FormState> {
  const { panelId, questionId, trueValue } = formObject(formData);
  const read = withNumbers({ trueValue }, ["trueValue"]);
  // An empty field clears the true value.
  if ((trueValue ?? "").trim() === "") read.trueValue = null;
  return signedInAction({ panelId, questionId }, params.question, async (user, id, input) => {
    const r = await setTrueValue(user, id.panelId, id.questionId, input);
    revalidatePath(`/reports/${id.panelId}`);
    return done(id.panelId, r.trueValue === null ? "True value cleared." : `True value saved: ${r.trueValue}.`);
  }, [trueValueInput, read]);
}

export async function deleteQuestionAction(_p: FormState, formData: FormData): Promise<FormState> {
  return signedInAction(formObject(formData), params.question, async (user, id) => {
    await deleteQuestion(user, id.panelId, id.questionId);
    return done(id.panelId);
  });
}

export async function updateRulesAction(_p: FormState, formData: FormData): Promise<FormState> {
  const { panelId, ...rest } = formObject(formData);
  return signedInAction({ panelId }, params.panelId, async (user, id, rules) => {
    await updatePanel(user, id.panelId, rules);
    return done(id.panelId, "Saved.");
  }, [panelUpdate, withNumbers(rest, ["consensusThreshold", "stabilityThreshold", "roundLimit"])]);
}

export async function inviteAction(_p: FormState, formData: FormData): Promise<FormState> {
  const values = formObject(formData);
  const rosterMemberIds = formList(formData, "rosterMemberIds");
  return signedInAction(values, params.panelId, async (user, id, input) => {
    const site = await origin();
    const issued = await createInvitations(user, id.panelId, input, site);
    revalidatePath(`/panels/${id.panelId}`);
    return {
      ok: true,
      message: `${issued.length} invitation${issued.length === 1 ? "" : "s"} created. ${mailSummary(issued)}`,
      secrets: issued.map((i) => ({ label: `Private link for ${i.name} <${i.email}>`, value: `${site}${i.link}` })),
    };
  }, [invitationCreate, withNumbers({ ...values, rosterMemberIds, send: values.send === "yes" }, ["expiresInDays"])], limits.invitations);
}

export async function revokeInvitationAction(_p: FormState, formData: FormData): Promise<FormState> {
  return signedInAction(formObject(formData), params.invitation, async (user, id) => {
    const inv = await revokeInvitation(user, id.panelId, id.invitationId);
    return done(id.panelId, `${inv.name}'s link no longer works.`);
  });
}

export async function reissueInvitationAction(_p: FormState, formData: FormData): Promise<FormState> {
  const values = formObject(formData);
  return signedInAction(values, params.invitation, async (user, id, input) => {
    const site = await origin();
    const inv = await reissueInvitation(user, id.panelId, id.invitationId, input, site);
    revalidatePath(`/panels/${id.panelId}`);
    return { ok: true, message: `The old link no longer works. ${mailSummary([inv])}`, secret: { label: `New private link for ${inv.name} <${inv.email}>`, value: `${site}${inv.link}` } };
  }, [invitationReissue, withNumbers({ ...values, send: values.send === "yes" }, ["expiresInDays"])], limits.invitations);
}

/** E-mails the open round's notice to everyone, or a reminder to those who have not answered (counted like the API's sendNotices). */
export async function sendNoticesAction(_p: FormState, formData: FormData): Promise<FormState> {
  const values = formObject(formData);
  return signedInAction(values, params.panelId, async (user, id, input) => {
    const r = await sendNotices(user, id.panelId, input);
    revalidatePath(`/panels/${id.panelId}/outbox`);
    const what = r.kind === "reminder" ? "Reminders" : "Notices";
    const parts = [`${r.sent} sent`, r.outbox ? `${r.outbox} in the outbox for you to send` : "", r.failed ? `${r.failed} refused by the mail server` : ""];
    return done(id.panelId, `${what} for round ${r.roundNumber}: ${r.recipients} recipient${r.recipients === 1 ? "" : "s"}; ${parts.filter(Boolean).join(", ")}.`);
  }, [noticeInput, { kind: values.kind }], limits.invitations);
}

export async function deleteOutboxAction(_p: FormState, formData: FormData): Promise<FormState> {
  return signedInAction(formObject(formData), params.outboxMessage, async (user, id) => {
    await deleteOutboxMessage(user, id.panelId, id.messageId);
    revalidatePath(`/panels/${id.panelId}/outbox`);
    return { ok: true, message: "Deleted." };
  });
}

export async function openRoundAction(_p: FormState, formData: FormData): Promise<FormState> {
  const values = withoutEmpty(formObject(formData));
  return signedInAction(values, params.round, async (user, id, input) => {
    await openRound(user, id.panelId, id.roundNumber, input);
    return done(id.panelId, `Round ${id.roundNumber} is open.`);
  }, [roundOpen, values]);
}

export async function closeRoundAction(_p: FormState, formData: FormData): Promise<FormState> {
  return signedInAction(formObject(formData), params.round, async (user, id) => {
    await closeRound(user, id.panelId, id.roundNumber);
    return done(id.panelId, `Round ${id.roundNumber} is closed; its statistics are below.`);
  });
}

export async function nextRoundAction(_p: FormState, formData: FormData): Promise<FormState> {
  const values = withoutEmpty(formObject(formData));
  return signedInAction(values, params.panelId, async (user, id, input) => {
    const round = await startNextRound(user, id.panelId, input);
    return done(id.panelId, `Round ${round.number} ${round.status === "open" ? "is open" : "is ready to open"}.`);
  }, [nextRoundInput, { ...values, open: values.open === "yes" }]);
}

export async function finishPanelAction(_p: FormState, formData: FormData): Promise<FormState> {
  return signedInAction(formObject(formData), params.panelId, async (user, id) => {
    await finishPanel(user, id.panelId);
    return done(id.panelId, "The panel is finished.");
  });
}

export async function shareAction(_p: FormState, formData: FormData): Promise<FormState> {
  const values = formObject(formData);
  return signedInAction(values, params.panelId, async (user, id, input) => {
    const share = await sharePanel(user, id.panelId, input);
    return done(id.panelId, `Shared with ${share.email} as ${share.role}.`);
  }, [shareInput, values]);
}

export async function unshareAction(_p: FormState, formData: FormData): Promise<FormState> {
  return signedInAction(formObject(formData), params.share, async (user, id) => {
    const share = await unsharePanel(user, id.panelId, id.email);
    return done(id.panelId, `No longer shared with ${share.email}.`);
  });
}

/**
 * Reveals who is behind each pseudonym. The service writes the audit event (with the reason)
 * before it returns the names. Called from the live-progress component, not a form.
 */
export async function revealNamesAction(
  panelId: string,
  reason: string,
): Promise<{ ok: boolean; message?: string; names?: Record<string, string> }> {
  const user = await getCurrentUser();
  if (!user) return { ok: false, message: NOT_SIGNED_IN.message };
  const refused = textProblems({ panelId, reason });
  if (refused) return { ok: false, message: Object.values(refused.fieldErrors ?? {})[0]?.[0] };
  const id = params.panelId.safeParse({ panelId });
  const parsed = revealInput.safeParse({ reason });
  if (!id.success) return { ok: false, message: "Unknown panel." };
  if (!parsed.success) return { ok: false, message: parsed.error.issues[0] && plainMessage(parsed.error.issues[0]) };
  try {
    const people = await revealIdentities(user, id.data.panelId, parsed.data);
    revalidatePath(`/panels/${id.data.panelId}`);
    return { ok: true, names: Object.fromEntries(people.map((p) => [p.pseudonym, `${p.name} (${p.group || "no group"})`])) };
  } catch (error) {
    const state = fromThrown(error);
    return { ok: false, message: state.message };
  }
}

export async function panelBlendRuleAction(_p: FormState, formData: FormData): Promise<FormState> {
  const { panelId, ...rest } = formObject(formData);
  const input = withNumbers(rest, ["panelWeight"]);
  if (rest.rule !== "organiser") delete input.panelWeight;
  return signedInAction({ panelId }, params.panelId, async (user, id, rule) => {
    const r = await setPanelBlendRule(user, id.panelId, rule);
    revalidatePath(`/reports/${id.panelId}`);
    return done(id.panelId, `Blend weight rule: ${r.rule}${r.rule === "organiser" ? ` (w = ${r.panelWeight})` : ""}; panel leg: ${r.panelLeg === "performance" ? "performance-weighted pool" : "equal weights"}.`);
  }, [panelBlendRuleInput, input]);
}
