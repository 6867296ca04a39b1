import { handle, otherMethods } from "@/lib/http/handler";
import { routes } from "@/lib/http/routes";
import { revokeInvitation } from "@/lib/panels/invitations";

export const DELETE = handle(routes.revokeInvitation, ({ actor, params }) => revokeInvitation(actor, params.panelId, params.invitationId));
export const { GET, POST, PUT, PATCH } = otherMethods("DELETE");
