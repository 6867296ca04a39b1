import { Reply, handle, otherMethods } from "@/lib/http/handler";
import { routes } from "@/lib/http/routes";
import { submitAnswer } from "@/lib/panels/answers";

export const POST = handle(routes.submitAnswer, async ({ actor, body, idempotencyKey }) => {
  const stored = await submitAnswer(actor, body, { idempotencyKey });
  return stored.replayed ? new Reply(200, stored) : stored;
});
export const { GET, PUT, PATCH, DELETE } = otherMethods("POST");
