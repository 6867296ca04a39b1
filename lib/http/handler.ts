/**
 * Builds a route handler from a route-table entry (lib/http/routes.ts). The steps are fixed:
 * 1. authenticate (lib/http/context.ts): no credentials on a route that needs them → 401;
 * 2. parse the path parameters and the JSON body with the entry's zod schemas → 422 naming
 *    each field; a body that is not JSON → 400;
 * 3. one domain-service call, which authorises (403 / 404) and acts;
 * 4. respond with the entry's status and JSON, or problem+json through lib/http/problem.ts.
 * Cookie-authenticated changes must come from this site (Origin check), as a CSRF guard.
 * Before all that: a body over MAX_BODY_BYTES → 413; rate limits (lib/http/rate-limit.ts) → 429.
 */
import type { z } from "zod";
import type { Actor } from "@/lib/accounts/actor";
import { ForbiddenError, InvalidInputError, NotAuthenticatedError } from "@/lib/errors";
import { idempotencyKey as idempotencyKeySchema } from "@/lib/validation/inputs";
import { actorFromRequest } from "./context";
import { problemResponse, toProblem, zodFieldErrors } from "./problem";
import { clientAddress, INVITATION_OPERATIONS, limits, tooManyRequests } from "./rate-limit";
import { textFieldErrors } from "../validation/nul";
import type { RouteDef } from "./routes";

type Infer<T> = T extends z.ZodType ? z.output<T> : undefined;

export interface HandlerContext<R extends RouteDef> {
  readonly actor: R["auth"] extends "none" ? Actor | null : Actor;
  readonly params: Infer<R["params"]>;
  readonly body: Infer<R["body"]>;
  /** The Idempotency-Key header (routes marked idempotent). */
  readonly idempotencyKey: string | undefined;
  readonly request: Request;
}

/** A result with a status other than the route's default. */
export class Reply {
  constructor(
    readonly status: number,
    readonly body: unknown,
  ) {}
}

/** A non-JSON result (a CSV export): sent as is, with its content type and download name. */
export class FileReply {
  constructor(
    readonly body: string,
    readonly contentType: string,
    readonly filename?: string,
  ) {}
}

/** The second argument Next.js passes to a route handler. */
export interface NextRouteContext {
  readonly params: Promise<Record<string, string | string[]>>;
}

/**
 * The largest request body accepted, in bytes (the biggest legitimate one is a baseline CSV of at
 * most 1 000 000 characters, lib/validation/triangulation-inputs.ts). Larger bodies get 413.
 */
export const MAX_BODY_BYTES = 2 * 1024 * 1024;

export class BodyTooLargeError extends Error {}

/**
 * The body as text: at most `max` bytes (counted as it streams in, so a chunked body without
 * Content-Length is cut off too), and valid UTF-8.
 * @throws BodyTooLargeError over `max`; TypeError when it is not UTF-8
 */
export async function readText(req: Request, max = MAX_BODY_BYTES): Promise<string> {
  if (!req.body) return "";
  const reader = req.body.getReader();
  const chunks: Uint8Array[] = [];
  let size = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    size += value.byteLength;
    if (size > max) {
      await reader.cancel().catch(() => undefined);
      throw new BodyTooLargeError();
    }
    chunks.push(value);
  }
  return new TextDecoder("utf-8", { fatal: true }).decode(Buffer.concat(chunks));
}

async function readJson(req: Request): Promise<unknown> {
  let text: string;
  try {
    text = await readText(req);
  } catch (err) {
    if (err instanceof BodyTooLargeError) throw err;
    throw new SyntaxError("body is not UTF-8");
  }
  if (text.trim() === "") return {};
  try {
    return JSON.parse(text);
  } catch {
    throw new SyntaxError("body is not JSON");
  }
}

/**
 * True when a cookie-authenticated change comes from this site: its `Origin` names this host, or,
 * when a browser sends no Origin, `Sec-Fetch-Site` says same-origin. A request with neither is
 * refused (browsers send Origin with every POST/PUT/PATCH/DELETE; scripts use Bearer tokens).
 */
function sameOrigin(req: Request): boolean {
  const origin = req.headers.get("origin");
  if (!origin) return req.headers.get("sec-fetch-site") === "same-origin";
  const host = req.headers.get("x-forwarded-host") ?? req.headers.get("host");
  try {
    return new URL(origin).host === host;
  } catch {
    return false;
  }
}

