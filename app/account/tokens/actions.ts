"use server";
import { revalidatePath } from "next/cache";
import { z } from "zod";
import { createApiToken, revokeApiToken } from "@/lib/accounts/users";
import { apiTokenCreate, params } from "@/lib/validation/inputs";
import type { FormState } from "@/lib/actions/form-state";
import { formObject, withNumbers } from "@/lib/actions/form-result";
import { signedInAction } from "@/lib/actions/signed-in-action";

/** Creates a personal API token and returns it once for the page to show. */
export async function createTokenAction(_previous: FormState, formData: FormData): Promise<FormState> {
  const values = formObject(formData);
  return signedInAction(
    values,
    z.object({}),
    async (user, _ids, input) => {
      const created = await createApiToken(user, input);
      revalidatePath("/account/tokens");
      return { ok: true, secret: { label: `API token "${created.name}"`, value: created.token } };
    },
    [apiTokenCreate, withNumbers(values, ["expiresInDays"])],
  );
}

/** Revokes one of the organiser's tokens. */
export async function revokeTokenAction(_previous: FormState, formData: FormData): Promise<FormState> {
  return signedInAction(formObject(formData), params.token, async (user, id) => {
    await revokeApiToken(user, id.tokenId);
    revalidatePath("/account/tokens");
    return { ok: true };
  });
}
