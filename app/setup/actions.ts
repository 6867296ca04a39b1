"use server";
import { redirect } from "next/navigation";
import { createFirstOrganiser } from "@/lib/accounts/users";
import { setupInput } from "@/lib/validation/inputs";
import type { FormState } from "@/lib/actions/form-state";
import { formObject, fromThrown, fromZodError } from "@/lib/actions/form-result";
import { textProblems } from "@/lib/actions/action-guard";

/** Creates the first organiser (refused by the service once one exists), then asks them to sign in. */
export async function createFirstOrganiserAction(_previous: FormState, formData: FormData): Promise<FormState> {
  const values = formObject(formData);
  const refused = textProblems(values);
  if (refused) return refused;
  const parsed = setupInput.safeParse(values);
  if (!parsed.success) return fromZodError(parsed.error);
  try {
    await createFirstOrganiser(parsed.data);
  } catch (error) {
    return fromThrown(error);
  }
  redirect("/sign-in?created=1");
}
