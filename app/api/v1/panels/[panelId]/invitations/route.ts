import { handle, otherMethods } from "@/lib/http/handler";
import { routes } from "@/lib/http/routes";
import { siteOrigin } from "@/lib/http/site";
import { createInvitations, listInvitations } from "@/lib/panels/invitations";

export const GET = handle(routes.listInvitations, ({ actor, params }) => listInvitations(actor, params.panelId));
export const POST = handle(routes.createInvitations, ({ actor, params, body, request }) => createInvitations(actor, params.panelId, body, siteOrigin(request.url)));
export const { PUT, PATCH, DELETE } = otherMethods("GET, POST");
