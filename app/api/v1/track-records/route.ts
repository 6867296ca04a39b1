import { handle, otherMethods } from "@/lib/http/handler";
import { routes } from "@/lib/http/routes";
import { listTrackRecords } from "@/lib/triangulation/track-records";

export const GET = handle(routes.listTrackRecords, ({ actor }) => listTrackRecords(actor));
export const { POST, PUT, PATCH, DELETE } = otherMethods("GET");
