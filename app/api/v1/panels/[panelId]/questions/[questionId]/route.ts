import { handle, otherMethods } from "@/lib/http/handler";
import { routes } from "@/lib/http/routes";
import { deleteQuestion, updateQuestion } from "@/lib/panels/panels";

export const PATCH = handle(routes.updateQuestion, ({ actor, params, body }) => updateQuestion(actor, params.panelId, params.questionId, body));
export const DELETE = handle(routes.deleteQuestion, ({ actor, params }) => deleteQuestion(actor, params.panelId, params.questionId));
export const { GET, POST, PUT } = otherMethods("PATCH, DELETE");
