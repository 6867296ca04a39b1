import { handle, otherMethods } from "@/lib/http/handler";
import { routes } from "@/lib/http/routes";
import { getQuestionReport } from "@/lib/triangulation/report";

export const GET = handle(routes.getQuestionReport, ({ actor, params }) => getQuestionReport(actor, params.panelId, params.questionId));
export const { POST, PUT, PATCH, DELETE } = otherMethods("GET");
