/**
 * The state a server action hands back to the form that called it: field errors to show beside
 * each field, a form-level message, and optionally a secret (an invitation link or an API token)
 * that is shown once and never stored in readable form.
 */
export interface FormState {
  readonly ok?: boolean;
  readonly message?: string;
  readonly fieldErrors?: Readonly<Record<string, readonly string[] | undefined>>;
  /** Shown once, right after creation (a private link or a token). */
  readonly secret?: { readonly label: string; readonly value: string };
  /** Several secrets at once (e.g. one private link per invited panelist). */
  readonly secrets?: readonly { readonly label: string; readonly value: string }[];
  /**
   * Nothing was saved yet: the server read the input, checked it, and asks to confirm `text`
   * (e.g. the number about to be recorded, with its unit). The form shows it with a button that
   * submits the form again carrying `field` = `value`; the action saves only when that value
   * still matches what the form holds.
   */
  readonly confirm?: { readonly text: string; readonly field: string; readonly value: string; readonly submitLabel: string };
}

export type FormAction = (previous: FormState, formData: FormData) => Promise<FormState>;

export const EMPTY_FORM_STATE: FormState = {};
