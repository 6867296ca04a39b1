/**
 * The OpenAPI 3.1 document of the JSON API, generated from the route table
 * (lib/http/routes.ts) and its zod schemas with zod 4's `z.toJSONSchema` (JSON Schema
 * draft 2020-12, the dialect OpenAPI 3.1 uses). Request bodies are described as input
 * (defaults make fields optional), responses as output.
 */
import { z } from "zod";
import { PROBLEM_TYPES, problemTypeUri, type ProblemKind } from "@/lib/problem-types";
import { problem } from "@/lib/validation/outputs";
import { routes, type RouteDef } from "./routes";

type Json = Record<string, unknown>;

function schemaOf(s: z.ZodType, io: "input" | "output"): Json {
  const { $schema: _ignored, ...rest } = z.toJSONSchema(s, { target: "draft-2020-12", io, unrepresentable: "any" }) as Json;
  return rest;
}

const STATUS_TEXT: Record<number, string> = {
  200: "OK",
  201: "Created",
  400: "The body is not JSON",
  401: "Not authenticated: no, unknown, revoked or expired credentials",
  403: "Authenticated but not allowed",
  404: "Not found, or not visible to you",
  409: "Conflicts with the current state; `type` says which (round not open, panel finished, …)",
  422: "Invalid input; `errors` names each field",
  413: "The request body is over the size limit (2 MiB)",
  429: "Too many requests (rate limit); Retry-After says when to try again",
};

function operation(r: RouteDef): Json {
  const parameters: Json[] = [];
  if (r.params) {
    for (const [name, schema] of Object.entries(r.params.shape)) {
      parameters.push({ name, in: "path", required: true, schema: schemaOf(schema as z.ZodType, "input") });
    }
  }
  if (r.idempotent) {
    parameters.push({
      name: "Idempotency-Key",
      in: "header",
      required: false,
      description: "A retried request with the same key returns the version stored the first time.",
      schema: { type: "string", maxLength: 200 },
    });
  }
  const problemRef = { $ref: "#/components/schemas/Problem" };
  const success = (description: string) => ({ description, content: { [r.produces ?? "application/json"]: { schema: schemaOf(r.response, "output") } } });
  const responses: Json = { [String(r.status)]: success(STATUS_TEXT[r.status]) };
  // A retry with a used Idempotency-Key and the same body returns what was stored the first time.
  if (r.idempotent) responses["200"] = success("Replay: this Idempotency-Key was used before with the same body; the result stored then");
  const errs = new Set<number>(r.errors);
  if (r.body) {
    errs.add(400);
    errs.add(413);
  }
  // Rate limits (lib/http/rate-limit.ts): invalid credentials per address, panelists, invitations.
  if (r.auth !== "none" || r.body) errs.add(429);
  for (const s of [...errs].sort()) {
    responses[String(s)] = { description: STATUS_TEXT[s] ?? "Error", content: { "application/problem+json": { schema: problemRef } } };
  }
  responses["500"] = { description: "Unexpected server error (reveals nothing)", content: { "application/problem+json": { schema: problemRef } } };
  return {
    operationId: r.operationId,
    summary: r.summary,
    tags: [r.tag],
    security: r.auth === "none" ? [] : r.auth === "panelist" ? [{ invitationToken: [] }] : [{ apiToken: [] }, { session: [] }],
    ...(parameters.length > 0 ? { parameters } : {}),
    // An empty body counts as {} (lib/http/handler.ts), so a body whose fields are all optional is optional.
    ...(r.body ? { requestBody: { required: !r.body.safeParse({}).success, content: { "application/json": { schema: schemaOf(r.body, "input") } } } } : {}),
    responses,
  };
}

/**
 * The Problem schema, its `type` listing every problem type (lib/problem-types.ts) with its title,
 * status and meaning; each type is also a page at its URI.
 */
function problemSchema(): Json {
  const base = schemaOf(problem, "output");
  const kinds = Object.keys(PROBLEM_TYPES) as ProblemKind[];
  const type = {
    type: "string",
    format: "uri-reference",
    description:
      "The problem type: a stable URI relative to this site (RFC 9457 §3.1.1), `/problems/<kind>`; GET it for a page explaining it. Match on `type`, not on `detail`.",
    anyOf: kinds.map((k) => ({ const: problemTypeUri(k), title: PROBLEM_TYPES[k].title, description: `${PROBLEM_TYPES[k].status}: ${PROBLEM_TYPES[k].description}` })),
  };
  return { ...base, properties: { ...(base.properties as Json), type } };
}

/** The OpenAPI 3.1 document (a plain object, ready for JSON.stringify). */
export function openApiDocument(): Json {
  const paths: Record<string, Json> = {};
  for (const r of Object.values(routes) as RouteDef[]) {
    paths[r.path] ??= {};
    paths[r.path][r.method.toLowerCase()] = operation(r);
  }
  paths["/api/v1/openapi.json"] = {
    get: {
      operationId: "getOpenApiDocument",
      summary: "This document",
      tags: ["setup"],
      security: [],
      responses: { "200": { description: "OK", content: { "application/json": { schema: { type: "object" } } } } },
    },
  };
  return {
    openapi: "3.1.0",
    info: {
      title: "Triangulate API",
      version: "1",
      description:
        "Delphi-method expert panels: organisers run panels, panelists answer with their invitation token. Errors are application/problem+json (RFC 9457) whose `type` is one of the problem types listed in the Problem schema.",
    },
    servers: [{ url: "/" }],
    paths,
    components: {
      schemas: { Problem: problemSchema() },
      securitySchemes: {
        apiToken: { type: "http", scheme: "bearer", description: "An organiser's personal API token (trg_pat_…)." },
        invitationToken: { type: "http", scheme: "bearer", description: "A panelist's invitation token (the secret in /p/<token>)." },
        session: { type: "apiKey", in: "cookie", name: "next-auth.session-token", description: "The web app's session cookie." },
      },
    },
  };
}
