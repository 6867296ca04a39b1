import { handle, otherMethods } from "@/lib/http/handler";
import { routes } from "@/lib/http/routes";
import { closeRound } from "@/lib/panels/rounds";

export const POST = handle(routes.closeRound, ({ actor, params }) => closeRound(actor, params.panelId, params.roundNumber));
export const { GET, PUT, PATCH, DELETE } = otherMethods("POST");
