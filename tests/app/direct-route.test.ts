/**
 * The answer route as the production server serves it: directly, beside Next.js
 * (lib/http/server.ts). What a client sees must not depend on that shortcut:
 * - its responses carry the same headers as an API route Next.js serves (the security headers of
 *   next.config.mjs, content type, cache policy, the authentication challenge);
 * - the rate limits see the connection's address when no proxy sets X-Forwarded-For, and the
 *   proxy's last entry when one does (as Next.js fills x-forwarded-for);
 * - a body sent in chunks, with no Content-Length, is cut off at the size limit with a 413 and
 *   stores nothing;
 * - a query string does not change the route.
 * Every other answer-route behaviour is tested through the same server by the other app tests.
 */
import http from "node:http";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { Client, createPanel, newKey, type PanelSetup } from "../harness/harness";
import { MAX_BODY_BYTES } from "@/lib/http/handler";
import { apiTokenFor, baseURL, clearDatabase, createAccount, sql } from "./api-client";

let setup: PanelSetup;
const client = new Client(baseURL, 4);

beforeAll(async () => {
  const token = await apiTokenFor(createAccount("Ilse Quillmoor"));
  setup = await createPanel(client, token, 2, 1);
});
afterAll(async () => {
  client.close();
  await clearDatabase();
});

/**
 * Headers that describe the connection or the transfer, not the response. Next.js gzips a
 * response when the client accepts it (hence content-encoding and vary); the direct route sends
 * its few hundred bytes of JSON as they are, which every client accepts.
 */
const TRANSPORT = new Set(["date", "connection", "keep-alive", "content-length", "transfer-encoding", "content-encoding", "vary"]);
const responseHeaders = (res: Response) => Object.fromEntries([...res.headers].filter(([k]) => !TRANSPORT.has(k)));

async function storedAnswers(invitationId: string): Promise<number> {
  const [row] = await sql<{ n: number | bigint }>(`SELECT COUNT(*) AS n FROM "Answer" WHERE "invitationId" = ?`, [invitationId]);
  return Number(row.n);
}

describe("the direct answer route", () => {
  it("answers without credentials exactly as a Next.js-served panelist route does", async () => {
    const direct = await fetch(`${baseURL}/api/v1/panelist/answers`, { method: "POST", headers: { "content-type": "application/json" }, body: "{}" });
    const viaNext = await fetch(`${baseURL}/api/v1/panelist/panel`);
    expect(direct.status).toBe(401);
    expect(viaNext.status).toBe(401);
    expect(responseHeaders(direct)).toEqual(responseHeaders(viaNext));
    expect(direct.headers.get("content-security-policy")).toBe("default-src 'none'; frame-ancestors 'none'; base-uri 'none'; form-action 'none'");
    const [a, b] = [await direct.json(), await viaNext.json()];
    expect({ ...a, instance: undefined }).toEqual({ ...b, instance: undefined });
    expect(a.instance).toBe("/api/v1/panelist/answers");
  });

  it("counts failed credentials against the connection's address, or the proxy's last X-Forwarded-For entry", async () => {
    await sql(`DELETE FROM "RateLimitWindow" WHERE "key" LIKE 'bad-tokens:%'`);
    const bad = { method: "POST", body: "{}", headers: { authorization: "Bearer not-a-token", "content-type": "application/json" } };
    expect((await fetch(`${baseURL}/api/v1/panelist/answers`, bad)).status).toBe(401);
    expect((await fetch(`${baseURL}/api/v1/panelist/answers`, { ...bad, headers: { ...bad.headers, "x-forwarded-for": "198.51.100.9, 203.0.113.7" } })).status).toBe(401);
    const keys = (await sql<{ key: string; count: number | bigint }>(`SELECT "key", "count" FROM "RateLimitWindow" WHERE "key" LIKE 'bad-tokens:%' ORDER BY "key"`)).map((r) => [r.key, Number(r.count)]);
    expect(keys).toEqual([
      ["bad-tokens:127.0.0.1", 1],
      ["bad-tokens:203.0.113.7", 1],
    ]);
  });

  it("refuses a chunked body over the size limit with 413 and stores nothing", async () => {
    const p = setup.panelists[0];
    const before = await storedAnswers(p.invitationId);
    const url = new URL("/api/v1/panelist/answers", baseURL);
    const result = await new Promise<{ status: number; body: string }>((resolve, reject) => {
      const req = http.request(url, { method: "POST", headers: { authorization: `Bearer ${p.token}`, "content-type": "application/json", "transfer-encoding": "chunked" } }, (res) => {
        let body = "";
        res.on("data", (c) => (body += c));
        res.on("end", () => resolve({ status: res.statusCode ?? 0, body }));
      });
      // The server may answer and close before the whole body is sent.
      req.on("error", (err) => (/EPIPE|ECONNRESET/.test(String(err)) ? undefined : reject(err)));
      req.write(`{"questionId":"${setup.questionIds[0]}","value":5,"rationale":"`);
      const chunk = "x".repeat(64 * 1024);
      for (let sent = 0; sent <= MAX_BODY_BYTES; sent += chunk.length) req.write(chunk);
      req.end(`"}`);
    });
    expect(result.status).toBe(413);
    expect(JSON.parse(result.body)).toMatchObject({ status: 413, title: "Payload Too Large" });
    expect(await storedAnswers(p.invitationId)).toBe(before);
  });

  it("serves the route with a query string too, storing the answer once", async () => {
    const p = setup.panelists[1];
    const key = newKey();
    const send = () =>
      client.request("POST", "/api/v1/panelist/answers?from=mail", { token: p.token, headers: { "idempotency-key": key }, body: { questionId: setup.questionIds[0], value: 4200 } });
    const first = await send();
    expect(first.status).toBe(201);
    expect(first.body.answer).toMatchObject({ value: 4200, version: 1 });
    const again = await send();
    expect(again.status).toBe(200);
    expect(again.body.replayed).toBe(true);
    expect(await storedAnswers(p.invitationId)).toBe(1);
  });
});
