import { handle, otherMethods } from "@/lib/http/handler";
import { routes } from "@/lib/http/routes";
import { deleteOutboxMessage } from "@/lib/panels/messages";

export const DELETE = handle(routes.deleteOutboxMessage, ({ actor, params }) => deleteOutboxMessage(actor, params.panelId, params.messageId));
export const { GET, POST, PUT, PATCH } = otherMethods("DELETE");
