"use server";
import { revalidatePath } from "next/cache";
import { addRosterMember, deleteRosterMember, updateRosterMember } from "@/lib/panels/roster";
import { getCurrentUser } from "@/lib/session";
import { params, rosterMemberInput, rosterMemberUpdate } from "@/lib/validation/inputs";
import type { FormState } from "@/lib/ui/form-state";
import { formObject, fromThrown, fromZodError } from "@/lib/ui/form-result";

const NOT_SIGNED_IN: FormState = { ok: false, message: "Your session has ended; sign in again." };

/** Adds a person to the organiser's expert roster. */
export async function addMemberAction(_previous: FormState, formData: FormData): Promise<FormState> {
  const user = await getCurrentUser();
  if (!user) return NOT_SIGNED_IN;
  const parsed = rosterMemberInput.safeParse(formObject(formData));
  if (!parsed.success) return fromZodError(parsed.error);
  try {
    const member = await addRosterMember(user, parsed.data);
    revalidatePath("/roster");
    return { ok: true, message: `${member.name} was added to your roster.` };
  } catch (error) {
    return fromThrown(error);
  }
}

/** Changes a roster member's name, e-mail or group. */
export async function updateMemberAction(_previous: FormState, formData: FormData): Promise<FormState> {
  const user = await getCurrentUser();
  if (!user) return NOT_SIGNED_IN;
  const values = formObject(formData);
  const id = params.member.safeParse(values);
  const parsed = rosterMemberUpdate.safeParse(values);
  if (!id.success) return fromZodError(id.error);
  if (!parsed.success) return fromZodError(parsed.error);
  try {
    await updateRosterMember(user, id.data.memberId, parsed.data);
    revalidatePath("/roster");
    return { ok: true, message: "Saved." };
  } catch (error) {
    return fromThrown(error);
  }
}

/** Removes a roster member who has not been invited to any panel. */
export async function deleteMemberAction(_previous: FormState, formData: FormData): Promise<FormState> {
  const user = await getCurrentUser();
  if (!user) return NOT_SIGNED_IN;
  const id = params.member.safeParse(formObject(formData));
  if (!id.success) return fromZodError(id.error);
  try {
    await deleteRosterMember(user, id.data.memberId);
    revalidatePath("/roster");
    return { ok: true };
  } catch (error) {
    return fromThrown(error);
  }
}
