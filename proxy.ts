/**
 * Content-Security-Policy for the pages, with a fresh nonce per request (Next.js proxy, the
 * successor of middleware). Next.js reads the nonce from the request's CSP header and puts it on
 * its own inline scripts, so script-src needs neither 'unsafe-inline' nor 'unsafe-eval' (the
 * production build runs no eval; the dev server needs it for fast refresh, so it is added there
 * only). 'strict-dynamic' lets the nonced loader pull in the page's chunks.
 *
 * style-src keeps 'unsafe-inline': React writes style attributes (charts, bars sized by value)
 * and a style cannot run code. frame-ancestors 'none' forbids framing (clickjacking).
 * The other security headers, and the API's own CSP, are set in next.config.mjs.
 */
import { NextResponse, type NextRequest } from "next/server";
import { cleanLinkToken, linkShapeProblem } from "@/lib/ui/link-token";

export function contentSecurityPolicy(nonce: string, dev = process.env.NODE_ENV === "development"): string {
  return [
    "default-src 'self'",
    `script-src 'self' 'nonce-${nonce}' 'strict-dynamic'${dev ? " 'unsafe-eval'" : ""}`,
    "style-src 'self' 'unsafe-inline'",
    "img-src 'self' data: blob:",
    "font-src 'self'",
    "connect-src 'self'",
    "object-src 'none'",
    "base-uri 'self'",
    "form-action 'self'",
    "frame-ancestors 'none'",
  ].join("; ");
}

export function proxy(request: NextRequest): NextResponse {
  // A NUL in the address would reach the database as part of an id (lib/validation/nul.ts).
  if (/%00|\u0000/i.test(request.nextUrl.pathname)) {
    return new NextResponse("Bad request: the address contains a NUL character.", { status: 400, headers: { "content-type": "text/plain; charset=utf-8" } });
  }
  // A private link with the punctuation an e-mail program glued to it (lib/ui/link-token.ts):
  // straight to the clean link, so the page, its forms and its links use that.
  const link = /^\/p\/([^/]+)(\/feedback)?$/.exec(request.nextUrl.pathname);
  if (link) {
    const clean = cleanLinkToken(link[1]);
    if (clean !== link[1] && linkShapeProblem(clean) === null) {
      const url = request.nextUrl.clone();
      url.pathname = `/p/${clean}${link[2] ?? ""}`;
      return NextResponse.redirect(url, 308);
    }
  }
  const nonce = Buffer.from(crypto.getRandomValues(new Uint8Array(16))).toString("base64");
  const csp = contentSecurityPolicy(nonce);
  const headers = new Headers(request.headers);
  headers.set("x-nonce", nonce);
  headers.set("content-security-policy", csp);
  const response = NextResponse.next({ request: { headers } });
  response.headers.set("content-security-policy", csp);
  return response;
}

export const config = {
  // Pages only: API responses get a fixed policy from next.config.mjs; static files need none.
  matcher: [
    {
      source: "/((?!api/|_next/static|_next/image|favicon.ico).*)",
      missing: [{ type: "header", key: "next-router-prefetch" }],
    },
  ],
};
