import { handle, otherMethods } from "@/lib/http/handler";
import { routes } from "@/lib/http/routes";
import { createFirstOrganiser } from "@/lib/accounts/users";

export const POST = handle(routes.setup, ({ body }) => createFirstOrganiser(body));
export const { GET, PUT, PATCH, DELETE } = otherMethods("POST");
