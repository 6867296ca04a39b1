import { handle, otherMethods } from "@/lib/http/handler";
import { routes } from "@/lib/http/routes";
import { getConvergence } from "@/lib/panels/rounds";

export const GET = handle(routes.getConvergence, ({ actor, params }) => getConvergence(actor, params.panelId));
export const { POST, PUT, PATCH, DELETE } = otherMethods("GET");
