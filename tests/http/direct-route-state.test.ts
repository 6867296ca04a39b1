/**
 * The production server loads the answer handler twice (lib/http/answer-route.ts): Next.js's
 * bundle has one copy of every module it imports, the direct route (lib/http/server.ts, through
 * tsx) another. A cache, counter or registry kept in a module variable would then be two, each
 * seeing half the requests (a cache one copy clears and the other keeps, a limit counted twice as
 * loosely). So every project module reachable from the handler keeps its state on globalThis or in
 * the database. Read from the source: a module-level `let`/`var`, or a module-level `const` made
 * with `new Map/Set/WeakMap/WeakSet` or an empty `[]`/`{}` (a container to fill) that is not taken
 * from globalThis, fails here, naming the file and the line. Tables written out in full (schemas,
 * route entries, UPPER_CASE constants) are settings, not state.
 */
import { existsSync, readFileSync } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { specifiers } from "../core-boundary.test";

const root = path.resolve(__dirname, "../..");
const ENTRY = "lib/http/answer-route.ts";

/**
 * Generated code is left out: the Prisma client's module-level values are its schema and
 * settings, fixed at generation; its one instance, the connection, is on globalThis (lib/db.ts).
 */
const SKIP = ["lib/generated/"];

/** Module variables that may differ between the two copies, each with its reason. */
const ALLOWED: Readonly<Record<string, string>> = {
  "lib/env.ts: cached": "the environment parsed once; each copy parses the same process.env to the same settings",
  "lib/accounts/passwords.ts: dummyHash": "a hash of a random password, only compared against (equal timing for unknown e-mails); each copy may have its own",
};

/** The project file `spec` names from `from`, or null for a package or node built-in. */
function resolve(from: string, spec: string): string | null {
  const base = spec.startsWith("@/") ? spec.slice(2) : spec.startsWith(".") ? path.posix.join(path.posix.dirname(from), spec) : null;
  if (base === null) return null;
  for (const candidate of [base, `${base}.ts`, `${base}.tsx`, `${base}/index.ts`]) {
    if (/\.(ts|tsx|mjs|js)$/.test(candidate) && existsSync(path.join(root, candidate))) return candidate;
  }
  throw new Error(`${from}: cannot resolve ${spec}`);
}

/** Every project module `entry` imports, directly or not (type-only imports included: harmless over-reach). */
function reachable(entry: string): string[] {
  const seen = new Set<string>([entry]);
  const todo = [entry];
  while (todo.length > 0) {
    const file = todo.pop()!;
    for (const spec of specifiers(readFileSync(path.join(root, file), "utf8"))) {
      const target = resolve(file, spec);
      if (target && !seen.has(target) && !SKIP.some((s) => target.startsWith(s))) {
        seen.add(target);
        todo.push(target);
      }
    }
  }
  return [...seen].sort();
}

/** Module-level mutable state in `source`: a line per finding ("line N: text"). */
export function moduleState(source: string, file = ""): string[] {
  const out: string[] = [];
  source.split("\n").forEach((line, i) => {
    const mutable = /^(export\s+)?(let|var)\s/.test(line);
    // UPPER_CASE names are fixed tables by the project's convention (e.g. lib/http/rate-limit.ts INVITATION_OPERATIONS).
    const container = /^(export\s+)?const\s+(?![A-Z][A-Z0-9_]*\b)[\w$]+\s*(:[^=]+)?=\s*(new\s+(Map|Set|WeakMap|WeakSet)\b|\[\s*\]|\{\s*\})/.test(line) && !/globalThis/.test(line);
    const name = /^(?:export\s+)?(?:let|var|const)\s+([\w$]+)/.exec(line)?.[1];
    if ((mutable || container) && !ALLOWED[`${file}: ${name}`]) out.push(`line ${i + 1}: ${line.trim()}`);
  });
  return out;
}

describe("the answer handler's modules keep no state of their own", () => {
  it("finds module state where there is some (the check can fail)", () => {
    expect(moduleState("const cache = new Map<string, number>();\nlet count = 0;\nconst shared = ((globalThis as { x?: Map<string, number> }).x ??= new Map());\nconst LIMIT = 5;\nconst fields = {\n  a: 1,\n};\nconst seen: string[] = [];")).toEqual([
      "line 1: const cache = new Map<string, number>();",
      "line 2: let count = 0;",
      "line 8: const seen: string[] = [];",
    ]);
  });

  it("follows the handler's imports into lib/panels and lib/db", () => {
    const files = reachable(ENTRY);
    expect(files).toContain("lib/panels/answers.ts");
    expect(files).toContain("lib/db.ts");
    expect(files).toContain("lib/panels/round-quartiles.ts");
  });

  it("no module reachable from lib/http/answer-route.ts keeps state in a module variable", () => {
    const found = reachable(ENTRY).flatMap((file) => moduleState(readFileSync(path.join(root, file), "utf8"), file).map((f) => `${file} ${f}`));
    expect(found).toEqual([]);
  });
});
