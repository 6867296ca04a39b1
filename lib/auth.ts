/**
 * next-auth options: a credentials provider (e-mail + password, checked with scrypt in
 * lib/accounts/passwords.ts) and JWT sessions. The JWT carries the user id, role and session
 * generation; every request re-reads the user from the database (lib/session.ts,
 * lib/http/context.ts), so a deleted account, a sign-out or a password change ends the session
 * at once, on every instance (lib/accounts/actor.ts, actorFromSession).
 */
import NextAuth, { type NextAuthOptions } from "next-auth";
import CredentialsProvider from "next-auth/providers/credentials";
import { NextRequest } from "next/server";
import { authenticate, endSessions, normaliseEmail } from "@/lib/accounts/users";
import { BodyTooLargeError, readText } from "@/lib/http/handler";
import { problemResponse, toProblem } from "@/lib/http/problem";
import { clientAddress, countPasswordAttempt } from "@/lib/http/rate-limit";
import { sameOriginPath } from "@/lib/http/same-origin-path";

export const authOptions: NextAuthOptions = {
  session: { strategy: "jwt", maxAge: 12 * 60 * 60 },
  pages: { signIn: "/sign-in" },
  providers: [
    CredentialsProvider({
      name: "E-mail and password",
      credentials: {
        email: { label: "E-mail", type: "email" },
        password: { label: "Password", type: "password" },
      },
      async authorize(credentials) {
        const email = typeof credentials?.email === "string" ? credentials.email : "";
        const password = typeof credentials?.password === "string" ? credentials.password : "";
        if (!email || !password || email.includes("\u0000")) return null;
        const user = await authenticate(email, password);
        return user ? { id: user.id, email: user.email, name: user.name, role: user.role, gen: user.sessionGeneration } : null;
      },
    }),
  ],
  callbacks: {
    jwt({ token, user }) {
      if (user) {
        token.sub = user.id;
        token.role = (user as { role?: string }).role;
        token.gen = (user as { gen?: number }).gen;
      }
      return token;
    },
    session({ session, token }) {
      return { ...session, user: { ...session.user, id: token.sub, role: token.role, gen: token.gen } };
    },
    // The same rule as /sign-in's `next` (lib/http/same-origin-path.ts).
    redirect({ url, baseUrl }) {
      return `${baseUrl}${sameOriginPath(url, baseUrl) ?? "/"}`;
    },
  },
  events: {
    // Sign-out ends the session on the server too: a copy of the cookie stops working.
    async signOut({ token }) {
      if (typeof token?.sub === "string" && typeof token.gen === "number") await endSessions(token.sub, token.gen);
    },
  },
};

const nextAuthHandler = NextAuth(authOptions) as (req: NextRequest, ctx: AuthRouteContext) => Promise<Response>;

interface AuthRouteContext {
  readonly params: Promise<{ nextauth?: string[] }>;
}

/** Sign-in needs a few hundred bytes (CSRF token, e-mail, password of at most 200 characters). */
export const MAX_AUTH_BODY_BYTES = 16 * 1024;

/**
 * The e-mail next-auth will check, read from the body as next-auth reads it (JSON when the
 * content type says so, else a form; next-auth ignores other bodies). Null when the JSON is
 * malformed (next-auth would fail on it).
 */
function emailOfBody(body: string, contentType: string): string | null {
  let fields: Record<string, unknown> = {};
  if (contentType.includes("application/json")) {
    try {
      const parsed: unknown = JSON.parse(body);
      if (parsed && typeof parsed === "object") fields = parsed as Record<string, unknown>;
    } catch {
      return null;
    }
  } else if (contentType.includes("application/x-www-form-urlencoded")) {
    fields = Object.fromEntries(new URLSearchParams(body));
  }
  // NUL cannot be stored in PostgreSQL text (lib/validation/nul.ts); such an e-mail matches no account anyway.
  return typeof fields.email === "string" ? normaliseEmail(fields.email).replaceAll("\u0000", "").slice(0, 200) : "";
}

/**
 * The next-auth route handler (re-exported by app/api/auth/[...nextauth]/route.ts). A POST body
 * over MAX_AUTH_BODY_BYTES is refused with 413 while it streams in, before next-auth reads it.
 * Sign-in attempts are rate-limited (lib/http/rate-limit.ts, countPasswordAttempt) on what
 * next-auth acts on: the action from the route's decoded path segments (so
 * `/api/auth/%63allback/credentials` counts like `/api/auth/callback/credentials`) and the e-mail
 * from the body in either encoding. Over the limit, 429 problem+json with Retry-After, before
 * the password is checked. A JSON sign-in (API clients; the browser form posts a form) whose
 * credentials are refused gets 401 problem+json (`/problems/sign-in-failed`) instead of
 * next-auth's 200 with an error-page URL.
 */
export async function handler(req: NextRequest, ctx: AuthRouteContext): Promise<Response> {
  if (req.method !== "POST") return nextAuthHandler(req, ctx);
  const instance = new URL(req.url).pathname;
  let body: string;
  try {
    if (Number(req.headers.get("content-length") ?? 0) > MAX_AUTH_BODY_BYTES) throw new BodyTooLargeError();
    body = await readText(req, MAX_AUTH_BODY_BYTES);
  } catch (err) {
    if (err instanceof BodyTooLargeError) return problemResponse("too-large", `The request body is larger than ${MAX_AUTH_BODY_BYTES} bytes.`, { instance });
    return problemResponse("bad-request", "The request body is not UTF-8 text.", { instance });
  }
  const email = emailOfBody(body, req.headers.get("content-type") ?? "");
  if (email === null) return problemResponse("bad-request", "The request body is not valid JSON.", { instance });
  const [action] = (await ctx.params).nextauth ?? [];
  if (action === "callback") {
    try {
      await countPasswordAttempt(clientAddress(req), email);
    } catch (err) {
      return toProblem(err, instance);
    }
  }
  const res = await nextAuthHandler(new NextRequest(req.url, { method: req.method, headers: req.headers, body }), ctx);
  if (action === "callback" && (req.headers.get("content-type") ?? "").includes("application/json") && (await credentialsRefused(res))) {
    return problemResponse("sign-in-failed", "The e-mail and password do not match an account.", { instance });
  }
  return res;
}

/**
 * True when next-auth refused the credentials: it answers `{ url: "…?error=CredentialsSignin" }`
 * (to send a browser to the error page) and sets no session cookie.
 */
async function credentialsRefused(res: Response): Promise<boolean> {
  if (res.headers.getSetCookie().some((c) => c.startsWith("next-auth.session-token="))) return false;
  const text = await res.clone().text();
  return /[?&]error=CredentialsSignin\b/.test(text);
}
