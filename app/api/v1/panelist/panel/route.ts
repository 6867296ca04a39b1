import { handle, otherMethods } from "@/lib/http/handler";
import { routes } from "@/lib/http/routes";
import { getPanelistPanel } from "@/lib/panels/answers";

export const GET = handle(routes.getPanelistPanel, ({ actor }) => getPanelistPanel(actor));
export const { POST, PUT, PATCH, DELETE } = otherMethods("GET");
