/**
 * The first-run endpoint (POST /api/v1/setup: only while no organiser exists) and the OpenAPI
 * 3.1 document generated from the route table's zod schemas.
 */
import { afterAll, describe, expect, it } from "vitest";
import { routes } from "../../lib/http/routes";
import { api, baseURL, clearDatabase, signIn, sql } from "./api-client";

afterAll(() => clearDatabase());

describe("POST /api/v1/setup", () => {
  it("creates the first organiser only while none exists; the account can sign in", async () => {
    const [{ n: organisers }] = await sql<{ n: number }>(`SELECT COUNT(*) AS "n" FROM "User" WHERE "role" = 'organiser'`);
    const first = { email: "Wren.Owner@Example.com", name: "Odile Ashcombe", password: "a sensible passphrase" };
    const res = await api("POST", "/api/v1/setup", { body: first });
    if (organisers === 0) {
      expect(res.status).toBe(201);
      expect(res.body).toMatchObject({ email: "wren.owner@example.com", name: "Odile Ashcombe", role: "organiser" });
      expect(res.text).not.toContain("scrypt");
      const cookie = await signIn({ ...first, email: "wren.owner@example.com" });
      expect((await api("GET", "/api/v1/account", { cookie })).body.email).toBe("wren.owner@example.com");
    } else {
      // Another app test file ran first and left an organiser: the endpoint must refuse.
      expect(res.status).toBe(409);
    }
    const second = await api("POST", "/api/v1/setup", { body: { email: "late@example.com", name: "Late", password: "another passphrase" } });
    expect(second.status).toBe(409);
    expect(second.contentType).toContain("application/problem+json");
    expect(second.body.detail).toMatch(/organiser already exists/);
    expect(second.body.type).toBe("/problems/account-exists");
  });

  it("a wrong password does not sign in", async () => {
    await expect(signIn({ email: "wren.owner@example.com", name: "x", password: "not the passphrase" })).rejects.toThrow(/no session cookie/);
  });

  it("several first-run sign-ups at once on an empty database make exactly one organiser", async () => {
    await clearDatabase();
    // 24 at once: with 6 the check-then-insert race on PostgreSQL did not show here; with 30, before
    // the transaction was made serializable, several of them were each made an organiser.
    const results = await Promise.all(
      Array.from({ length: 24 }, (_, i) => api("POST", "/api/v1/setup", { body: { email: `first.${i}@quillmoor.example`, name: `Founder ${i}`, password: "a sensible passphrase" } })),
    );
    expect(results.filter((r) => r.status === 201)).toHaveLength(1);
    expect(results.filter((r) => r.status === 409)).toHaveLength(23);
    for (const r of results.filter((x) => x.status === 409)) expect(r.body.detail).toMatch(/organiser already exists/);
    const [{ n }] = await sql<{ n: number | bigint | string }>(`SELECT COUNT(*) AS "n" FROM "User"`);
    expect(Number(n)).toBe(1);
  });
});

