import { handle, otherMethods } from "@/lib/http/handler";
import { routes } from "@/lib/http/routes";
import { createPanel, listPanels } from "@/lib/panels/panels";

export const GET = handle(routes.listPanels, ({ actor }) => listPanels(actor));
export const POST = handle(routes.createPanel, ({ actor, body }) => createPanel(actor, body));
export const { PUT, PATCH, DELETE } = otherMethods("GET, POST");
