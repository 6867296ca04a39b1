import { handle } from "@/lib/http/handler";
import { routes } from "@/lib/http/routes";
import { getConvergence } from "@/lib/panels/rounds";

export const GET = handle(routes.getConvergence, ({ actor, params }) => getConvergence(actor, params.panelId));
