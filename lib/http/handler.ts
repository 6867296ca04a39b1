/**
 * Builds a route handler from a route-table entry (lib/http/routes.ts). The steps are fixed:
 * 1. authenticate (lib/http/context.ts): no credentials on a route that needs them → 401;
 * 2. parse the path parameters and the JSON body with the entry's zod schemas → 422 naming
 *    each field; a body that is not JSON → 400;
 * 3. one domain-service call, which authorises (403 / 404) and acts;
 * 4. respond with the entry's status and JSON, or problem+json through lib/http/problem.ts.
 * Cookie-authenticated changes must come from this site (Origin check), as a CSRF guard.
 */
import type { z } from "zod";
import type { Actor } from "@/lib/accounts/actor";
import { ForbiddenError, InvalidInputError, NotAuthenticatedError } from "@/lib/errors";
import { idempotencyKey as idempotencyKeySchema } from "@/lib/validation/inputs";
import { actorFromRequest } from "./context";
import { problemResponse, toProblem, zodFieldErrors } from "./problem";
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

/** The second argument Next.js passes to a route handler. */
export interface NextRouteContext {
  readonly params: Promise<Record<string, string | string[]>>;
}

async function readJson(req: Request): Promise<unknown> {
  const text = await req.text();
  if (text.trim() === "") return {};
  try {
    return JSON.parse(text);
  } catch {
    throw new SyntaxError("body is not JSON");
  }
}

function sameOrigin(req: Request): boolean {
  const origin = req.headers.get("origin");
  if (!origin) return true;
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
    try {
      const actor = await actorFromRequest(req);
      if (route.auth !== "none" && !actor) throw new NotAuthenticatedError();
      if (actor && route.method !== "GET" && !req.headers.get("authorization") && !sameOrigin(req)) {
        throw new ForbiddenError("Cross-site request refused.");
      }
      const rawParams = ctx?.params ? await ctx.params : {};
      const parsedParams = route.params ? route.params.safeParse(rawParams) : { success: true as const, data: undefined };
      if (!parsedParams.success) throw new InvalidInputError(zodFieldErrors(parsedParams.error), "The address has invalid parts.");
      const params = parsedParams.data;
      let body: unknown = undefined;
      if (route.body) {
        let raw: unknown;
        try {
          raw = await readJson(req);
        } catch {
          return problemResponse({ type: "about:blank", title: "Bad Request", status: 400, detail: "The request body is not valid JSON.", instance });
        }
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
