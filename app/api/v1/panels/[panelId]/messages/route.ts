import { handle, otherMethods } from "@/lib/http/handler";
import { routes } from "@/lib/http/routes";
import { sendNotices } from "@/lib/panels/messages";

export const POST = handle(routes.sendNotices, ({ actor, params, body }) => sendNotices(actor, params.panelId, body));
export const { GET, PUT, PATCH, DELETE } = otherMethods("POST");
