"use server";
/**
 * Server actions of the organiser's panel page. Each one: parse the form with the zod schema
 * from lib/validation, call one service, revalidate the page, return what the form shows.
 */
import { revalidatePath } from "next/cache";
import { headers } from "next/headers";
import { createInvitations, reissueInvitation, revokeInvitation } from "@/lib/panels/invitations";
import { addQuestion, deleteQuestion, sharePanel, updatePanel, updateQuestion } from "@/lib/panels/panels";
import { closeRound, finishPanel, openRound, revealIdentities, startNextRound } from "@/lib/panels/rounds";
import { getCurrentUser } from "@/lib/session";
import { setPanelBlendRule } from "@/lib/panels/triangulation";
import { panelBlendRuleInput } from "@/lib/validation/triangulation-inputs";
import {
  invitationCreate,
  invitationReissue,
  nextRoundInput,
  panelUpdate,
  params,
  questionInput,
  questionUpdate,
  revealInput,
  roundOpen,
  shareInput,
} from "@/lib/validation/inputs";
import type { FormState } from "@/lib/ui/form-state";
import { formObject, fromThrown, fromZodError, withNumbers } from "@/lib/ui/form-result";

const NOT_SIGNED_IN: FormState = { ok: false, message: "Your session has ended; sign in again." };
const QUESTION_NUMBERS = ["lowerBound", "upperBound"] as const;

/** The site's own address, for the full private links shown once. */
async function origin(): Promise<string> {
  const h = await headers();
  const host = h.get("x-forwarded-host") ?? h.get("host") ?? "localhost";
  const proto = h.get("x-forwarded-proto") ?? (host.startsWith("localhost") || host.startsWith("127.") ? "http" : "https");
  return `${proto}://${host}`;
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
  const user = await getCurrentUser();
  if (!user) return NOT_SIGNED_IN;
  const values = formObject(formData);
  const id = params.panelId.safeParse(values);
  if (!id.success) return fromZodError(id.error);
  const parsed = questionInput.safeParse(withNumbers(values, QUESTION_NUMBERS));
  if (!parsed.success) return fromZodError(parsed.error);
  try {
    await addQuestion(user, id.data.panelId, parsed.data);
    return done(id.data.panelId, "Question added.");
  } catch (error) {
    return fromThrown(error);
  }
}

export async function updateQuestionAction(_p: FormState, formData: FormData): Promise<FormState> {
  const user = await getCurrentUser();
  if (!user) return NOT_SIGNED_IN;
  const values = formObject(formData);
  const id = params.question.safeParse(values);
  if (!id.success) return fromZodError(id.error);
  const parsed = questionUpdate.safeParse(withNumbers(values, QUESTION_NUMBERS));
  if (!parsed.success) return fromZodError(parsed.error);
  try {
    await updateQuestion(user, id.data.panelId, id.data.questionId, parsed.data);
    return done(id.data.panelId, "Question saved.");
  } catch (error) {
    return fromThrown(error);
  }
}

export async function deleteQuestionAction(_p: FormState, formData: FormData): Promise<FormState> {
  const user = await getCurrentUser();
  if (!user) return NOT_SIGNED_IN;
  const id = params.question.safeParse(formObject(formData));
  if (!id.success) return fromZodError(id.error);
  try {
    await deleteQuestion(user, id.data.panelId, id.data.questionId);
    return done(id.data.panelId);
  } catch (error) {
    return fromThrown(error);
  }
}

export async function updateRulesAction(_p: FormState, formData: FormData): Promise<FormState> {
  const user = await getCurrentUser();
  if (!user) return NOT_SIGNED_IN;
  const values = formObject(formData);
  const id = params.panelId.safeParse(values);
  if (!id.success) return fromZodError(id.error);
  const { panelId: _omit, ...rest } = values;
  const parsed = panelUpdate.safeParse(withNumbers(rest, ["consensusThreshold", "stabilityThreshold", "roundLimit"]));
  if (!parsed.success) return fromZodError(parsed.error);
  try {
    await updatePanel(user, id.data.panelId, parsed.data);
    return done(id.data.panelId, "Saved.");
  } catch (error) {
    return fromThrown(error);
  }
}

export async function inviteAction(_p: FormState, formData: FormData): Promise<FormState> {
  const user = await getCurrentUser();
  if (!user) return NOT_SIGNED_IN;
  const values = formObject(formData);
  const id = params.panelId.safeParse(values);
  if (!id.success) return fromZodError(id.error);
  const parsed = invitationCreate.safeParse({
    ...withNumbers(values, ["expiresInDays"]),
    rosterMemberIds: formData.getAll("rosterMemberIds").filter((v): v is string => typeof v === "string"),
  });
  if (!parsed.success) return fromZodError(parsed.error);
  try {
    const issued = await createInvitations(user, id.data.panelId, parsed.data);
    const site = await origin();
    revalidatePath(`/panels/${id.data.panelId}`);
    return {
      ok: true,
      message: `${issued.length} invitation${issued.length === 1 ? "" : "s"} created. Send each person their own link.`,
      secrets: issued.map((i) => ({ label: `Private link for ${i.name} <${i.email}>`, value: `${site}${i.link}` })),
    };
  } catch (error) {
    return fromThrown(error);
  }
}

