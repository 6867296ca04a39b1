import { handle, otherMethods } from "@/lib/http/handler";
import { routes } from "@/lib/http/routes";
import { reissueInvitation } from "@/lib/panels/invitations";

export const POST = handle(routes.reissueInvitation, ({ actor, params, body }) => reissueInvitation(actor, params.panelId, params.invitationId, body));
export const { GET, PUT, PATCH, DELETE } = otherMethods("POST");
