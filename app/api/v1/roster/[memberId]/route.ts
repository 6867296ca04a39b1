import { handle, otherMethods } from "@/lib/http/handler";
import { routes } from "@/lib/http/routes";
import { deleteRosterMember, updateRosterMember } from "@/lib/panels/roster";

export const PATCH = handle(routes.updateRosterMember, ({ actor, params, body }) => updateRosterMember(actor, params.memberId, body));
export const DELETE = handle(routes.deleteRosterMember, ({ actor, params }) => deleteRosterMember(actor, params.memberId));
export const { GET, POST, PUT } = otherMethods("PATCH, DELETE");
