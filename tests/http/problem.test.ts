/**
 * The one error mapping (lib/http/problem.ts) to application/problem+json (RFC 9457).
 */
import { describe, expect, it } from "vitest";
import { z } from "zod";
import { toProblem } from "../../lib/http/problem";
import { ConflictError, ForbiddenError, InvalidInputError, NotAuthenticatedError, NotFoundError } from "../../lib/errors";
import { panelCreate } from "../../lib/validation/inputs";

describe("toProblem", () => {
  it("maps a zod error to 422 naming each field by its dotted path", async () => {
    const parsed = panelCreate.safeParse({
      title: "",
      questions: [{ text: "q", unit: "u", targetPeriod: "p", lowerBound: 5, upperBound: 1, answerFormat: "single", aggregation: "shared" }],
    });
    expect(parsed.success).toBe(false);
    const res = toProblem((parsed as { error: z.ZodError }).error, "/api/v1/panels");
    expect(res.status).toBe(422);
    expect(res.headers.get("content-type")).toBe("application/problem+json");
    const body = await res.json();
    expect(body).toMatchObject({ type: "/problems/validation-failed", title: "Invalid input", status: 422, instance: "/api/v1/panels" });
    expect(body.errors).toEqual([
      { field: "title", message: "must not be empty" },
      { field: "questions.0.lowerBound", message: "lower bound must be below the upper bound" },
    ]);
  });

  it("maps domain errors to their statuses; 401 carries a Bearer challenge, 403 does not", async () => {
    // Statuses: RFC 9110 §15.5 (401, 403, 404, 409, 422); types: the kinds of lib/problem-types.ts.
    const cases: [Error, number, string][] = [
      [new NotAuthenticatedError(), 401, "/problems/unauthenticated"],
      [new ForbiddenError(), 403, "/problems/forbidden"],
      [new NotFoundError("The panel"), 404, "/problems/not-found"],
      [new ConflictError("round-not-open", "Round 2 is closed, not open."), 409, "/problems/round-not-open"],
      [new ConflictError("panel-finished", "The panel is finished."), 409, "/problems/panel-finished"],
      [new InvalidInputError([{ field: "rationale", message: "required" }]), 422, "/problems/validation-failed"],
    ];
    for (const [err, status, type] of cases) {
      const res = toProblem(err);
      expect(res.status).toBe(status);
      const body = await res.json();
      expect(body.detail).toBe(err.message);
      expect(body.type).toBe(type);
      expect(res.headers.has("www-authenticate")).toBe(status === 401);
    }
  });

  it("turns anything else into a 500 that reveals nothing", async () => {
    const original = console.error;
    console.error = () => {};
    try {
      const res = toProblem(new Error("SQLITE_CORRUPT at /srv/secret/path.db"));
      expect(res.status).toBe(500);
      const text = await res.text();
      expect(text).not.toMatch(/SQLITE|secret|path\.db/);
      expect(JSON.parse(text)).toEqual({ type: "/problems/server-error", title: "Internal Server Error", status: 500, detail: "Something went wrong on the server." });
    } finally {
      console.error = original;
    }
  });
});
