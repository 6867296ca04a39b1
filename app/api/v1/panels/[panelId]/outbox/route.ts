import { handle, otherMethods } from "@/lib/http/handler";
import { routes } from "@/lib/http/routes";
import { listOutbox } from "@/lib/panels/messages";

export const GET = handle(routes.listOutbox, ({ actor, params }) => listOutbox(actor, params.panelId));
export const { POST, PUT, PATCH, DELETE } = otherMethods("GET");
