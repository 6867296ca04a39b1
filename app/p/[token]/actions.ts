"use server";
import { revalidatePath } from "next/cache";
import { actorFromInvitationToken } from "@/lib/accounts/actor";
import { submitAnswer } from "@/lib/panels/answers";
import { answerInput } from "@/lib/validation/inputs";
import type { FormState } from "@/lib/ui/form-state";
import { formObject, fromThrown, fromZodError, withNumbers } from "@/lib/ui/form-result";

/**
 * Stores a new version of the panelist's answer (the token is bound by the page: it is the
 * panelist's own link). Field errors from the schema or the service appear beside the fields.
 */
export async function submitAnswerAction(token: string, _previous: FormState, formData: FormData): Promise<FormState> {
  const parsed = answerInput.safeParse(withNumbers(formObject(formData), ["value", "low", "high"]));
  if (!parsed.success) return fromZodError(parsed.error, "The answer was not stored: correct the fields marked below.");
  try {
    const actor = await actorFromInvitationToken(token);
    const { answer } = await submitAnswer(actor, parsed.data);
    revalidatePath(`/p/${token}`);
    return { ok: true, message: `Your answer was saved (version ${answer.version}). You can revise it until the round closes.` };
  } catch (error) {
    return fromThrown(error);
  }
}
