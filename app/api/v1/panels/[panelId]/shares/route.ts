import { handle, otherMethods } from "@/lib/http/handler";
import { routes } from "@/lib/http/routes";
import { listShares, sharePanel } from "@/lib/panels/panels";

export const GET = handle(routes.listShares, ({ actor, params }) => listShares(actor, params.panelId));
export const POST = handle(routes.sharePanel, ({ actor, params, body }) => sharePanel(actor, params.panelId, body));
export const { PUT, PATCH, DELETE } = otherMethods("GET, POST");
