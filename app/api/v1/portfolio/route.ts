import { handle, otherMethods } from "@/lib/http/handler";
import { routes } from "@/lib/http/routes";
import { getPortfolio } from "@/lib/triangulation/portfolio";

export const GET = handle(routes.getPortfolio, ({ actor }) => getPortfolio(actor));
export const { POST, PUT, PATCH, DELETE } = otherMethods("GET");
