/**
 * The one mapping from errors to `application/problem+json` responses (RFC 9457):
 * - a zod error → 422 with `errors: [{ field: "questions.0.lowerBound", message }]`;
 * - a DomainError → its own status, title and detail (401, 403, 404, 409, 422, …);
 * - anything else → 500 with a generic text (the error is logged on the server, not sent).
 */
import { z } from "zod";
import { DomainError, TooManyRequestsError, type FieldError } from "@/lib/errors";

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

/** Field errors of a zod error, one per issue. */
export function zodFieldErrors(err: z.ZodError, prefix = ""): FieldError[] {
  return err.issues.map((i) => ({ field: prefix + fieldOf(i.path), message: i.message }));
}

export function problemResponse(body: ProblemBody, headers: Record<string, string> = {}): Response {
  return new Response(JSON.stringify(body), {
    status: body.status,
    headers: { "content-type": PROBLEM_CONTENT_TYPE, "cache-control": "no-store", ...headers },
  });
}

/** Maps any thrown value to a problem+json response (see the module comment). */
export function toProblem(err: unknown, instance?: string): Response {
  if (err instanceof z.ZodError) {
    return problemResponse({
      type: "about:blank",
      title: "Invalid input",
      status: 422,
      detail: "The request has invalid fields; see errors.",
      instance,
      errors: zodFieldErrors(err),
    });
  }
  if (err instanceof DomainError) {
    const headers: Record<string, string> =
      err.status === 401 ? { "www-authenticate": 'Bearer realm="triangulate"' } : err instanceof TooManyRequestsError ? { "retry-after": String(err.retryAfterSeconds) } : {};
    return problemResponse(
      {
        type: "about:blank",
        title: err.title,
        status: err.status,
        detail: err.message,
        instance,
        ...(err.errors.length > 0 ? { errors: err.errors } : {}),
      },
      headers,
    );
  }
  console.error("triangulate: unexpected error", err);
  return problemResponse({ type: "about:blank", title: "Internal Server Error", status: 500, detail: "Something went wrong on the server.", instance });
}
