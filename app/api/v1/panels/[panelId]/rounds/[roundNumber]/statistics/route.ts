import { handle, otherMethods } from "@/lib/http/handler";
import { routes } from "@/lib/http/routes";
import { getRoundStatistics } from "@/lib/panels/rounds";

export const GET = handle(routes.getRoundStatistics, ({ actor, params }) => getRoundStatistics(actor, params.panelId, params.roundNumber));
export const { POST, PUT, PATCH, DELETE } = otherMethods("GET");
