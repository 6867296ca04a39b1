/**
 * Turns what a server action meets into the FormState its form shows: zod issues become field
 * errors keyed by the field's path, a DomainError (lib/errors.ts) becomes its message plus the
 * fields it names, anything else a message that reveals nothing.
 */
import type { ZodError } from "zod";
import { DomainError } from "../errors";
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
  const fieldErrors = byField(error.issues.map((issue) => ({ field: issue.path.map(String).join(".") || "form", message: readable(issue) })));
  return { ok: false, message, fieldErrors };
}

/** zod's type messages ("expected number, received undefined") in plain words. */
function readable(issue: ZodError["issues"][number]): string {
  if (issue.code === "invalid_type") {
    const expected = (issue as { expected?: string }).expected;
    const missing = (issue as { input?: unknown }).input === undefined;
    if (missing) return "required";
    if (expected === "number") return "must be a number";
  }
  return issue.message;
}

/**
 * Form entries converted for a schema that wants numbers: each named field becomes a number
 * when it holds one, is left out when empty (so an optional field takes its default), and is
 * kept as the typed text otherwise (the schema then reports it as "must be a number").
 */
export function withNumbers(values: Record<string, string>, numberFields: readonly string[]): Record<string, unknown> {
  const out: Record<string, unknown> = { ...values };
  for (const f of numberFields) {
    const raw = values[f]?.trim() ?? "";
    if (raw === "") delete out[f];
    else {
      // Spaces and English thousands separators ("12,500") are accepted; "1,5" is not a number.
      const compact = raw.replace(/[\s_]/g, "");
      const n = Number(/^-?\d{1,3}(,\d{3})+(\.\d+)?$/.test(compact) ? compact.replace(/,/g, "") : compact);
      out[f] = Number.isFinite(n) ? n : raw;
    }
  }
  return out;
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
