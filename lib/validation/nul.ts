/**
 * Text with the NUL character (U+0000) is refused everywhere, before any schema: PostgreSQL's
 * text type cannot hold it (the insert would fail with a server error), and no field of this app
 * has a use for it. Refusing it on SQLite too keeps both databases accepting the same input.
 */
import type { FieldError } from "../errors";

export const NUL_MESSAGE = "must not contain the NUL character (U+0000)";

/** One error per string (or object key) in `value` that holds U+0000, named by its path. */
export function nulFieldErrors(value: unknown, path = ""): FieldError[] {
  if (typeof value === "string") return value.includes("\u0000") ? [{ field: path || "body", message: NUL_MESSAGE }] : [];
  if (value === null || typeof value !== "object") return [];
  const errors: FieldError[] = [];
  for (const [k, v] of Object.entries(value)) {
    const at = Array.isArray(value) ? `${path}[${k}]` : path ? `${path}.${k}` : k;
    if (k.includes("\u0000")) errors.push({ field: at, message: NUL_MESSAGE });
    errors.push(...nulFieldErrors(v, at));
  }
  return errors;
}
