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
}

export type FormAction = (previous: FormState, formData: FormData) => Promise<FormState>;

export const EMPTY_FORM_STATE: FormState = {};
