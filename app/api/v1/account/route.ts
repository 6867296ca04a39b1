import { handle, otherMethods } from "@/lib/http/handler";
import { routes } from "@/lib/http/routes";
import { getAccount } from "@/lib/accounts/users";

export const GET = handle(routes.getAccount, ({ actor }) => getAccount(actor));
export const { POST, PUT, PATCH, DELETE } = otherMethods("GET");
