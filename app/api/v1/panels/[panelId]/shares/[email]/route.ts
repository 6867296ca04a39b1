import { handle, otherMethods } from "@/lib/http/handler";
import { routes } from "@/lib/http/routes";
import { unsharePanel } from "@/lib/panels/panels";

export const DELETE = handle(routes.unsharePanel, ({ actor, params }) => unsharePanel(actor, params.panelId, params.email));
export const { GET, POST, PUT, PATCH } = otherMethods("DELETE");
