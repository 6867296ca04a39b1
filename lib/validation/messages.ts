/**
 * zod's built-in messages ("Too small: expected number to be >=1") as plain sentences for people,
 * in one place: forms (lib/actions/form-result.ts), the JSON API's problem details (lib/http/problem.ts)
 * and the CLI all show `plainMessage`. Messages written by the project's own checks (code
 * "custom", or a `message` given to a check) pass through unchanged.
 */
import type { core } from "zod";

type Issue = core.$ZodIssue;

const fmt = (n: unknown) => (typeof n === "number" || typeof n === "bigint" ? Number(n).toLocaleString("en-GB", { maximumFractionDigits: 12 }) : String(n));

/** The zod default message for `issue`, or a plain sentence when it is one of zod's own. */
export function plainMessage(issue: Issue): string {
  const m = issue.message;
  switch (issue.code) {
    case "invalid_type": {
      if (!/^Invalid input: expected/.test(m)) return m;
      if (/received undefined$/.test(m)) return "required";
      if (issue.expected === "int") return "must be a whole number";
      if (issue.expected === "number") return "must be a number";
      if (issue.expected === "string") return "must be text";
      if (issue.expected === "array") return "must be a list";
      if (issue.expected === "boolean") return "must be true or false";
      if (issue.expected === "object") return "must be an object";
      return `must be of type ${issue.expected}`;
    }
    case "too_small": {
      if (!/^Too small:/.test(m)) return m;
      const n = Number(issue.minimum);
      if (issue.origin === "string") return n === 1 ? "required" : `must be at least ${fmt(n)} characters long`;
      if (issue.origin === "array" || issue.origin === "set") return `needs at least ${fmt(n)} ${n === 1 ? "item" : "items"}`;
      return issue.inclusive ? `must be at least ${fmt(issue.minimum)}` : `must be more than ${fmt(issue.minimum)}`;
    }
    case "too_big": {
      if (!/^Too big:/.test(m)) return m;
      const n = Number(issue.maximum);
      if (issue.origin === "string") return `must be at most ${fmt(n)} ${n === 1 ? "character" : "characters"} long`;
      if (issue.origin === "array" || issue.origin === "set") return `holds at most ${fmt(n)} ${n === 1 ? "item" : "items"}`;
      return issue.inclusive ? `must be at most ${fmt(issue.maximum)}` : `must be less than ${fmt(issue.maximum)}`;
    }
    case "invalid_value":
      return /^Invalid (option|input)/.test(m) ? `must be one of: ${issue.values.map((v) => String(v)).join(", ")}` : m;
    case "invalid_format":
      if (issue.format === "email" && m === "Invalid email address") return "must be an e-mail address, e.g. name@example.org";
      if (issue.format === "regex" && /^Invalid string/.test(m)) return "has characters or a form that is not allowed here";
      return /^Invalid /.test(m) ? `must be a valid ${issue.format}` : m;
    case "unrecognized_keys":
      return `not a known field: ${issue.keys.join(", ")}`;
    case "not_multiple_of":
      return /^Invalid number/.test(m) ? `must be a multiple of ${fmt(issue.divisor)}` : m;
    default:
      return m;
  }
}
