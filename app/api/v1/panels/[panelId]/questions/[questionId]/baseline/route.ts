import { handle, otherMethods } from "@/lib/http/handler";
import { routes } from "@/lib/http/routes";
import { attachBaseline, getBaseline, removeBaseline } from "@/lib/triangulation/baselines";

export const GET = handle(routes.getBaseline, ({ actor, params }) => getBaseline(actor, params.panelId, params.questionId));
export const PUT = handle(routes.attachBaseline, ({ actor, params, body }) => attachBaseline(actor, params.panelId, params.questionId, body));
export const DELETE = handle(routes.removeBaseline, ({ actor, params }) => removeBaseline(actor, params.panelId, params.questionId));
export const { POST, PATCH } = otherMethods("GET, PUT, DELETE");
