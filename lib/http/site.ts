/**
 * The site's own address, for the full private links put in e-mails and shown once: NEXTAUTH_URL
 * when it is set (the operator's word, lib/env.ts), else what the request was sent to.
 */
import { env } from "@/lib/env";

/** "https://host[:port]" without a trailing slash. @param requestUrl the request's URL, used without NEXTAUTH_URL */
export function siteOrigin(requestUrl: string): string {
  return new URL(env().NEXTAUTH_URL ?? requestUrl).origin;
}
