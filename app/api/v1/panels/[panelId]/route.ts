import { handle, otherMethods } from "@/lib/http/handler";
import { routes } from "@/lib/http/routes";
import { deletePanel, getPanel, updatePanel } from "@/lib/panels/panels";

export const GET = handle(routes.getPanel, ({ actor, params }) => getPanel(actor, params.panelId));
export const PATCH = handle(routes.updatePanel, ({ actor, params, body }) => updatePanel(actor, params.panelId, body));
export const DELETE = handle(routes.deletePanel, ({ actor, params }) => deletePanel(actor, params.panelId));
export const { POST, PUT } = otherMethods("GET, PATCH, DELETE");
