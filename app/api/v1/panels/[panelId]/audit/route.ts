import { handle, otherMethods } from "@/lib/http/handler";
import { routes } from "@/lib/http/routes";
import { listAuditEvents } from "@/lib/panels/audit";

export const GET = handle(routes.listAuditEvents, ({ actor, params }) => listAuditEvents(actor, params.panelId));
export const { POST, PUT, PATCH, DELETE } = otherMethods("GET");
