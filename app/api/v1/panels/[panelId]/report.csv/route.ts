import { FileReply, handle, otherMethods } from "@/lib/http/handler";
import { routes } from "@/lib/http/routes";
import { getPanelReportCsv } from "@/lib/triangulation/panel-reports";

export const GET = handle(routes.getPanelReportCsv, async ({ actor, params }) => {
  const { filename, csv } = await getPanelReportCsv(actor, params.panelId);
  return new FileReply(csv, "text/csv; charset=utf-8", filename);
});
export const { POST, PUT, PATCH, DELETE } = otherMethods("GET");
