import { handle, otherMethods } from "@/lib/http/handler";
import { routes } from "@/lib/http/routes";
import { revealIdentities } from "@/lib/panels/rounds";

export const POST = handle(routes.revealIdentities, ({ actor, params, body }) => revealIdentities(actor, params.panelId, body));
export const { GET, PUT, PATCH, DELETE } = otherMethods("POST");
