import { handle, otherMethods } from "@/lib/http/handler";
import { routes } from "@/lib/http/routes";
import { correctResolution, getResolution, resolveQuestion } from "@/lib/triangulation/resolution";

export const GET = handle(routes.getResolution, ({ actor, params }) => getResolution(actor, params.panelId, params.questionId));
export const POST = handle(routes.resolveQuestion, ({ actor, params, body }) => resolveQuestion(actor, params.panelId, params.questionId, body));
export const PATCH = handle(routes.correctResolution, ({ actor, params, body }) => correctResolution(actor, params.panelId, params.questionId, body));
export const { PUT, DELETE } = otherMethods("GET, POST, PATCH");
