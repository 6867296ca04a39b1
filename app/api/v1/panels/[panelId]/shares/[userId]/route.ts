import { handle, otherMethods } from "@/lib/http/handler";
import { routes } from "@/lib/http/routes";
import { unsharePanel } from "@/lib/panels/panels";

export const DELETE = handle(routes.unsharePanel, ({ actor, params }) => unsharePanel(actor, params.panelId, params.userId));
export const { GET, POST, PUT, PATCH } = otherMethods("DELETE");
