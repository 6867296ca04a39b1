import { problemResponse } from "@/lib/http/problem";

/** Any /api/v1 path that is not in the route table: 404 as problem+json (not the HTML page). */
function notFound(req: Request): Response {
  const instance = new URL(req.url).pathname;
  return problemResponse("not-found", `No API operation at ${instance}; see /api/v1/openapi.json.`, { instance });
}

export { notFound as GET, notFound as POST, notFound as PUT, notFound as PATCH, notFound as DELETE };
