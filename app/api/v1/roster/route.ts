import { handle, otherMethods } from "@/lib/http/handler";
import { routes } from "@/lib/http/routes";
import { addRosterMember, listRoster } from "@/lib/panels/roster";

export const GET = handle(routes.listRoster, ({ actor }) => listRoster(actor));
export const POST = handle(routes.addRosterMember, ({ actor, body }) => addRosterMember(actor, body));
export const { PUT, PATCH, DELETE } = otherMethods("GET, POST");
