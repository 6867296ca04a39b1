import { handle, otherMethods } from "@/lib/http/handler";
import { routes } from "@/lib/http/routes";
import { openRound } from "@/lib/panels/rounds";

export const POST = handle(routes.openRound, ({ actor, params, body }) => openRound(actor, params.panelId, params.roundNumber, body));
export const { GET, PUT, PATCH, DELETE } = otherMethods("POST");
