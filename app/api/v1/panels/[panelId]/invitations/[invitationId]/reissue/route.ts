import { handle, otherMethods } from "@/lib/http/handler";
import { routes } from "@/lib/http/routes";
import { siteOrigin } from "@/lib/http/site";
import { reissueInvitation } from "@/lib/panels/invitations";

export const POST = handle(routes.reissueInvitation, ({ actor, params, body, request }) =>
  reissueInvitation(actor, params.panelId, params.invitationId, body, siteOrigin(request.url)),
);
export const { GET, PUT, PATCH, DELETE } = otherMethods("POST");
