import { handle, otherMethods } from "@/lib/http/handler";
import { routes } from "@/lib/http/routes";
import { listRounds, startNextRound } from "@/lib/panels/rounds";

export const GET = handle(routes.listRounds, ({ actor, params }) => listRounds(actor, params.panelId));
export const POST = handle(routes.startNextRound, ({ actor, params, body }) => startNextRound(actor, params.panelId, body));
export const { PUT, PATCH, DELETE } = otherMethods("GET, POST");
