"use server";
import { revalidatePath } from "next/cache";
import { redirect } from "next/navigation";
import { ConflictError } from "@/lib/errors";
import { headers } from "next/headers";
import type { PanelistActor } from "@/lib/accounts/actor";
import { limits } from "@/lib/http/rate-limit";
import { getPanelistPanel, submitAnswer } from "@/lib/panels/answers";
import { answerInput } from "@/lib/validation/inputs";
import type { FormState } from "@/lib/actions/form-state";
import { byField, formObject, fromThrown, fromZodError, typedNumberErrors, withNumbers } from "@/lib/actions/form-result";
import { hitLimit, panelistForAction, textProblems } from "@/lib/actions/action-guard";

const NUMBERS = ["value", "low", "high"] as const;
const NOT_STORED = "The answer was not stored: correct the fields marked below.";

/** The panelist's locale: what their browser sent with the form (lib/ui/typed-number-input.tsx), else Accept-Language. */
async function localeOf(values: Record<string, string>): Promise<string> {
  const sent = values.locale?.trim();
  if (sent && sent.length <= 35) return sent;
  const accept = (await headers()).get("accept-language") ?? "";
  return accept.split(",")[0]?.split(";")[0]?.trim().slice(0, 35) || "en";
}

/**
 * One answer from the form's fields (already without any prefix): read in `locale`, parsed with
 * the API's schema, stored by the same service. Returns the state for that question's fields.
 */
async function storeOne(actor: PanelistActor, fields: Record<string, string>, locale: string): Promise<FormState & { version?: number; late?: boolean }> {
  const input = withNumbers(fields, NUMBERS, locale);
  const unreadable = typedNumberErrors(input);
  if (unreadable) return { ...unreadable, message: NOT_STORED };
  const parsed = answerInput.safeParse(input);
  if (!parsed.success) return fromZodError(parsed.error, NOT_STORED);
  try {
    const { answer } = await submitAnswer(actor, parsed.data);
    return { ok: true, version: answer.version };
  } catch (error) {
    // Too late: the round closed (or the panel finished) since the page was loaded.
    const late = error instanceof ConflictError && (error.kind === "round-closed" || error.kind === "panel-finished");
    return { ...fromThrown(error), late };
  }
}

/**
 * After an answer that came too late, the page again, so that it shows the closed round (not the
 * open round it showed when the form was filled) and says the answer was not stored.
 */
function showLate(token: unknown): never {
  revalidatePath(`/p/${token}`);
  redirect(`/p/${typeof token === "string" ? token : ""}?late=1`);
}

/** Stores the panelist's final answer of the previous round again, as this round's answer ("keep my answer"). */
async function keepPrevious(actor: PanelistActor, questionId: string): Promise<FormState & { version?: number; late?: boolean }> {
  const q = (await getPanelistPanel(actor)).questions.find((x) => x.id === questionId);
  const prev = q?.previousAnswer;
  if (!prev) return { ok: false, message: "There is no answer from the previous round to keep." };
  const fields: Record<string, string> = { questionId, value: String(prev.value), rationale: prev.rationale };
  if (prev.low !== null) fields.low = String(prev.low);
  if (prev.high !== null) fields.high = String(prev.high);
  return storeOne(actor, fields, "en");
}

/**
 * Stores a new version of the panelist's answer (the token is bound by the page: it is the
 * panelist's own link). The same limits and text rules as the API's answer route
 * (lib/actions/action-guard.ts); field errors from the schema or the service appear beside the fields.
 * A "keep" submit button stores last round's answer again instead of the typed fields.
 */
export async function submitAnswerAction(token: unknown, _previous: FormState, formData: FormData): Promise<FormState> {
  const values = formObject(formData);
  const refused = textProblems(values);
  if (refused) return refused;
  const panelist = await panelistForAction(typeof token === "string" ? token : "");
  if ("state" in panelist) return panelist.state;
  const stored = values.keep ? await keepPrevious(panelist.actor, values.keep) : await storeOne(panelist.actor, values, await localeOf(values));
  if (stored.late) showLate(token);
  if (!stored.ok) return stored;
  revalidatePath(`/p/${token}`);
  return { ok: true, message: `Your answer was saved (version ${stored.version}). You can revise it until the round closes.` };
}

/**
 * "Save all": the answers to several questions in one form, fields named `q<i>.<field>`. A
 * question left empty is skipped, and so is one whose fields equal the answer already stored in
 * this round (`q<i>.current`, so that saving twice adds no versions). Each stored answer counts
 * against the panelist's rate limit as an API request would. Errors come back on `q<i>.<field>`.
 */
export async function submitAllAnswersAction(token: unknown, _previous: FormState, formData: FormData): Promise<FormState> {
  const values = formObject(formData);
  const refused = textProblems(values);
  if (refused) return refused;
  const panelist = await panelistForAction(typeof token === "string" ? token : "");
  if ("state" in panelist) return panelist.state;
  if (values.keep) {
    const kept = await keepPrevious(panelist.actor, values.keep);
    if (kept.late) showLate(token);
    if (!kept.ok) return kept;
    revalidatePath(`/p/${token}`);
    return { ok: true, message: "Your answer from the last round is kept for this round." };
  }
  const locale = await localeOf(values);
  const indices = Object.keys(values)
    .map((k) => /^q(\d{1,3})\.questionId$/.exec(k)?.[1])
    .filter((i): i is string => i !== undefined);
  const errors: { field: string; message: string }[] = [];
  const messages: string[] = [];
  let saved = 0;
  let first = true;
  for (const i of indices) {
    const fields: Record<string, string> = {};
    for (const f of ["questionId", "value", "low", "high", "rationale"]) if (values[`q${i}.${f}`] !== undefined) fields[f] = values[`q${i}.${f}`];
    if (NUMBERS.every((f) => (fields[f] ?? "").trim() === "")) continue;
    const current = values[`q${i}.current`];
    const typed = withNumbers(fields, NUMBERS, locale);
    if (current && current === JSON.stringify([typed.value ?? null, typed.low ?? null, typed.high ?? null, (fields.rationale ?? "").trim()])) continue;
    if (!first) {
      const limited = await hitLimit(limits.panelist, panelist.actor.invitationId);
      if (limited) return limited;
    }
    first = false;
    const stored = await storeOne(panelist.actor, fields, locale);
    if (stored.late && saved === 0) showLate(token);
    if (stored.ok) saved++;
    else {
      for (const [field, list] of Object.entries(stored.fieldErrors ?? {})) for (const message of list ?? []) errors.push({ field: `q${i}.${field}`, message });
      if (!stored.fieldErrors || Object.keys(stored.fieldErrors).length === 0) messages.push(`Question ${Number(i) + 1}: ${stored.message}`);
    }
  }
  if (saved > 0) revalidatePath(`/p/${token}`);
  const savedText = saved === 0 ? "Nothing new was saved." : `${saved} answer${saved === 1 ? " was" : "s were"} saved; you can revise them until the round closes.`;
  if (errors.length > 0 || messages.length > 0) {
    return { ok: false, message: [`${savedText} Some answers were not stored: correct the fields marked below.`, ...messages].join(" "), fieldErrors: byField(errors) };
  }
  return { ok: true, message: savedText };
}
