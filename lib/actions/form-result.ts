/**
 * Turns what a server action meets into the FormState its form shows: zod issues become field
 * errors keyed by the field's path, a DomainError (lib/errors.ts) becomes its message plus the
 * fields it names, anything else a message that reveals nothing.
 */
import type { ZodError } from "zod";
import { DomainError } from "../errors";
import { parseTypedNumber } from "../validation/typed-number";
import { plainMessage } from "../validation/messages";
import type { FormState } from "./form-state";

/**
 * Messages grouped by field, as a FormState's `fieldErrors`. Grouped in a Map first, so that a
 * field named `__proto__` or `constructor` is a key like any other (not Object's own).
 */
export function byField(errors: Iterable<{ readonly field: string; readonly message: string }>): Record<string, string[]> {
  const grouped = new Map<string, string[]>();
  for (const e of errors) grouped.set(e.field, [...(grouped.get(e.field) ?? []), e.message]);
  return Object.fromEntries(grouped);
}

/** Field errors from a failed zod safeParse. */
export function fromZodError(error: ZodError, message = "Please correct the fields marked below."): FormState {
  const fieldErrors = byField(error.issues.map((issue) => ({ field: issue.path.map(String).join(".") || "form", message: plainMessage(issue) })));
  return { ok: false, message, fieldErrors };
}

/** Where withNumbers keeps what it could not read, beside the entries (a symbol key, never a form field). */
const TYPED_NUMBER_ERRORS = Symbol("typed number errors");

/**
 * Form entries converted for a schema that wants numbers: each named field is read with
 * lib/validation/typed-number.ts in the person's `locale` (default "en") and becomes a number,
 * is left out when empty (so an optional field takes its default), or — when it cannot be read —
 * is left out and its message kept for `typedNumberErrors` (so it never reads as "required").
 */
export function withNumbers(values: Readonly<Record<string, unknown>>, numberFields: readonly string[], locale?: string): Record<string, unknown> {
  const out: Record<string, unknown> = { ...values };
  const errors: { field: string; message: string }[] = [];
  for (const f of numberFields) {
    const raw = values[f];
    const read = parseTypedNumber(typeof raw === "string" ? raw : "", locale);
    if ("value" in read) out[f] = read.value;
    else {
      delete out[f];
      if ("error" in read) errors.push({ field: f, message: read.error });
    }
  }
  // Not enumerable: zod, JSON and equality checks see only the entries.
  Object.defineProperty(out, TYPED_NUMBER_ERRORS, { value: errors, enumerable: false });
  return out;
}

/** The form state for the number fields withNumbers could not read in `input`, or null when there are none. */
export function typedNumberErrors(input: unknown): FormState | null {
  const errors = input !== null && typeof input === "object" ? ((input as Record<symbol, unknown>)[TYPED_NUMBER_ERRORS] as { field: string; message: string }[] | undefined) : undefined;
  return errors && errors.length > 0 ? { ok: false, message: "Please correct the fields marked below.", fieldErrors: byField(errors) } : null;
}

/** A thrown error as a FormState; rethrows Next's redirect / not-found signals. */
export function fromThrown(error: unknown): FormState {
  if (error instanceof DomainError) return { ok: false, message: error.message, fieldErrors: byField(error.errors) };
  if (isNextSignal(error)) throw error;
  console.error(error);
  return { ok: false, message: "Something went wrong on the server; nothing was changed. Please try again." };
}

function isNextSignal(error: unknown): boolean {
  const digest = (error as { digest?: unknown } | null)?.digest;
  return typeof digest === "string" && (digest.startsWith("NEXT_REDIRECT") || digest.startsWith("NEXT_HTTP_ERROR") || digest === "NEXT_NOT_FOUND");
}

/**
 * The form's entries as a plain object of strings (files are dropped), ready for safeParse.
 * A server action's arguments come from the client as sent: anything but a FormData reads as
 * an empty form (the schema then names the missing fields).
 */
export function formObject(formData: unknown): Record<string, string> {
  const out = new Map<string, string>();
  if (!isFormData(formData)) return {};
  for (const [key, value] of formData.entries()) {
    if (typeof value === "string" && !key.startsWith("$ACTION")) out.set(key, value);
  }
  return Object.fromEntries(out);
}

/** Every string the form holds under `key` (a multiple select); none when it is not a FormData. */
export function formList(formData: unknown, key: string): string[] {
  return isFormData(formData) ? formData.getAll(key).filter((v): v is string => typeof v === "string") : [];
}

/**
 * True for a FormData. Checked by shape: the framework decodes an action's form with its own
 * FormData class, which is not the global one `instanceof` would compare with.
 */
function isFormData(value: unknown): value is FormData {
  const f = value as FormData | null;
  return typeof f === "object" && f !== null && typeof f.entries === "function" && typeof f.getAll === "function" && Object.prototype.toString.call(f) === "[object FormData]";
}
