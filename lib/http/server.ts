/**
 * The production HTTP server (`triangulate serve`, which `npm start` runs): Node's HTTP server in
 * front of Next.js's request handler, with one shortcut.
 *
 * Requests for a direct route (DIRECT_ROUTES: a method on a fixed API path, no path parameters)
 * go straight to its handler function in lib (lib/http/answer-route.ts), the same function the
 * route module exports for Next.js to call (built by lib/http/handler.ts, so the checks, the
 * parsing and the responses are the same). Everything else, every page, every other route and
 * every other method of that path, goes to Next.js.
 *
 * Why: the answer endpoint takes a burst when an invitation goes out. Profiled under
 * `npm run load`, about three quarters of the server's CPU per answer went to Next.js's request
 * handling (routing, request and response stream conversion, tracing), and the app's own work
 * plus SQLite to the rest. Calling the route function directly cuts the server's CPU per answer
 * to about a third (`npm run load`: 1.9 ms through it, 5.6 ms through Next.js; README). Only the
 * answer route is direct: nothing else takes such bursts. The handler is loaded here from the
 * source tree (tsx) and by Next.js from its bundle: two copies of the same modules, so they keep
 * no state in module variables (lib/http/answer-route.ts).
 *
 * What Next.js would add to a direct route's response and this server adds too:
 * - the headers next.config.mjs declares for the path (the security headers), read from the
 *   build's routes manifest (`headersForPath`) so that next.config.mjs stays their one source;
 * - the `x-forwarded-*` request headers Next.js sets when they are absent (`forwardedHeaders`),
 *   which the rate limits and the Origin check read.
 * The proxy (proxy.ts) does not run for /api/ paths, so bypassing it changes nothing.
 *
 * In development (`next dev`) every route, direct or not, goes through Next.js.
 */
import { readFileSync } from "node:fs";
import http from "node:http";
import path from "node:path";
import { Readable } from "node:stream";
import { fileURLToPath } from "node:url";
import type { NextRouteContext } from "./handler";
import { problemResponse } from "./problem";

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "..", "..");

type RouteFunction = (req: Request, ctx: NextRouteContext) => Response | Promise<Response>;

/** The direct routes: path → method → handler (loaded at start-up). */
const DIRECT_ROUTES: Record<string, Record<string, () => Promise<RouteFunction>>> = {
  "/api/v1/panelist/answers": { POST: async () => (await import("./answer-route")).postAnswer },
};

/** A header rule as the build's routes-manifest.json records one from next.config.mjs `headers()`. */
export interface HeaderRule {
  readonly source: string;
  readonly regex: string;
  readonly headers: readonly { key: string; value: string }[];
  readonly has?: unknown;
  readonly missing?: unknown;
}

/**
 * The response headers the rules give `pathname`: every rule whose regex matches, in order, a
 * later rule overriding an earlier one for the same header (Next.js's documented order). A
 * matching rule with `has`/`missing` conditions depends on the request, which a fixed header set
 * cannot follow: it is refused, so that the server never starts with weaker headers than Next.js
 * would send.
 */
export function headersForPath(rules: readonly HeaderRule[], pathname: string): Record<string, string> {
  const out: Record<string, string> = {};
  for (const rule of rules) {
    if (!new RegExp(rule.regex).test(pathname)) continue;
    if (rule.has !== undefined || rule.missing !== undefined) {
      throw new Error(`next.config.mjs header rule "${rule.source}" has conditions; the direct route ${pathname} cannot apply them`);
    }
    for (const { key, value } of rule.headers) out[key.toLowerCase()] = value;
  }
  return out;
}

/**
 * The `x-forwarded-*` request headers Next.js sets when absent (host, port, proto and the peer's
 * address), so that a route sees the same headers whichever way it is reached. A proxy in front
 * sets them itself; see README on X-Forwarded-For.
 */
export function forwardedHeaders(
  headers: Headers,
  socket: { remoteAddress?: string; encrypted?: boolean },
  port: number,
): void {
  const proto = headers.get("x-forwarded-proto");
  const https = proto ? proto === "https" : socket.encrypted === true;
  if (!headers.has("x-forwarded-host") && headers.has("host")) headers.set("x-forwarded-host", headers.get("host")!);
  if (!headers.has("x-forwarded-port")) headers.set("x-forwarded-port", String(port));
  if (!headers.has("x-forwarded-proto")) headers.set("x-forwarded-proto", https ? "https" : "http");
  if (!headers.has("x-forwarded-for") && socket.remoteAddress) headers.set("x-forwarded-for", socket.remoteAddress);
}

