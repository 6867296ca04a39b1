"use server";
import { revalidatePath } from "next/cache";
import { createApiToken, revokeApiToken } from "@/lib/accounts/users";
import { apiTokenCreate, params } from "@/lib/validation/inputs";
import type { FormState } from "@/lib/ui/form-state";
import { formObject } from "@/lib/ui/form-result";
import { signedInAction } from "@/lib/ui/signed-in-action";

/** Creates a personal API token and returns it once for the page to show. */
export async function createTokenAction(_previous: FormState, formData: FormData): Promise<FormState> {
  return signedInAction(formObject(formData), apiTokenCreate, async (user, input) => {
    const created = await createApiToken(user, input);
    revalidatePath("/account/tokens");
    return { ok: true, secret: { label: `API token "${created.name}"`, value: created.token } };
  });
}

/** Revokes one of the organiser's tokens. */
export async function revokeTokenAction(_previous: FormState, formData: FormData): Promise<FormState> {
  return signedInAction(formObject(formData), params.token, async (user, id) => {
    await revokeApiToken(user, id.tokenId);
    revalidatePath("/account/tokens");
    return { ok: true };
  });
}
