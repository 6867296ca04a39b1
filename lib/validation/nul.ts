/**
 * Text every way in refuses before any schema (the JSON API's bodies and path parameters,
 * server actions' form fields and arguments):
 * - the NUL character (U+0000): PostgreSQL's text type cannot hold it (the insert would fail with
 *   a server error), and no field of this app has a use for it. Refusing it on SQLite too keeps
 *   both databases accepting the same input;
 * - a lone UTF-16 surrogate (e.g. the JSON escape "\ud800" without its pair): it is not a
 *   character, cannot be encoded as UTF-8 for the database, and would fail there;
 * - values nested more than MAX_DEPTH levels (no request of this app nests more than a few), so
 *   that a body nested 10,000 deep is refused instead of exhausting the stack of a walk over it.
 * The walk is iterative.
 */
import type { FieldError } from "../errors";

export const NUL_MESSAGE = "must not contain the NUL character (U+0000)";
export const SURROGATE_MESSAGE = "must be valid Unicode text (it has a lone UTF-16 surrogate)";
export const MAX_DEPTH = 32;
export const DEPTH_MESSAGE = `is nested more than ${MAX_DEPTH} levels deep`;

/** A surrogate code unit that is not half of a pair (with the u flag, pairs read as one code point). */
const LONE_SURROGATE = /\p{Cs}/u;

function textProblem(s: string): string | null {
  if (s.includes("\u0000")) return NUL_MESSAGE;
  return LONE_SURROGATE.test(s) ? SURROGATE_MESSAGE : null;
}

/** One error per string (or object key) in `value` that breaks the rules above, named by its path. */
export function textFieldErrors(value: unknown): FieldError[] {
  const errors: FieldError[] = [];
  const stack: { value: unknown; path: string; depth: number }[] = [{ value, path: "", depth: 0 }];
  while (stack.length > 0) {
    const { value: v, path, depth } = stack.pop()!;
    if (typeof v === "string") {
      const problem = textProblem(v);
      if (problem) errors.push({ field: path || "body", message: problem });
      continue;
    }
    if (v === null || typeof v !== "object") continue;
    if (depth >= MAX_DEPTH) {
      errors.push({ field: path || "body", message: DEPTH_MESSAGE });
      continue;
    }
    const entries = Object.entries(v);
    for (let i = entries.length - 1; i >= 0; i--) {
      const [k, child] = entries[i];
      const at = Array.isArray(v) ? `${path}[${k}]` : path ? `${path}.${k}` : k;
      const keyProblem = textProblem(k);
      if (keyProblem) errors.push({ field: at, message: keyProblem });
      stack.push({ value: child, path: at, depth: depth + 1 });
    }
  }
  return errors;
}