/** The Web Request for a Node request (the body streams; the route limits its size). */
function toRequest(req: http.IncomingMessage, pathAndQuery: string, port: number): Request {
  const headers = new Headers();
  for (let i = 0; i < req.rawHeaders.length; i += 2) headers.append(req.rawHeaders[i], req.rawHeaders[i + 1]);
  forwardedHeaders(headers, req.socket as { remoteAddress?: string; encrypted?: boolean }, port);
  const hasBody = req.method !== "GET" && req.method !== "HEAD";
  return new Request(`http://127.0.0.1:${port}${pathAndQuery}`, {
    method: req.method,
    headers,
    body: hasBody ? (Readable.toWeb(req) as ReadableStream<Uint8Array>) : undefined,
    duplex: "half",
  } as RequestInit);
}

/** Sends a Web Response: the path's configured headers first, the route's own over them. */
async function send(res: http.ServerResponse, response: Response, configured: Record<string, string>): Promise<void> {
  res.statusCode = response.status;
  for (const [key, value] of Object.entries(configured)) res.setHeader(key, value);
  response.headers.forEach((value, key) => {
    if (key !== "set-cookie") res.setHeader(key, value);
  });
  const cookies = response.headers.getSetCookie();
  if (cookies.length > 0) res.setHeader("set-cookie", cookies);
  res.end(Buffer.from(await response.arrayBuffer()));
}

export interface ServeOptions {
  readonly port: number;
  /** The address to listen on; all interfaces when absent (as `next start`). */
  readonly hostname?: string;
}

/** A started server: `close` stops accepting, lets requests in flight finish, then closes the database. */
export interface Serving {
  readonly server: http.Server;
  close(): Promise<void>;
}

/** Prepares Next.js on the production build, loads the direct routes and listens. */
export async function serve(o: ServeOptions): Promise<Serving> {
  const { default: next } = await import("next");
  const app = next({ dev: false, dir: root, hostname: o.hostname, port: o.port });
  const [nextHandler, direct] = await Promise.all([
    app.prepare().then(() => app.getRequestHandler()),
    directRoutes(),
  ]);

  const server = http.createServer((req, res) => {
    const url = req.url ?? "/";
    const q = url.indexOf("?");
    const route = direct.get(q < 0 ? url : url.slice(0, q));
    const fn = route?.methods.get(req.method ?? "GET");
    if (!route || !fn) {
      void nextHandler(req, res);
      return;
    }
    void (async () => {
      let response: Response;
      try {
        response = await fn(toRequest(req, url, o.port), { params: Promise.resolve({}) });
      } catch (err) {
        // Route functions answer every error themselves (lib/http/handler.ts); this is a last resort.
        console.error(err);
        response = problemResponse("server-error", "The server failed to handle the request.");
      }
      await send(res, response, route.headers);
    })().catch((err) => {
      console.error(err);
      res.destroy();
    });
  });
  try {
    await new Promise<void>((resolve, reject) => {
      server.once("error", reject);
      server.listen(o.port, o.hostname, () => resolve());
    });
  } catch (err) {
    await app.close();
    throw err;
  }

  return {
    server,
    async close() {
      await new Promise<void>((resolve) => {
        server.close(() => resolve());
        server.closeIdleConnections();
      });
      await app.close();
      const { db } = await import("../db");
      await db.$disconnect();
    },
  };
}

/** The direct routes, each with its handlers and the headers next.config.mjs gives its path. */
async function directRoutes(): Promise<Map<string, { methods: Map<string, RouteFunction>; headers: Record<string, string> }>> {
  const manifest = path.join(root, process.env.NEXT_DIST_DIR || ".next", "routes-manifest.json"); // the distDir of next.config.mjs
  const rules = (JSON.parse(readFileSync(manifest, "utf8")) as { headers: HeaderRule[] }).headers;
  const out = new Map<string, { methods: Map<string, RouteFunction>; headers: Record<string, string> }>();
  // TRIANGULATE_DIRECT_ROUTES=off serves everything through Next.js: `npm run load` compares the two.
  if (process.env.TRIANGULATE_DIRECT_ROUTES === "off") return out;
  for (const [pathname, handlers] of Object.entries(DIRECT_ROUTES)) {
    const methods = new Map<string, RouteFunction>();
    for (const [method, load] of Object.entries(handlers)) methods.set(method, await load());
    out.set(pathname, { methods, headers: headersForPath(rules, pathname) });
  }
  return out;
}
