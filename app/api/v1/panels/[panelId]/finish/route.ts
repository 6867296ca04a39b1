import { handle, otherMethods } from "@/lib/http/handler";
import { routes } from "@/lib/http/routes";
import { finishPanel } from "@/lib/panels/rounds";

export const POST = handle(routes.finishPanel, ({ actor, params }) => finishPanel(actor, params.panelId));
export const { GET, PUT, PATCH, DELETE } = otherMethods("POST");
