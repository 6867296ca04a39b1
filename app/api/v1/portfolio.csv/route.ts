import { FileReply, handle, otherMethods } from "@/lib/http/handler";
import { routes } from "@/lib/http/routes";
import { getPortfolioCsv } from "@/lib/triangulation/portfolio";

export const GET = handle(routes.getPortfolioCsv, async ({ actor }) => {
  const { filename, csv } = await getPortfolioCsv(actor);
  return new FileReply(csv, "text/csv; charset=utf-8", filename);
});
export const { POST, PUT, PATCH, DELETE } = otherMethods("GET");
