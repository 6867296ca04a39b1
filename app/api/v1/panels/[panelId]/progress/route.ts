import { handle, otherMethods } from "@/lib/http/handler";
import { routes } from "@/lib/http/routes";
import { getProgress } from "@/lib/panels/rounds";

export const GET = handle(routes.getProgress, ({ actor, params }) => getProgress(actor, params.panelId));
export const { POST, PUT, PATCH, DELETE } = otherMethods("GET");
