/**
 * The pure core's boundary (DEVELOPERS.md, Layout): lib/stats, lib/forecast and lib/blend import
 * no framework, database, validation library or I/O. Read from the source files' import
 * statements, so a new import of next, react, Prisma, zod, lib/db, lib/http, lib/panels,
 * lib/triangulation, lib/actions or node's worker_threads / fs / net fails here.
 */
import { existsSync, readdirSync, readFileSync } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";

const root = path.resolve(__dirname, "..");
const CORE = ["lib/stats", "lib/forecast", "lib/blend"];

/** Files allowed a forbidden import, each with its reason. None today. */
const EXCEPTIONS: Readonly<Record<string, string>> = {};

/** Every module specifier a TypeScript file names: import/export … from, import "…", import(), require(). */
export function specifiers(source: string): string[] {
  const found: string[] = [];
  const patterns = [/\b(?:import|export)\s[^;]*?\bfrom\s*["']([^"']+)["']/g, /\bimport\s*["']([^"']+)["']/g, /\b(?:import|require)\s*\(\s*["']([^"']+)["']\s*\)/g];
  for (const re of patterns) for (const m of source.matchAll(re)) found.push(m[1]);
  return found;
}

const FORBIDDEN_PACKAGES = [/^next(\/|$)/, /^react(-dom)?(\/|$)/, /^@prisma\//, /^prisma(\/|$)/, /^zod(\/|$)/, /^(node:)?(worker_threads|fs|fs\/promises|net)$/];
const FORBIDDEN_LIB = ["lib/db", "lib/http", "lib/panels", "lib/triangulation", "lib/actions", "lib/generated"];

/** Why `spec`, imported by the file `from` (relative to the repository), breaks the boundary; null when it does not. */
export function violation(from: string, spec: string): string | null {
  if (FORBIDDEN_PACKAGES.some((re) => re.test(spec))) return `imports ${spec}`;
  const target = spec.startsWith("@/") ? spec.slice(2) : spec.startsWith(".") ? path.posix.join(path.posix.dirname(from), spec) : null;
  if (target === null) return null;
  const hit = FORBIDDEN_LIB.find((dir) => target === dir || target.startsWith(`${dir}/`) || target === `${dir}.ts`);
  return hit ? `imports ${hit} (${spec})` : null;
}

function sourceFiles(dir: string): string[] {
  return readdirSync(path.join(root, dir), { withFileTypes: true }).flatMap((e) => {
    const rel = `${dir}/${e.name}`;
    if (e.isDirectory()) return sourceFiles(rel);
    return /\.(ts|tsx|mts|js|mjs)$/.test(e.name) ? [rel] : [];
  });
}

describe("pure core boundary", () => {
  it("the checker finds each kind of forbidden import (hand-written cases)", () => {
    const file = "lib/blend/x.ts";
    const src = [
      'import { z } from "zod";',
      'import type { NextRequest } from "next/server";',
      "import { useState } from 'react';",
      'import { PrismaClient } from "@prisma/client";',
      'export { db } from "../db";',
      'import "@/lib/http/handler";',
      'const w = await import("node:worker_threads");',
      'const fs = require("fs");',
      'import { Panel } from "../generated/prisma/client";',
      'import { x } from "../panels/rounds";',
      'import { y } from "../triangulation/triangulation";',
      'import { mean } from "../stats/moments";',
      'import { fit } from "@/lib/forecast/ets";',
    ].join("\n");
    const bad = specifiers(src).filter((s) => violation(file, s) !== null);
    expect(bad).toEqual(["zod", "next/server", "react", "@prisma/client", "../db", "../generated/prisma/client", "../panels/rounds", "../triangulation/triangulation", "@/lib/http/handler", "node:worker_threads", "fs"]);
  });

  it("no file under lib/stats, lib/forecast or lib/blend imports a framework, the database, zod, lib/http, lib/panels, lib/triangulation or I/O", () => {
    const files = CORE.flatMap(sourceFiles);
    expect(files.length).toBeGreaterThan(20);
    const problems = files.flatMap((f) =>
      f in EXCEPTIONS
        ? []
        : specifiers(readFileSync(path.join(root, f), "utf8")).flatMap((s) => {
            const why = violation(f, s);
            return why ? [`${f} ${why}`] : [];
          }),
    );
    expect(problems).toEqual([]);
  });

  it("lists no exception for a file that does not exist", () => {
    const files = new Set(CORE.flatMap(sourceFiles));
    expect(Object.keys(EXCEPTIONS).filter((f) => !files.has(f))).toEqual([]);
  });
});

/**
 * The modules a worker thread loads (lib/work/jobs.ts and all it imports, followed through
 * relative specifiers), each with the "@/" specifiers it names. The worker and the CLI run under
 * plain Node with tsx, where the app's "@/" path alias does not resolve.
 */
function aliasedInWorker(entry: string): string[] {
  const seen = new Set<string>();
  const found: string[] = [];
  const visit = (file: string) => {
    if (seen.has(file)) return;
    seen.add(file);
    for (const spec of specifiers(readFileSync(path.join(root, file), "utf8"))) {
      if (spec.startsWith("@/")) found.push(`${file} imports ${spec}`);
      if (!spec.startsWith(".")) continue;
      const base = path.posix.join(path.posix.dirname(file), spec);
      const next = [`${base}.ts`, `${base}.tsx`, `${base}/index.ts`, base].find((f) => existsSync(path.join(root, f)) && /\.(ts|tsx|mts|js|mjs)$/.test(f));
      if (next) visit(next);
    }
  };
  visit(entry);
  return found;
}

describe("worker thread's modules", () => {
  it("import one another by relative paths only (no \"@/\" alias), so the worker and the CLI load them", () => {
    expect(aliasedInWorker("lib/work/jobs.ts")).toEqual([]);
  });
});
