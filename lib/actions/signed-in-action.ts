/**
 * The fixed path of an organiser's form action: the signed-in user, the text rules and rate
 * limits the JSON API applies (lib/actions/action-guard.ts), the ids carried by the form, the form's
 * input parsed with its zod schema (when the action takes one), then one service call in `run`.
 * zod issues come back as field errors, a thrown DomainError as the form's message
 * (lib/actions/form-result.ts).
 */
import type { ZodType } from "zod";
import type { UserActor } from "../accounts/actor";
import { getCurrentUser } from "../session";
import type { FixedWindowLimiter } from "../http/rate-limit";
import { hitLimit, textProblems } from "./action-guard";
import type { FormState } from "./form-state";
import { fromThrown, fromZodError, typedNumberErrors } from "./form-result";

export const NOT_SIGNED_IN: FormState = { ok: false, message: "Your session has ended; sign in again." };

/**
 * Runs `run(user, ids, input)` after parsing `values` with `ids` and `body[1]` with `body[0]`.
 * @param values the form's entries (see formObject)
 * @param ids schema of the ids the form carries (panelId, questionId, …)
 * @param run the service call; its FormState is returned as is
 * @param body the input schema and the raw input to parse with it, when the action takes one
 * @param limiter the rate limit counted per organiser, when the API counts the same operation
 *   (lib/http/rate-limit.ts `INVITATION_OPERATIONS`)
 */
export async function signedInAction<I, B = undefined>(
  values: Record<string, string>,
  ids: ZodType<I>,
  run: (user: UserActor, id: I, input: B) => Promise<FormState>,
  body?: readonly [ZodType<B>, unknown],
  limiter?: FixedWindowLimiter,
): Promise<FormState> {
  const user = await getCurrentUser();
  if (!user) return NOT_SIGNED_IN;
  const limited = limiter ? await hitLimit(limiter, user.userId) : null;
  if (limited) return limited;
  const refused = textProblems(values, body?.[1]);
  if (refused) return refused;
  const id = ids.safeParse(values);
  if (!id.success) return fromZodError(id.error);
  let input = undefined as B;
  if (body) {
    const unreadable = typedNumberErrors(body[1]);
    if (unreadable) return unreadable;
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
