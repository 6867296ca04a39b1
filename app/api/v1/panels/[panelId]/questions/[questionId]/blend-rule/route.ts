import { handle, otherMethods } from "@/lib/http/handler";
import { routes } from "@/lib/http/routes";
import { setQuestionBlendRule } from "@/lib/triangulation/triangulation";

export const PUT = handle(routes.setQuestionBlendRule, ({ actor, params, body }) => setQuestionBlendRule(actor, params.panelId, params.questionId, body));
export const { GET, POST, PATCH, DELETE } = otherMethods("PUT");
