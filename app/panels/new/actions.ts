"use server";
import { redirect } from "next/navigation";
import { createPanel } from "@/lib/panels/panels";
import { getCurrentUser } from "@/lib/session";
import { panelCreate } from "@/lib/validation/inputs";
import type { FormState } from "@/lib/ui/form-state";
import { formObject, fromThrown, fromZodError, withNumbers } from "@/lib/ui/form-result";

/** Creates the panel (questions are added on its page) and opens its page. */
export async function createPanelAction(_previous: FormState, formData: FormData): Promise<FormState> {
  const user = await getCurrentUser();
  if (!user) return { ok: false, message: "Your session has ended; sign in again." };
  const parsed = panelCreate.safeParse(
    withNumbers(formObject(formData), ["consensusThreshold", "stabilityThreshold", "roundLimit"]),
  );
  if (!parsed.success) return fromZodError(parsed.error);
  let id: string;
  try {
    id = (await createPanel(user, parsed.data)).id;
  } catch (error) {
    return fromThrown(error);
  }
  redirect(`/panels/${id}`);
}
