/**
 * Where to go after signing in (`next` on /sign-in, next-auth's `callbackUrl`): only a place on
 * this site. The target is resolved as a browser would (WHATWG URL, https://url.spec.whatwg.org/:
 * "\" counts as "/", tabs and newlines are dropped), so "/\evil.example" and "/<tab>/evil.example"
 * are seen for what they are, another host, and refused.
 */

/** Stands for this site when the caller does not know its own origin (relative targets only). */
const THIS_SITE = "http://this-site.invalid";

/**
 * The path (with query and fragment) of `target` when it stays on `origin`, else null. The
 * returned path starts with exactly one "/", so it cannot be read as another host later.
 */
export function sameOriginPath(target: unknown, origin = THIS_SITE): string | null {
  if (typeof target !== "string" || target === "") return null;
  let url: URL;
  try {
    url = new URL(target, origin);
  } catch {
    return null;
  }
  if (url.origin !== new URL(origin).origin) return null;
  return `${url.pathname.replace(/^\/+/, "/")}${url.search}${url.hash}`;
}
