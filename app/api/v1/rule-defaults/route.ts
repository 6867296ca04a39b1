import { handle, otherMethods } from "@/lib/http/handler";
import { routes } from "@/lib/http/routes";
import { STOPPING_RULE_DEFAULTS } from "@/lib/stats/stopping-rules";

export const GET = handle(routes.ruleDefaults, () => Promise.resolve(STOPPING_RULE_DEFAULTS));
export const { POST, PUT, PATCH, DELETE } = otherMethods("GET");
