import { handle, otherMethods } from "@/lib/http/handler";
import { routes } from "@/lib/http/routes";
import { getTriangulation } from "@/lib/triangulation/triangulation";

export const GET = handle(routes.getTriangulation, ({ actor, params }) => getTriangulation(actor, params.panelId, params.questionId));
export const { POST, PUT, PATCH, DELETE } = otherMethods("GET");
