import { handle, otherMethods } from "@/lib/http/handler";
import { routes } from "@/lib/http/routes";
import { getCalibration } from "@/lib/triangulation/calibration";

export const GET = handle(routes.getPerformanceWeights, ({ actor, params }) => getCalibration(actor, params.panelId));
export const { POST, PUT, PATCH, DELETE } = otherMethods("GET");
