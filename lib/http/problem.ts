/**
 * The one mapping from errors to `application/problem+json` responses (RFC 9457):
 * - a zod error → 422 with `errors: [{ field: "questions.0.lowerBound", message }]`;
 * - a DomainError → its kind's type, status and title (lib/problem-types.ts) and its detail;
 * - anything else → 500 with a generic text (the error is logged on the server, not sent).
 * `type` is the kind's stable URI, `/problems/<kind>` (RFC 9457 §3.1.1).
 */
import { z } from "zod";
import { DomainError, TooManyRequestsError, type FieldError } from "@/lib/errors";
import { PROBLEM_TYPES, problemTypeUri, type ProblemKind } from "@/lib/problem-types";
import { plainMessage } from "@/lib/validation/messages";

export const PROBLEM_CONTENT_TYPE = "application/problem+json";

export interface ProblemBody {
  readonly type: string;
  readonly title: string;
  readonly status: number;
  readonly detail: string;
  readonly instance?: string;
  readonly errors?: readonly FieldError[];
}

/** The field path of a zod issue, dotted ("questions.0.lowerBound"); "" for the whole body. */
export function fieldOf(path: readonly PropertyKey[]): string {
  return path.map(String).join(".");
}

/** Field errors of a zod error, one per issue, in plain words (`plainMessage`). */
export function zodFieldErrors(err: z.ZodError, prefix = ""): FieldError[] {
  return err.issues.map((i) => ({ field: prefix + fieldOf(i.path), message: plainMessage(i) }));
}

/**
 * A problem+json response of `kind` (lib/problem-types.ts gives its type URI, title and status).
 * 401 carries a Bearer challenge and 429 its Retry-After (through `headers`).
 */
export function problemResponse(
  kind: ProblemKind,
  detail: string,
  options: { instance?: string; errors?: readonly FieldError[]; headers?: Record<string, string> } = {},
): Response {
  const { status, title } = PROBLEM_TYPES[kind];
  const body: ProblemBody = {
    type: problemTypeUri(kind),
    title,
    status,
    detail,
    ...(options.instance ? { instance: options.instance } : {}),
    ...(options.errors && options.errors.length > 0 ? { errors: options.errors } : {}),
  };
  const challenge: Record<string, string> = status === 401 ? { "www-authenticate": 'Bearer realm="triangulate"' } : {};
  return new Response(JSON.stringify(body), {
    status,
    headers: { "content-type": PROBLEM_CONTENT_TYPE, "cache-control": "no-store", ...challenge, ...options.headers },
  });
}

/** Maps any thrown value to a problem+json response (see the module comment). */
export function toProblem(err: unknown, instance?: string): Response {
  if (err instanceof z.ZodError) {
    return problemResponse("validation-failed", "The request has invalid fields; see errors.", { instance, errors: zodFieldErrors(err) });
  }
  if (err instanceof DomainError) {
    const headers: Record<string, string> = err instanceof TooManyRequestsError ? { "retry-after": String(err.retryAfterSeconds) } : {};
    return problemResponse(err.kind, err.message, { instance, errors: err.errors, headers });
  }
  console.error("triangulate: unexpected error", err);
  return problemResponse("server-error", "Something went wrong on the server.", { instance });
}
