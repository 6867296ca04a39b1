import { handle, otherMethods } from "@/lib/http/handler";
import { routes } from "@/lib/http/routes";
import { revokeApiToken } from "@/lib/accounts/users";

export const DELETE = handle(routes.revokeApiToken, ({ actor, params }) => revokeApiToken(actor, params.tokenId));
export const { GET, POST, PUT, PATCH } = otherMethods("DELETE");
