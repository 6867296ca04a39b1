import { handle, otherMethods } from "@/lib/http/handler";
import { routes } from "@/lib/http/routes";
import { correctOutcome, getOutcome, recordOutcome } from "@/lib/triangulation/outcome";

export const GET = handle(routes.getOutcome, ({ actor, params }) => getOutcome(actor, params.panelId, params.questionId));
export const POST = handle(routes.recordOutcome, ({ actor, params, body }) => recordOutcome(actor, params.panelId, params.questionId, body));
export const PATCH = handle(routes.correctOutcome, ({ actor, params, body }) => correctOutcome(actor, params.panelId, params.questionId, body));
export const { PUT, DELETE } = otherMethods("GET, POST, PATCH");
