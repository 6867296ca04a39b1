/**
 * The checks every server action makes before it parses its input, the same as the JSON API's
 * route builder (lib/http/handler.ts): text rules (NUL, lone surrogates, nesting depth;
 * lib/validation/nul.ts) and rate limits (lib/http/rate-limit.ts: per invitation for a panelist,
 * per organiser for invitations, per address for invitation links that do not resolve).
 * Each returns the FormState to show, or null when the input may go on.
 */
import { headers } from "next/headers";
import type { PanelistActor } from "../accounts/actor";
import { clientAddress, limits, type FixedWindowLimiter } from "../http/rate-limit";
import { textFieldErrors } from "../validation/nul";
import type { FormState } from "./form-state";
import { byField } from "./form-result";
import { panelistFromLink } from "../ui/panelist-access";

/** Field errors for text the app refuses anywhere in `values` (named by field; `form` when unnamed). */
export function textProblems(...values: unknown[]): FormState | null {
  const errors = textFieldErrors(values).map((e) => ({ ...e, field: e.field.replace(/^\[\d+\]\.?/, "") || "form" }));
  return errors.length === 0 ? null : { ok: false, message: "Please correct the fields marked below.", fieldErrors: byField(errors) };
}

/** The state shown when a limit is exceeded. */
export function tooMany(retryAfterSeconds: number): FormState {
  return { ok: false, message: `Too many requests; nothing was changed. Try again in ${retryAfterSeconds} s.` };
}

/** Counts one hit on `limiter` for `key`: the state to show when it is over the limit, else null. */
export async function hitLimit(limiter: FixedWindowLimiter, key: string): Promise<FormState | null> {
  const wait = await limiter.hit(key);
  return wait === null ? null : tooMany(wait);
}

/** The calling client's address, read as the API reads it (lib/http/rate-limit.ts `clientAddress`). */
export async function actionClientAddress(): Promise<string> {
  const h = await headers();
  return clientAddress({ headers: h } as Request);
}

/**
 * The panelist behind an invitation token given to a server action, checked as the API checks
 * a panelist's request: an address with too many links that did not resolve is refused; a
 * link that does not resolve counts against its address; each request counts against the
 * invitation's limit.
 */
export async function panelistForAction(token: string): Promise<{ actor: PanelistActor } | { state: FormState }> {
  const address = await actionClientAddress();
  const blocked = await limits.badTokens.blocked(address);
  if (blocked !== null) return { state: tooMany(blocked) };
  const link = await panelistFromLink(token);
  if ("problem" in link) {
    await limits.badTokens.hit(address);
    return { state: { ok: false, message: link.problem } };
  }
  const limited = await hitLimit(limits.panelist, link.actor.invitationId);
  return limited ? { state: limited } : link;
}
