"use server";
import { headers } from "next/headers";
import { changePassword } from "@/lib/accounts/users";
import { clientAddress, countPasswordAttempt } from "@/lib/http/rate-limit";
import { passwordChange } from "@/lib/validation/inputs";
import type { FormState } from "@/lib/actions/form-state";
import { formObject } from "@/lib/actions/form-result";
import { signedInAction } from "@/lib/actions/signed-in-action";

/** Changes the password (limited like sign-in); every session ends, this one too. */
export async function changePasswordAction(_previous: FormState, formData: FormData): Promise<FormState> {
  return signedInAction(formObject(formData), passwordChange, async (user, input) => {
    await countPasswordAttempt(clientAddress({ headers: await headers() }), user.email);
    await changePassword(user, input);
    return { ok: true, message: "Password changed. You have been signed out everywhere: sign in again with the new password." };
  });
}