/** The route handler for `route`; `run` makes the one domain-service call. */
export function handle<const R extends RouteDef>(
  route: R,
  run: (ctx: HandlerContext<R>) => Promise<unknown>,
): (req: Request, ctx: NextRouteContext) => Promise<Response> {
  return async (req, ctx) => {
    const instance = new URL(req.url).pathname;
    const tooLarge = () =>
      problemResponse("too-large", `The request body is larger than ${MAX_BODY_BYTES} bytes.`, { instance });
    try {
      const declared = Number(req.headers.get("content-length") ?? 0);
      if (declared > MAX_BODY_BYTES) return tooLarge();
      const address = clientAddress(req);
      const wait = await limits.badTokens.blocked(address);
      if (wait !== null) return tooManyRequests(wait, instance, "Too many requests with invalid credentials from this address.");
      let actor: Actor | null;
      try {
        actor = await actorFromRequest(req);
      } catch (err) {
        if (err instanceof NotAuthenticatedError) await limits.badTokens.hit(address);
        throw err;
      }
      if (route.auth !== "none" && !actor) throw new NotAuthenticatedError();
      const limited =
        actor?.kind === "panelist"
          ? await limits.panelist.hit(actor.invitationId)
          : actor && INVITATION_OPERATIONS.has(route.operationId)
            ? await limits.invitations.hit(actor.userId)
            : null;
      if (limited !== null) return tooManyRequests(limited, instance);
      if (actor && route.method !== "GET" && !req.headers.get("authorization") && !sameOrigin(req)) {
        throw new ForbiddenError("Cross-site request refused.");
      }
      const rawParams = ctx?.params ? await ctx.params : {};
      const nulInPath = textFieldErrors(rawParams);
      if (nulInPath.length > 0) throw new InvalidInputError(nulInPath, "The address has invalid parts.");
      const parsedParams = route.params ? route.params.safeParse(rawParams) : { success: true as const, data: undefined };
      if (!parsedParams.success) throw new InvalidInputError(zodFieldErrors(parsedParams.error), "The address has invalid parts.");
      const params = parsedParams.data;
      let body: unknown = undefined;
      if (route.body) {
        let raw: unknown;
        try {
          raw = await readJson(req);
        } catch (err) {
          if (err instanceof BodyTooLargeError) return tooLarge();
          const detail = (err as Error).message === "body is not UTF-8" ? "The request body is not UTF-8 text." : "The request body is not valid JSON.";
          return problemResponse("bad-request", detail, { instance });
        }
        const nul = textFieldErrors(raw);
        if (nul.length > 0) throw new InvalidInputError(nul);
        const parsed = route.body.safeParse(raw);
        if (!parsed.success) throw new InvalidInputError(zodFieldErrors(parsed.error));
        body = parsed.data;
      }
      let idempotencyKey: string | undefined;
      if (route.idempotent) {
        const header = req.headers.get("idempotency-key");
        if (header !== null) {
          const k = idempotencyKeySchema.safeParse(header);
          if (!k.success) throw new InvalidInputError(zodFieldErrors(k.error, "Idempotency-Key"));
          idempotencyKey = k.data;
        }
      }
      const result = await run({ actor, params, body, idempotencyKey, request: req } as HandlerContext<R>);
      if (result instanceof FileReply) {
        return new Response(result.body, {
          status: route.status,
          headers: {
            "content-type": result.contentType,
            "cache-control": "no-store",
            "x-content-type-options": "nosniff",
            ...(result.filename ? { "content-disposition": `attachment; filename="${result.filename.replace(/[^A-Za-z0-9._-]/g, "_")}"` } : {}),
          },
        });
      }
      const [status, payload] = result instanceof Reply ? [result.status, result.body] : [route.status, result];
      return new Response(JSON.stringify(payload), {
        status,
        headers: { "content-type": "application/json", "cache-control": "no-store" },
      });
    } catch (err) {
      return toProblem(err, instance);
    }
  };
}

const METHODS = ["GET", "POST", "PUT", "PATCH", "DELETE"] as const;
type Method = (typeof METHODS)[number];

/**
 * Handlers for the methods a route file does not serve: 405 problem+json with `Allow` (instead of
 * the framework's empty 405). Use: `export const { PUT, PATCH } = otherMethods("GET, POST, DELETE")`.
 */
export function otherMethods(allow: string): Record<Method, (req: Request) => Response> {
  const refuse = (req: Request) => {
    const instance = new URL(req.url).pathname;
    return problemResponse("method-not-allowed", `${req.method} is not an operation of ${instance}; allowed: ${allow}.`, { instance, headers: { allow } });
  };
  return Object.fromEntries(METHODS.map((m) => [m, refuse])) as Record<Method, (req: Request) => Response>;
}
