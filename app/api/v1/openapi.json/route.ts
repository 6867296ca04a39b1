import { openApiDocument } from "@/lib/http/openapi";

export function GET(): Response {
  return Response.json(openApiDocument(), { headers: { "cache-control": "public, max-age=300" } });
}
