import { PROBLEM_TYPES, isProblemKind, problemTypeUri } from "@/lib/problem-types";

/**
 * The page at an API problem type's URI (lib/problem-types.ts): what the problem means. A route
 * handler rather than a page, so that an unknown type is a plain 404 (a streamed page answers 200).
 */
export async function GET(_req: Request, ctx: { params: Promise<{ type: string }> }): Promise<Response> {
  const { type } = await ctx.params;
  const html = (status: number, title: string, body: string) =>
    new Response(
      `<!doctype html><html lang="en"><head><meta charset="utf-8"><title>${title}</title></head><body><main>${body}</main></body></html>`,
      { status, headers: { "content-type": "text/html; charset=utf-8" } },
    );
  if (!isProblemKind(type)) return html(404, "Unknown problem type", `<h1>Unknown problem type</h1><p><a href="/api/v1/openapi.json">The OpenAPI document</a> lists them all.</p>`);
  const { status, title, description } = PROBLEM_TYPES[type];
  return html(
    200,
    `Problem: ${title}`,
    `<h1>${title}</h1><p>${description.replace(/`([^`]+)`/g, "<code>$1</code>")}</p>` +
      `<dl><dt>Problem type</dt><dd><code>${problemTypeUri(type)}</code></dd><dt>HTTP status</dt><dd>${status}</dd></dl>` +
      `<p>API errors are <code>application/problem+json</code> (RFC 9457); match on <code>type</code>, not on the English <code>detail</code>. ` +
      `The <a href="/api/v1/openapi.json">OpenAPI document</a> lists every type.</p>`,
  );
}
