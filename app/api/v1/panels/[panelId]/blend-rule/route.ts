import { handle, otherMethods } from "@/lib/http/handler";
import { routes } from "@/lib/http/routes";
import { setPanelBlendRule } from "@/lib/triangulation/triangulation";

export const PUT = handle(routes.setPanelBlendRule, ({ actor, params, body }) => setPanelBlendRule(actor, params.panelId, body));
export const { GET, POST, PATCH, DELETE } = otherMethods("PUT");
