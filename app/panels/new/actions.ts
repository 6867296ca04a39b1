"use server";
import { redirect } from "next/navigation";
import { z } from "zod";
import { createPanel } from "@/lib/panels/panels";
import { panelCreate } from "@/lib/validation/inputs";
import type { FormState } from "@/lib/actions/form-state";
import { formObject, withNumbers } from "@/lib/actions/form-result";
import { signedInAction } from "@/lib/actions/signed-in-action";

/** Creates the panel (questions are added on its page) and opens its page. */
export async function createPanelAction(_previous: FormState, formData: FormData): Promise<FormState> {
  const values = formObject(formData);
  return signedInAction({}, z.object({}), async (user, _ids, input) => {
    const { id } = await createPanel(user, input);
    redirect(`/panels/${id}`);
  }, [panelCreate, withNumbers(values, ["consensusThreshold", "stabilityThreshold", "roundLimit"])]);
}