describe("GET /api/v1/openapi.json", () => {
  it("is an OpenAPI 3.1 document with every operation of the route table", async () => {
    const res = await api("GET", "/api/v1/openapi.json");
    expect(res.status).toBe(200);
    const doc = res.body;
    expect(doc.openapi).toBe("3.1.0");
    for (const r of Object.values(routes)) {
      const op = doc.paths[r.path]?.[r.method.toLowerCase()];
      expect(op, `${r.method} ${r.path}`).toBeDefined();
      expect(op.operationId).toBe(r.operationId);
      expect(Object.keys(op.responses)).toContain(String(r.status));
      if (r.auth !== "none") expect(Object.keys(op.responses)).toEqual(expect.arrayContaining(["401", "403"]));
    }
  });

  it("describes request bodies from the zod schemas (enums, bounds, nested questions)", async () => {
    const doc = (await api("GET", "/api/v1/openapi.json")).body;
    const create = doc.paths["/api/v1/panels"].post.requestBody.content["application/json"].schema;
    expect(create.required).toEqual(["title"]);
    const q = create.properties.questions.items;
    expect(q.properties.answerFormat.enum).toEqual(["single", "three-point"]);
    expect(q.properties.aggregation.enum).toEqual(["shared", "sum-of-parts"]);
    expect(q.required).toEqual(expect.arrayContaining(["lowerBound", "upperBound", "unit", "targetPeriod"]));
    const stability = doc.paths["/api/v1/panels/{panelId}"].patch.requestBody.content["application/json"].schema.properties.stabilityThreshold;
    expect(stability.maximum).toBe(1);
    expect(doc.paths["/api/v1/panels"].post.requestBody.required).toBe(true);
    expect(doc.paths["/api/v1/panels/{panelId}/rounds/{roundNumber}/open"].post.requestBody.required).toBe(false);
    const answer = doc.paths["/api/v1/panelist/answers"].post;
    expect(answer.parameters.map((p: { name: string }) => p.name)).toContain("Idempotency-Key");
    expect(answer.responses["422"].content["application/problem+json"].schema.$ref).toBe("#/components/schemas/Problem");
    expect(doc.components.schemas.Problem.properties.errors.items.properties.field.type).toBe("string");
    // The idempotent replay of an answer (lib/panels/answers.ts) answers 200 with the stored answer.
    expect(Object.keys(answer.responses)).toEqual(expect.arrayContaining(["200", "201"]));
    expect(answer.responses["200"].content["application/json"].schema).toEqual(answer.responses["201"].content["application/json"].schema);
  });

  it("lists every problem type with a title and a description, and serves each as a page", async () => {
    const doc = (await api("GET", "/api/v1/openapi.json")).body;
    const types: { const: string; title: string; description: string }[] = doc.components.schemas.Problem.properties.type.anyOf;
    // The kinds the API documents for clients (lib/problem-types.ts); RFC 9457 §3.1.1 wants each type stable.
    for (const kind of ["round-not-open", "round-closed", "panel-finished", "idempotency-key-reused", "duplicate-roster-member", "rate-limited", "validation-failed", "not-found", "forbidden", "unauthenticated", "too-large", "sign-in-failed"]) {
      const t = types.find((x) => x.const === `/problems/${kind}`);
      expect(t, kind).toBeDefined();
      expect(t!.title.length, kind).toBeGreaterThan(3);
      expect(t!.description.length, kind).toBeGreaterThan(20);
    }
    const page = await fetch(`${baseURL}/problems/round-closed`);
    expect(page.status).toBe(200);
    expect(page.headers.get("content-type")).toContain("text/html");
    const html = await page.text();
    expect(html).toContain("Round closed");
    expect(html).toContain("409");
    expect((await fetch(`${baseURL}/problems/no-such-kind`)).status).toBe(404);
  });
});

describe("unknown API paths", () => {
  it("answer 404 as problem+json", async () => {
    const res = await api("GET", "/api/v1/no-such-thing/here");
    expect(res.status).toBe(404);
    expect(res.contentType).toContain("application/problem+json");
    expect(res.body.detail).toMatch(/openapi\.json/);
    expect(res.body.type).toBe("/problems/not-found");
  });

  it("answer a method a path does not serve with 405 problem+json and an Allow header listing the ones it does (RFC 9110 §15.5.6)", async () => {
    const byPath = new Map<string, string[]>();
    for (const r of Object.values(routes)) byPath.set(r.path, [...(byPath.get(r.path) ?? []), r.method]);
    expect(byPath.size).toBeGreaterThan(30);
    for (const [template, methods] of byPath) {
      const other = ["GET", "POST", "PUT", "PATCH", "DELETE"].find((m) => !methods.includes(m))!;
      const res = await api(other, template.replace(/\{[^}]+\}/g, "x1"));
      expect(res.status, `${other} ${template}`).toBe(405);
      expect(res.contentType).toContain("application/problem+json");
      expect(res.body).toMatchObject({ status: 405, title: "Method Not Allowed" });
      const allow = (await fetch(`${baseURL}${template.replace(/\{[^}]+\}/g, "x1")}`, { method: other })).headers.get("allow") ?? "";
      expect(allow.split(", ").sort(), template).toEqual([...methods].sort());
    }
  });
});

