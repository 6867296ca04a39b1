"use server";
import { revalidatePath } from "next/cache";
import { addRosterMember, deleteRosterMember, updateRosterMember } from "@/lib/panels/roster";
import { params, rosterMemberInput, rosterMemberUpdate } from "@/lib/validation/inputs";
import type { FormState } from "@/lib/actions/form-state";
import { formObject } from "@/lib/actions/form-result";
import { signedInAction } from "@/lib/actions/signed-in-action";

/** Adds a person to the organiser's expert roster. */
export async function addMemberAction(_previous: FormState, formData: FormData): Promise<FormState> {
  return signedInAction(formObject(formData), rosterMemberInput, async (user, input) => {
    const member = await addRosterMember(user, input);
    revalidatePath("/roster");
    return { ok: true, message: `${member.name} was added to your roster.` };
  });
}

/** Changes a roster member's name, e-mail or group. */
export async function updateMemberAction(_previous: FormState, formData: FormData): Promise<FormState> {
  const values = formObject(formData);
  return signedInAction(values, params.member, async (user, id, input) => {
    await updateRosterMember(user, id.memberId, input);
    revalidatePath("/roster");
    return { ok: true, message: "Saved." };
  }, [rosterMemberUpdate, values]);
}

/** Removes a roster member who has not been invited to any panel. */
export async function deleteMemberAction(_previous: FormState, formData: FormData): Promise<FormState> {
  return signedInAction(formObject(formData), params.member, async (user, id) => {
    await deleteRosterMember(user, id.memberId);
    revalidatePath("/roster");
    return { ok: true };
  });
}
