import { handle, otherMethods } from "@/lib/http/handler";
import { routes } from "@/lib/http/routes";
import { getAccuracyHistory } from "@/lib/triangulation/track-records";

export const GET = handle(routes.getAccuracyHistory, ({ actor }) => getAccuracyHistory(actor));
export const { POST, PUT, PATCH, DELETE } = otherMethods("GET");
