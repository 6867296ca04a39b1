import { FileReply, handle, otherMethods } from "@/lib/http/handler";
import { routes } from "@/lib/http/routes";
import { getQuestionReportCsv } from "@/lib/triangulation/report";

export const GET = handle(routes.getQuestionReportCsv, async ({ actor, params }) => {
  const { filename, csv } = await getQuestionReportCsv(actor, params.panelId, params.questionId);
  return new FileReply(csv, "text/csv; charset=utf-8", filename);
});
export const { POST, PUT, PATCH, DELETE } = otherMethods("GET");