export async function revokeInvitationAction(_p: FormState, formData: FormData): Promise<FormState> {
  const user = await getCurrentUser();
  if (!user) return NOT_SIGNED_IN;
  const id = params.invitation.safeParse(formObject(formData));
  if (!id.success) return fromZodError(id.error);
  try {
    const inv = await revokeInvitation(user, id.data.panelId, id.data.invitationId);
    return done(id.data.panelId, `${inv.name}'s link no longer works.`);
  } catch (error) {
    return fromThrown(error);
  }
}

export async function reissueInvitationAction(_p: FormState, formData: FormData): Promise<FormState> {
  const user = await getCurrentUser();
  if (!user) return NOT_SIGNED_IN;
  const values = formObject(formData);
  const id = params.invitation.safeParse(values);
  if (!id.success) return fromZodError(id.error);
  const parsed = invitationReissue.safeParse(withNumbers(values, ["expiresInDays"]));
  if (!parsed.success) return fromZodError(parsed.error);
  try {
    const inv = await reissueInvitation(user, id.data.panelId, id.data.invitationId, parsed.data);
    const site = await origin();
    revalidatePath(`/panels/${id.data.panelId}`);
    return { ok: true, message: "The old link no longer works.", secret: { label: `New private link for ${inv.name} <${inv.email}>`, value: `${site}${inv.link}` } };
  } catch (error) {
    return fromThrown(error);
  }
}

export async function openRoundAction(_p: FormState, formData: FormData): Promise<FormState> {
  const user = await getCurrentUser();
  if (!user) return NOT_SIGNED_IN;
  const values = withoutEmpty(formObject(formData));
  const id = params.round.safeParse(values);
  if (!id.success) return fromZodError(id.error);
  const parsed = roundOpen.safeParse(values);
  if (!parsed.success) return fromZodError(parsed.error);
  try {
    await openRound(user, id.data.panelId, id.data.roundNumber, parsed.data);
    return done(id.data.panelId, `Round ${id.data.roundNumber} is open.`);
  } catch (error) {
    return fromThrown(error);
  }
}

export async function closeRoundAction(_p: FormState, formData: FormData): Promise<FormState> {
  const user = await getCurrentUser();
  if (!user) return NOT_SIGNED_IN;
  const id = params.round.safeParse(formObject(formData));
  if (!id.success) return fromZodError(id.error);
  try {
    await closeRound(user, id.data.panelId, id.data.roundNumber);
    return done(id.data.panelId, `Round ${id.data.roundNumber} is closed; its statistics are below.`);
  } catch (error) {
    return fromThrown(error);
  }
}

export async function nextRoundAction(_p: FormState, formData: FormData): Promise<FormState> {
  const user = await getCurrentUser();
  if (!user) return NOT_SIGNED_IN;
  const values = withoutEmpty(formObject(formData));
  const id = params.panelId.safeParse(values);
  if (!id.success) return fromZodError(id.error);
  const parsed = nextRoundInput.safeParse({ ...values, open: values.open === "yes" });
  if (!parsed.success) return fromZodError(parsed.error);
  try {
    const round = await startNextRound(user, id.data.panelId, parsed.data);
    return done(id.data.panelId, `Round ${round.number} ${round.status === "open" ? "is open" : "is ready to open"}.`);
  } catch (error) {
    return fromThrown(error);
  }
}

export async function finishPanelAction(_p: FormState, formData: FormData): Promise<FormState> {
  const user = await getCurrentUser();
  if (!user) return NOT_SIGNED_IN;
  const id = params.panelId.safeParse(formObject(formData));
  if (!id.success) return fromZodError(id.error);
  try {
    await finishPanel(user, id.data.panelId);
    return done(id.data.panelId, "The panel is finished.");
  } catch (error) {
    return fromThrown(error);
  }
}

export async function shareAction(_p: FormState, formData: FormData): Promise<FormState> {
  const user = await getCurrentUser();
  if (!user) return NOT_SIGNED_IN;
  const values = formObject(formData);
  const id = params.panelId.safeParse(values);
  if (!id.success) return fromZodError(id.error);
  const parsed = shareInput.safeParse(values);
  if (!parsed.success) return fromZodError(parsed.error);
  try {
    const share = await sharePanel(user, id.data.panelId, parsed.data);
    return done(id.data.panelId, `Shared with ${share.name} as ${share.role}.`);
  } catch (error) {
    return fromThrown(error);
  }
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
  const id = params.panelId.safeParse({ panelId });
  const parsed = revealInput.safeParse({ reason });
  if (!id.success) return { ok: false, message: "Unknown panel." };
  if (!parsed.success) return { ok: false, message: parsed.error.issues[0]?.message };
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
  const user = await getCurrentUser();
  if (!user) return NOT_SIGNED_IN;
  const values = formObject(formData);
  const id = params.panelId.safeParse(values);
  if (!id.success) return fromZodError(id.error);
  const { panelId: _omit, ...rest } = values;
  const input = withNumbers(rest, ["panelWeight"]);
  if (rest.rule !== "organiser") delete input.panelWeight;
  const parsed = panelBlendRuleInput.safeParse(input);
  if (!parsed.success) return fromZodError(parsed.error);
  try {
    const r = await setPanelBlendRule(user, id.data.panelId, parsed.data);
    revalidatePath(`/reports/${id.data.panelId}`);
    return done(id.data.panelId, `Blend weight rule: ${r.rule}${r.rule === "organiser" ? ` (w = ${r.panelWeight})` : ""}.`);
  } catch (error) {
    return fromThrown(error);
  }
}
