import { handle, otherMethods } from "@/lib/http/handler";
import { routes } from "@/lib/http/routes";
import { addQuestion } from "@/lib/panels/panels";

export const POST = handle(routes.addQuestion, ({ actor, params, body }) => addQuestion(actor, params.panelId, body));
export const { GET, PUT, PATCH, DELETE } = otherMethods("POST");
