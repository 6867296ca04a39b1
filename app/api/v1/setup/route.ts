import { handle } from "@/lib/http/handler";
import { routes } from "@/lib/http/routes";
import { createFirstOrganiser } from "@/lib/accounts/users";

export const POST = handle(routes.setup, ({ body }) => createFirstOrganiser(body));
