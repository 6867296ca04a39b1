import { handle, otherMethods } from "@/lib/http/handler";
import { routes } from "@/lib/http/routes";
import { createApiToken, listApiTokens } from "@/lib/accounts/users";

export const GET = handle(routes.listApiTokens, ({ actor }) => listApiTokens(actor));
export const POST = handle(routes.createApiToken, ({ actor, body }) => createApiToken(actor, body));
export const { PUT, PATCH, DELETE } = otherMethods("GET, POST");
