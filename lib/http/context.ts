/**
 * Who is making an API request: `Authorization: Bearer <token>` (a personal API token
 * `trg_pat_…` of an organiser, or a panelist's invitation token), else the next-auth session
 * cookie (valid while its session generation is current, lib/accounts/actor.ts). A Bearer header
 * that does not resolve is a 401 (it is not silently ignored); a cookie that does not is no session.
 */
import { decode } from "next-auth/jwt";
import { actorFromBearerToken, actorFromSession, type Actor } from "@/lib/accounts/actor";
import { authSecret } from "@/lib/env";
import { NotAuthenticatedError } from "@/lib/errors";

const SESSION_COOKIES = ["__Secure-next-auth.session-token", "next-auth.session-token"];

function cookieValue(header: string | null, name: string): string | undefined {
  if (!header) return undefined;
  for (const part of header.split(";")) {
    const eq = part.indexOf("=");
    if (eq > 0 && part.slice(0, eq).trim() === name) {
      try {
        return decodeURIComponent(part.slice(eq + 1).trim());
      } catch {
        return undefined; // a malformed %-escape: no such cookie (no session), not a server error
      }
    }
  }
  return undefined;
}

/** The session JWT from the cookie header (next-auth may split a large one into `.0`, `.1`, …). */
function sessionToken(cookieHeader: string | null): string | undefined {
  for (const name of SESSION_COOKIES) {
    const whole = cookieValue(cookieHeader, name);
    if (whole) return whole;
    const chunks: string[] = [];
    for (let i = 0; ; i++) {
      const c = cookieValue(cookieHeader, `${name}.${i}`);
      if (c === undefined) break;
      chunks.push(c);
    }
    if (chunks.length > 0) return chunks.join("");
  }
  return undefined;
}

/**
 * The actor of a request, or null when it carries no credentials at all.
 * @throws NotAuthenticatedError when a Bearer token is present but invalid, revoked or expired.
 */
export async function actorFromRequest(req: Request): Promise<Actor | null> {
  const auth = req.headers.get("authorization");
  if (auth) {
    const m = /^Bearer\s+(\S+)\s*$/i.exec(auth);
    if (!m) throw new NotAuthenticatedError("The Authorization header must be 'Bearer <token>'.");
    return actorFromBearerToken(m[1]);
  }
  const token = sessionToken(req.headers.get("cookie"));
  if (!token) return null;
  const secret = authSecret();
  if (!secret) return null;
  const jwt = await decode({ token, secret }).catch(() => null);
  if (!jwt?.sub || (jwt.exp !== undefined && typeof jwt.exp === "number" && jwt.exp * 1000 < Date.now())) return null;
  return actorFromSession(jwt.sub, jwt.gen);
}
