import { handle } from "@/lib/http/handler";
import { routes } from "@/lib/http/routes";
import { openRound } from "@/lib/panels/rounds";

export const POST = handle(routes.openRound, ({ actor, params, body }) => openRound(actor, params.panelId, params.roundNumber, body));
