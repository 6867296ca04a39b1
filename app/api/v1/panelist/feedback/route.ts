import { handle, otherMethods } from "@/lib/http/handler";
import { routes } from "@/lib/http/routes";
import { getFeedback } from "@/lib/panels/feedback";

export const GET = handle(routes.getFeedback, ({ actor }) => getFeedback(actor));
export const { POST, PUT, PATCH, DELETE } = otherMethods("GET");
