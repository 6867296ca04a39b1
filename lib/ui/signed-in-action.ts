/**
 * The fixed path of an organiser's form action: the signed-in user, the ids carried by the form,
 * the form's input parsed with its zod schema (when the action takes one), then one service call
 * in `run`. zod issues come back as field errors, a thrown DomainError as the form's message
 * (lib/ui/form-result.ts).
 */
import type { ZodType } from "zod";
import type { UserActor } from "../accounts/actor";
import { getCurrentUser } from "../session";
import { nulFieldErrors } from "../validation/nul";
import type { FormState } from "./form-state";
import { fromThrown, fromZodError } from "./form-result";

export const NOT_SIGNED_IN: FormState = { ok: false, message: "Your session has ended; sign in again." };

/**
 * Runs `run(user, ids, input)` after parsing `values` with `ids` and `body[1]` with `body[0]`.
 * @param values the form's entries (see formObject)
 * @param ids schema of the ids the form carries (panelId, questionId, …)
 * @param run the service call; its FormState is returned as is
 * @param body the input schema and the raw input to parse with it, when the action takes one
 */
export async function signedInAction<I, B = undefined>(
  values: Record<string, string>,
  ids: ZodType<I>,
  run: (user: UserActor, id: I, input: B) => Promise<FormState>,
  body?: readonly [ZodType<B>, unknown],
): Promise<FormState> {
  const user = await getCurrentUser();
  if (!user) return NOT_SIGNED_IN;
  const nul = nulFieldErrors([values, body?.[1]]).map((e) => ({ ...e, field: e.field.replace(/^\[\d+\]\.?/, "") || "form" }));
  if (nul.length > 0) return { ok: false, message: "Please correct the fields marked below.", fieldErrors: Object.fromEntries(nul.map((e) => [e.field, [e.message]])) };
  const id = ids.safeParse(values);
  if (!id.success) return fromZodError(id.error);
  let input = undefined as B;
  if (body) {
    const parsed = body[0].safeParse(body[1]);
    if (!parsed.success) return fromZodError(parsed.error);
    input = parsed.data;
  }
  try {
    return await run(user, id.data, input);
  } catch (error) {
    return fromThrown(error);
  }
}
