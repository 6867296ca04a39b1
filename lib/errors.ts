/**
 * Domain errors. Services throw these; lib/http/problem.ts maps each to its HTTP status and an
 * `application/problem+json` body (RFC 9457). Anything that is not a DomainError (or a zod
 * error) becomes a 500 that reveals nothing. Each error carries its problem kind
 * (lib/problem-types.ts), the stable `type` clients match on.
 */
import { PROBLEM_TYPES, type ConflictKind, type ProblemKind } from "@/lib/problem-types";

/** One offending input field, named by its path ("questions.0.lowerBound"). */
export interface FieldError {
  readonly field: string;
  readonly message: string;
  /** For a CSV cell: its row (the header is row 1, as a spreadsheet shows it). */
  readonly row?: number;
  /** For a CSV cell: its column name. */
  readonly column?: string;
}

export class DomainError extends Error {
  readonly status: number;
  readonly title: string;
  /**
   * @param kind the problem type (lib/problem-types.ts), which fixes the status and title
   */
  constructor(
    readonly kind: ProblemKind,
    message: string,
    readonly errors: readonly FieldError[] = [],
  ) {
    super(message);
    this.name = new.target.name;
    this.status = PROBLEM_TYPES[kind].status;
    this.title = PROBLEM_TYPES[kind].title;
  }
}

/** 401: no valid credentials (no session, unknown / revoked / expired token). */
export class NotAuthenticatedError extends DomainError {
  constructor(message = "Sign in, or send an API token or invitation token as 'Authorization: Bearer <token>'.") {
    super("unauthenticated", message);
  }
}

/** 403: authenticated, but this actor may not do this. */
export class ForbiddenError extends DomainError {
  constructor(message = "You are signed in but may not do this.") {
    super("forbidden", message);
  }
}

/** 404: no such thing, or not visible to this actor (existence is not revealed). */
export class NotFoundError extends DomainError {
  constructor(what: string) {
    super("not-found", `${what} was not found.`);
  }
}

/** 409: the request conflicts with the current state; `kind` says which (round closed, panel finished, …). */
export class ConflictError extends DomainError {
  constructor(kind: ConflictKind, message: string) {
    super(kind, message);
  }
}

/** 422: well-formed request whose content breaks a domain rule; names the fields. */
export class InvalidInputError extends DomainError {
  constructor(errors: readonly FieldError[], message = "The request has invalid fields.") {
    super("validation-failed", message, errors);
  }
}

/** 429: over a rate limit (lib/http/rate-limit.ts); the response says when to try again (Retry-After). */
export class TooManyRequestsError extends DomainError {
  constructor(
    readonly retryAfterSeconds: number,
    message = "Too many requests; try again later.",
  ) {
    super("rate-limited", `${message} Retry after ${retryAfterSeconds} s.`);
  }
}
