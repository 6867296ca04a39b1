/**
 * The problem types of the API (RFC 9457 §3.1.1): each kind of error a client may want to tell
 * apart has a stable `type`, a relative URI `/problems/<kind>` resolved against the site that
 * answered (so `https://triangulate.example/problems/round-closed`). Each is a page that explains
 * it (app/problems/[type]/page.tsx) and is listed in the OpenAPI document (lib/http/openapi.ts).
 * Clients match on `type`, never on `detail` (English text that may change).
 * Renaming a kind breaks clients: add new kinds, do not rename.
 */
export const PROBLEM_TYPES = {
  "bad-request": { status: 400, title: "Bad Request", description: "The request body is not JSON, or not UTF-8 text." },
  unauthenticated: {
    status: 401,
    title: "Not authenticated",
    description: "No valid credentials: no session, or an unknown, revoked or expired token. Send 'Authorization: Bearer <token>'.",
  },
  "sign-in-failed": { status: 401, title: "Sign-in failed", description: "The e-mail and password do not match an account." },
  forbidden: { status: 403, title: "Forbidden", description: "You are authenticated but may not do this (role, panel access, or a cross-site request)." },
  "not-found": { status: 404, title: "Not found", description: "No such thing, or it is not visible to you (its existence is not revealed)." },
  "method-not-allowed": { status: 405, title: "Method Not Allowed", description: "The path exists but not with this HTTP method; the Allow header lists the methods." },
  "round-not-open": {
    status: 409,
    title: "Round not open",
    description: "The operation needs an open round and none is open (round 1 has not opened yet, or the round named is not open).",
  },
  "round-closed": { status: 409, title: "Round closed", description: "The round has closed (by hand or by its deadline); answers are no longer accepted. Wait for the next round." },
  "round-still-open": { status: 409, title: "Round still open", description: "A round is open: close it first (before the next round, finishing the panel or recording an outcome)." },
  "round-not-draft": { status: 409, title: "Round not a draft", description: "Only a draft round can be opened; this one is already open or closed." },
  "round-not-closed": { status: 409, title: "Round not closed", description: "Round statistics are computed when the round closes." },
  "round-limit-reached": { status: 409, title: "Round limit reached", description: "The panel has used its round limit: finish the panel or raise the limit." },
  "panel-finished": { status: 409, title: "Panel finished", description: "The panel is finished; it accepts no more changes or answers." },
  "panel-deleted": { status: 409, title: "Panel deleted", description: "The panel of this invitation no longer exists." },
  "panel-has-no-questions": { status: 409, title: "Panel has no questions", description: "Add at least one question before opening a round." },
  "questions-fixed": { status: 409, title: "Questions fixed", description: "Questions cannot change once round 1 has opened; create a new panel to ask something else." },
  "idempotency-key-reused": {
    status: 409,
    title: "Idempotency key reused",
    description: "This Idempotency-Key was already used with a different body. Retry with the same body to get the stored result, or use a new key.",
  },
  "answer-not-stored": { status: 409, title: "Answer not stored", description: "Concurrent writes kept the answer from being stored; send it again." },
  "duplicate-roster-member": { status: 409, title: "Duplicate roster member", description: "A person with this e-mail is already on your roster." },
  "roster-member-invited": { status: 409, title: "Roster member invited", description: "The person has been invited to a panel; their answers refer to them, so they stay on the roster." },
  "already-invited": { status: 409, title: "Already invited", description: "Someone named is already invited to this panel; re-issue their link instead." },
  "already-has-access": { status: 409, title: "Already has access", description: "The user already has access to this panel (for example the owner)." },
  "outcome-recorded": { status: 409, title: "Outcome recorded", description: "The question's outcome is recorded; its baseline and outcome can no longer change except by a correction with a reason." },
  "calibration-question": {
    status: 409,
    title: "Calibration question",
    description: "A calibration question has a true value (PUT …/true-value) instead of a baseline and an outcome; it scores the panelists, it is not triangulated.",
  },
  "no-panel-figure": { status: 409, title: "No panel figure", description: "No closed round has answers to this question, so there is nothing to score yet." },
  "account-exists": { status: 409, title: "Account exists", description: "An account with this e-mail exists, or the first organiser was already created." },
  "smtp-required": {
    status: 409,
    title: "SMTP server required",
    description:
      "Reminders go only to those who have not answered; without an SMTP server (SMTP_URL) they would wait in the outbox, where the organiser would see who they are for. Send the round-opened notice to everyone instead.",
  },
  "too-large": { status: 413, title: "Payload Too Large", description: "The request body is over the size limit (2 MiB on the API, 16 KiB at sign-in)." },
  "validation-failed": { status: 422, title: "Invalid input", description: "The request has invalid fields or path parts; `errors` names each field and what is wrong." },
  "rate-limited": { status: 429, title: "Too Many Requests", description: "Over a rate limit (sign-in, invalid credentials, panelist requests, invitations); Retry-After gives the seconds to wait." },
  "server-error": { status: 500, title: "Internal Server Error", description: "Something went wrong on the server; the response reveals nothing more." },
} as const satisfies Record<string, { status: number; title: string; description: string }>;

export type ProblemKind = keyof typeof PROBLEM_TYPES;
export type ConflictKind = { [K in ProblemKind]: (typeof PROBLEM_TYPES)[K]["status"] extends 409 ? K : never }[ProblemKind];

/** The `type` URI of a problem kind (see the module comment). */
export function problemTypeUri(kind: ProblemKind): string {
  return `/problems/${kind}`;
}

export function isProblemKind(s: string): s is ProblemKind {
  return Object.hasOwn(PROBLEM_TYPES, s);
}
