/**
 * lib/validation/messages.ts `plainMessage`: zod 4's built-in messages become plain sentences;
 * the project's own messages pass through. The zod messages on the left are zod 4's defaults as
 * printed by this zod version (asserted below, so a change of wording in zod fails here first).
 */
import { describe, expect, it } from "vitest";
import { z } from "zod";
import { plainMessage } from "../../lib/validation/messages";

const issues = (schema: z.ZodType, value: unknown) => schema.safeParse(value).error!.issues;

describe("plainMessage", () => {
  it("turns zod's range messages into sentences", () => {
    const [small] = issues(z.number().int().min(1), 0);
    expect(small.message).toBe("Too small: expected number to be >=1");
    expect(plainMessage(small)).toBe("must be at least 1");
    expect(plainMessage(issues(z.number().max(10000), 12000)[0])).toBe("must be at most 10,000");
    expect(plainMessage(issues(z.number().gt(0), 0)[0])).toBe("must be more than 0");
    expect(plainMessage(issues(z.string().max(3), "abcd")[0])).toBe("must be at most 3 characters long");
    expect(plainMessage(issues(z.string().min(1), "")[0])).toBe("required");
    expect(plainMessage(issues(z.array(z.number()).min(1), [])[0])).toBe("needs at least 1 item");
  });

  it("names a missing field, a wrong type, an option list and an unknown key plainly", () => {
    const [missing] = issues(z.object({ n: z.number() }), {});
    expect(missing.message).toBe("Invalid input: expected number, received undefined");
    expect(plainMessage(missing)).toBe("required");
    expect(plainMessage(issues(z.number(), "x")[0])).toBe("must be a number");
    expect(plainMessage(issues(z.number().int(), 0.5)[0])).toBe("must be a whole number");
    expect(plainMessage(issues(z.enum(["shared", "sum-of-parts"]), "q")[0])).toBe("must be one of: shared, sum-of-parts");
    expect(plainMessage(issues(z.object({}).strict(), { zz: 1 })[0])).toBe("not a known field: zz");
    expect(plainMessage(issues(z.email(), "no")[0])).toBe("must be an e-mail address, e.g. name@example.org");
  });

  it("keeps the project's own messages", () => {
    expect(plainMessage(issues(z.number().min(1, { message: "at least one panelist" }), 0)[0])).toBe("at least one panelist");
    expect(plainMessage(issues(z.number().refine((n) => n > 2, { message: "needs low < median < high" }), 1)[0])).toBe("needs low < median < high");
  });
});
