import { handle, otherMethods } from "@/lib/http/handler";
import { routes } from "@/lib/http/routes";
import { changePassword, requireUser } from "@/lib/accounts/users";
import { clientAddress, countPasswordAttempt } from "@/lib/http/rate-limit";

export const POST = handle(routes.changePassword, async ({ actor, body, request }) => {
  await countPasswordAttempt(clientAddress(request), requireUser(actor).email);
  return changePassword(actor, body);
});
export const { GET, PUT, PATCH, DELETE } = otherMethods("POST");
