/**
 * POST /api/v1/panelist/answers, the panelist's answer: one function that both ways in call, the
 * Next.js route module (app/api/v1/panelist/answers/route.ts) and the production server's direct
 * route (lib/http/server.ts, which calls it without Next.js for answer bursts).
 *
 * The production server loads this module twice (once in Next.js's bundle, once from the source
 * tree through tsx), so nothing reachable from it may keep state in a module variable: two copies
 * would each keep their own. What must be shared (the database connection, the caches of closed
 * rounds, the worker pool) lives on globalThis or in the database;
 * tests/http/direct-route-state.test.ts checks every module this one imports.
 */
import { Reply, handle } from "./handler";
import { routes } from "./routes";
import { submitAnswer } from "../panels/answers";

export const postAnswer = handle(routes.submitAnswer, async ({ actor, body, idempotencyKey }) => {
  const stored = await submitAnswer(actor, body, { idempotencyKey });
  return stored.replayed ? new Reply(200, stored) : stored;
});
