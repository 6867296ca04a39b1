import { handle, otherMethods } from "@/lib/http/handler";
import { routes } from "@/lib/http/routes";
import { previewBaseline } from "@/lib/triangulation/baselines";

export const POST = handle(routes.previewBaseline, ({ actor, params, body }) => previewBaseline(actor, params.panelId, params.questionId, body));
export const { GET, PUT, PATCH, DELETE } = otherMethods("POST");
