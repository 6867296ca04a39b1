"use server";
import { revalidatePath } from "next/cache";
import { createApiToken, revokeApiToken } from "@/lib/accounts/users";
import { getCurrentUser } from "@/lib/session";
import { apiTokenCreate, params } from "@/lib/validation/inputs";
import type { FormState } from "@/lib/ui/form-state";
import { formObject, fromThrown, fromZodError } from "@/lib/ui/form-result";

const NOT_SIGNED_IN: FormState = { ok: false, message: "Your session has ended; sign in again." };

/** Creates a personal API token and returns it once for the page to show. */
export async function createTokenAction(_previous: FormState, formData: FormData): Promise<FormState> {
  const user = await getCurrentUser();
  if (!user) return NOT_SIGNED_IN;
  const parsed = apiTokenCreate.safeParse(formObject(formData));
  if (!parsed.success) return fromZodError(parsed.error);
  try {
    const created = await createApiToken(user, parsed.data);
    revalidatePath("/account/tokens");
    return { ok: true, secret: { label: `API token "${created.name}"`, value: created.token } };
  } catch (error) {
    return fromThrown(error);
  }
}

/** Revokes one of the organiser's tokens. */
export async function revokeTokenAction(_previous: FormState, formData: FormData): Promise<FormState> {
  const user = await getCurrentUser();
  if (!user) return NOT_SIGNED_IN;
  const parsed = params.token.safeParse(formObject(formData));
  if (!parsed.success) return fromZodError(parsed.error);
  try {
    await revokeApiToken(user, parsed.data.tokenId);
    revalidatePath("/account/tokens");
    return { ok: true };
  } catch (error) {
    return fromThrown(error);
  }
}
