import { handle, otherMethods } from "@/lib/http/handler";
import { routes } from "@/lib/http/routes";
import { getRoundAnswers } from "@/lib/panels/rounds";

export const GET = handle(routes.getRoundAnswers, ({ actor, params }) => getRoundAnswers(actor, params.panelId, params.roundNumber));
export const { POST, PUT, PATCH, DELETE } = otherMethods("GET");
