"use server";
import { revalidatePath } from "next/cache";
import { submitAnswer } from "@/lib/panels/answers";
import { answerInput } from "@/lib/validation/inputs";
import type { FormState } from "@/lib/ui/form-state";
import { formObject, fromThrown, fromZodError, withNumbers } from "@/lib/ui/form-result";
import { panelistForAction, textProblems } from "@/lib/ui/action-guard";

/**
 * Stores a new version of the panelist's answer (the token is bound by the page: it is the
 * panelist's own link). The same limits and text rules as the API's answer route
 * (lib/ui/action-guard.ts); field errors from the schema or the service appear beside the fields.
 */
export async function submitAnswerAction(token: unknown, _previous: FormState, formData: FormData): Promise<FormState> {
  const values = formObject(formData);
  const refused = textProblems(values);
  if (refused) return refused;
  const panelist = await panelistForAction(typeof token === "string" ? token : "");
  if ("state" in panelist) return panelist.state;
  const parsed = answerInput.safeParse(withNumbers(values, ["value", "low", "high"]));
  if (!parsed.success) return fromZodError(parsed.error, "The answer was not stored: correct the fields marked below.");
  try {
    const { answer } = await submitAnswer(panelist.actor, parsed.data);
    revalidatePath(`/p/${token}`);
    return { ok: true, message: `Your answer was saved (version ${answer.version}). You can revise it until the round closes.` };
  } catch (error) {
    return fromThrown(error);
  }
}
