import { handle, otherMethods } from "@/lib/http/handler";
import { routes } from "@/lib/http/routes";
import { setTrueValue } from "@/lib/panels/panels";

export const PUT = handle(routes.setTrueValue, ({ actor, params, body }) => setTrueValue(actor, params.panelId, params.questionId, body));
export const { GET, POST, PATCH, DELETE } = otherMethods("PUT");
