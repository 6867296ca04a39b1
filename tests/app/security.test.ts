/**
 * Security measures of the running app: response headers on pages and API responses, the CSP
 * nonce on every script of a page, the Origin check on cookie-authenticated changes (CSRF), rate
 * limits on sign-in and invitations (429 problem+json with Retry-After), and the append-only
 * audit log (database triggers) that organisers can read.
 *
 * Accounts come from the admin CLI; the database is emptied at the end (clearDatabase).
 */
import { randomBytes } from "node:crypto";
import http from "node:http";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { api, apiTokenFor, baseURL, clearDatabase, createAccount, dialect, openDb, signIn, signInAttempt, sql, type TestUser } from "./api-client";

let organiser: TestUser;
let token = "";
let cookie = "";

beforeAll(async () => {
  organiser = createAccount("Sana Quillmoor");
  token = await apiTokenFor(organiser);
  cookie = await signIn(organiser);
});
afterAll(() => clearDatabase());

function expectCommonHeaders(h: Headers): void {
  expect(h.get("x-content-type-options")).toBe("nosniff");
  expect(h.get("referrer-policy")).toBe("no-referrer");
  expect(h.get("x-frame-options")).toBe("DENY");
  const csp = h.get("content-security-policy") ?? "";
  expect(csp).toContain("frame-ancestors 'none'");
  expect(csp).not.toContain("unsafe-eval");
}

describe("security headers", () => {
  it("a page has a nonce-based CSP without unsafe-eval or unsafe-inline scripts, and every script carries the nonce", async () => {
    const res = await fetch(`${baseURL}/sign-in`);
    expect(res.status).toBe(200);
    expectCommonHeaders(res.headers);
    const csp = res.headers.get("content-security-policy")!;
    const scriptSrc = csp.split(";").map((d) => d.trim()).find((d) => d.startsWith("script-src"))!;
    expect(scriptSrc).not.toContain("'unsafe-inline'");
    const nonce = /'nonce-([^']+)'/.exec(scriptSrc)?.[1];
    expect(nonce).toBeTruthy();
    const html = await res.text();
    const scripts = html.match(/<script\b[^>]*>/g) ?? [];
    expect(scripts.length).toBeGreaterThan(0);
    for (const s of scripts) expect(s).toContain(`nonce="${nonce}"`);
    // A fresh nonce per response.
    const again = await fetch(`${baseURL}/sign-in`);
    expect(again.headers.get("content-security-policy")).not.toBe(csp);
  });

  it("API responses, successful and not, carry the headers and a script-free CSP", async () => {
    for (const res of [await fetch(`${baseURL}/api/v1/rule-defaults`), await fetch(`${baseURL}/api/v1/account`)]) {
      expectCommonHeaders(res.headers);
      expect(res.headers.get("content-security-policy")).toContain("default-src 'none'");
    }
  });
});

describe("CSRF: changes made with the session cookie", () => {
  const post = (headers: Record<string, string>) =>
    fetch(`${baseURL}/api/v1/tokens`, { method: "POST", headers: { cookie, "content-type": "application/json", ...headers }, body: JSON.stringify({ name: "csrf check" }) });

  it("are refused without an Origin, or from another origin", async () => {
    const refused: Record<string, string>[] = [{}, { origin: "https://quillmoor.example" }, { origin: "null" }, { "sec-fetch-site": "cross-site" }];
    for (const headers of refused) {
      const res = await post(headers);
      expect(res.status, JSON.stringify(headers)).toBe(403);
      expect(res.headers.get("content-type")).toBe("application/problem+json");
      expect((await res.json()).detail).toMatch(/Cross-site/);
    }
  });

  it("are accepted from this origin (Origin, or Sec-Fetch-Site: same-origin)", async () => {
    expect((await post({ origin: baseURL })).status).toBe(201);
    expect((await post({ "sec-fetch-site": "same-origin" })).status).toBe(201);
  });

  it("reads with the cookie and changes with a Bearer token need no Origin", async () => {
    expect((await fetch(`${baseURL}/api/v1/account`, { headers: { cookie } })).status).toBe(200);
    const res = await fetch(`${baseURL}/api/v1/tokens`, { method: "POST", headers: { authorization: `Bearer ${token}`, "content-type": "application/json" }, body: JSON.stringify({ name: "script" }) });
    expect(res.status).toBe(201);
  });
});

describe("request bodies", () => {
  const post = (body: BodyInit) =>
    fetch(`${baseURL}/api/v1/panels`, { method: "POST", headers: { authorization: `Bearer ${token}`, "content-type": "application/json" }, body });

  /**
   * POSTs '{"title":"' + 40 × 64 KiB + '"}' (2.5 MiB) on its own connection (node:http, no
   * keep-alive, so a connection the server stops reading cannot spoil later requests), with a
   * Content-Length or chunked without one.
   */
  /**
   * Posts a 2.5 MiB body in 64 KiB chunks, pausing between chunks and stopping as soon as the
   * response arrives. A server that refuses a large body answers and then closes the connection
   * (RFC 9110 §15.5.14); a write that races that close fails with EPIPE/ECONNRESET before the
   * answer is read, so such a transport race is retried (at most 3 times) — the assertion is
   * still on the status and body the server sends.
   */
  const postBigOnce = (chunked: boolean) =>
    new Promise<{ status: number; body: string } | "connection closed">((resolve, reject) => {
      const chunk = "x".repeat(64 * 1024);
      const total = '{"title":"'.length + 40 * chunk.length + '"}'.length;
      let answered = false;
      const req = http.request(`${baseURL}/api/v1/panels`, {
        method: "POST",
        agent: false,
        headers: { authorization: `Bearer ${token}`, "content-type": "application/json", ...(chunked ? { "transfer-encoding": "chunked" } : { "content-length": String(total) }) },
      });
      req.on("response", (res) => {
        answered = true;
        let body = "";
        res.on("data", (c: Buffer) => (body += c.toString()));
        res.on("end", () => resolve({ status: res.statusCode ?? 0, body }));
      });
      req.on("error", (err: NodeJS.ErrnoException) => {
        if (answered) return;
        if (err.code === "EPIPE" || err.code === "ECONNRESET") resolve("connection closed");
        else reject(err);
      });
      req.write('{"title":"');
      void (async () => {
        for (let sent = 0; sent < 40; sent++) {
          if (answered || req.destroyed) return;
          if (!req.write(chunk)) await new Promise((r) => req.once("drain", r));
          await new Promise((r) => setTimeout(r, 10));
        }
        if (!answered && !req.destroyed) req.end('"}');
      })();
    });
  const postBig = async (chunked: boolean) => {
    for (let attempt = 0; attempt < 3; attempt++) {
      const res = await postBigOnce(chunked);
      if (res !== "connection closed") return res;
    }
    throw new Error("the server closed the connection three times without an answer");
  };

  it("over 2 MiB is 413 problem+json, whether declared by Content-Length or streamed without one", async () => {
    for (const chunked of [false, true]) {
      const res = await postBig(chunked);
      expect(res.status, chunked ? "chunked" : "content-length").toBe(413);
      expect(JSON.parse(res.body)).toMatchObject({ status: 413, title: "Payload Too Large" });
    }
  });

  it("not UTF-8 is 400 and says so; the panel list is unchanged", async () => {
    const before = (await api("GET", "/api/v1/panels", { token })).body.length;
    const res = await post(new Uint8Array([0x7b, 0x22, 0x74, 0x69, 0x74, 0x6c, 0x65, 0x22, 0x3a, 0x22, 0xe9, 0x22, 0x7d])); // {"title":"<Latin-1 é>"}
    expect(res.status).toBe(400);
    expect((await res.json()).detail).toMatch(/not UTF-8/);
    expect((await api("GET", "/api/v1/panels", { token })).body.length).toBe(before);
  });
});

describe("rate limits", () => {
  it("sign-in: after 10 attempts for one account from one address, the 11th is 429 with Retry-After, even with the right password", async () => {
    const user = createAccount("Tomas Brill");
    const attempt = (password: string) => signInAttempt(user.email, password);
    for (let i = 0; i < 10; i++) {
      const res = await attempt(`wrong-${i}-${randomBytes(4).toString("hex")}`);
      expect(res.status).not.toBe(429);
      expect(res.headers.getSetCookie().some((c) => c.startsWith("next-auth.session-token="))).toBe(false);
    }
    const limited = await attempt(user.password);
    expect(limited.status).toBe(429);
    expect(limited.headers.get("content-type")).toBe("application/problem+json");
    expect(Number(limited.headers.get("retry-after"))).toBeGreaterThan(0);
    expect(limited.headers.getSetCookie().some((c) => c.startsWith("next-auth.session-token="))).toBe(false);
    // Another account is not affected.
    expect(await signIn(createAccount("Vera Holm"))).toMatch(/^next-auth.session-token=/);
  });

  it("invalid credentials: the 301st within a minute from one address is 429, and then that address is refused; others are not", async () => {
    const from = (address: string, bearer: string) => fetch(`${baseURL}/api/v1/account`, { headers: { authorization: `Bearer ${bearer}`, "x-forwarded-for": address } });
    const address = `203.0.113.${1 + Math.floor(Math.random() * 250)}`;
    const statuses: number[] = [];
    for (let i = 0; i < 300; i++) statuses.push((await from(address, `trg_pat_${randomBytes(32).toString("base64url")}`)).status);
    expect(statuses.every((s) => s === 401)).toBe(true);
    const limited = await from(address, `trg_pat_${randomBytes(32).toString("base64url")}`);
    expect(limited.status).toBe(429);
    expect(limited.headers.get("content-type")).toBe("application/problem+json");
    expect(Number(limited.headers.get("retry-after"))).toBeGreaterThan(0);
    // While the window lasts, even a valid token from that address is refused (guessing cannot go on) …
    expect((await from(address, token)).status).toBe(429);
    // … but the same token from another address works.
    expect((await from("192.0.2.10", token)).status).toBe(200);
  });

  it("invitations: an organiser's 61st create/re-issue call within a minute is 429", async () => {
    const own = await apiTokenFor(createAccount("Ugo Marsh"));
    const panel = await api("POST", "/api/v1/panels", { token: own, body: { title: "Quillmoor limits" } });
    expect(panel.status).toBe(201);
    const statuses: number[] = [];
    for (let i = 0; i < 61; i++) {
      // An empty list is refused (422) but still counts: the limit is on calls, not on successes.
      statuses.push((await api("POST", `/api/v1/panels/${panel.body.id}/invitations`, { token: own, body: { rosterMemberIds: [] } })).status);
    }
    expect(statuses.slice(0, 60).every((s) => s === 422)).toBe(true);
    const last = await api("POST", `/api/v1/panels/${panel.body.id}/invitations`, { token: own, body: { rosterMemberIds: [] } });
    expect(last.status).toBe(429);
    expect(last.contentType).toBe("application/problem+json");
    // Other organisers are not affected.
    const other = await apiTokenFor(createAccount("Wim Tarn"));
    const p2 = await api("POST", "/api/v1/panels", { token: other, body: { title: "Other limits" } });
    expect((await api("POST", `/api/v1/panels/${p2.body.id}/invitations`, { token: other, body: { rosterMemberIds: [] } })).status).toBe(422);
  });
});

describe("audit log", () => {
  it("records organiser actions, shows them to the organiser, and cannot be changed or deleted", async () => {
    const q = { text: "QF-3 units in year one?", unit: "units", targetPeriod: "year one", lowerBound: 0, upperBound: 1000, answerFormat: "single", aggregation: "shared" };
    const panel = (await api("POST", "/api/v1/panels", { token, body: { title: "Quillmoor audit", questions: [q] } })).body;
    expect((await api("PATCH", `/api/v1/panels/${panel.id}/questions/${panel.questions[0].id}`, { token, body: { unit: "boxes" } })).status).toBe(200);
    expect((await api("POST", `/api/v1/panels/${panel.id}/rounds/1/open`, { token, body: {} })).status).toBe(200);
    expect((await api("POST", `/api/v1/panels/${panel.id}/rounds/1/close`, { token })).status).toBe(200);
    expect((await api("POST", `/api/v1/panels/${panel.id}/reveal`, { token, body: { reason: "audit check" } })).status).toBe(200);

    const log = await api("GET", `/api/v1/panels/${panel.id}/audit`, { token });
    expect(log.status).toBe(200);
    const actions = (log.body as { action: string }[]).map((e) => e.action);
    expect(actions).toEqual(expect.arrayContaining(["question.updated", "round.opened", "round.closed", "identities.revealed"]));
    // The panel page shows the same log to the organiser.
    const page = await fetch(`${baseURL}/panels/${panel.id}`, { headers: { cookie } });
    expect(page.status).toBe(200);
    const html = await page.text();
    expect(html).toContain("Audit log");
    for (const a of ["round.opened", "round.closed", "identities.revealed", "reason: audit check"]) expect(html).toContain(a);

    const conn = await openDb();
    try {
      const count = async () => (await conn.query<{ n: number }>(`SELECT COUNT(*) AS "n" FROM "AuditEvent" WHERE "panelId" = ?`, [panel.id]))[0].n;
      const n = await count();
      await expect(conn.query(`UPDATE "AuditEvent" SET "action" = 'nothing happened' WHERE "panelId" = ?`, [panel.id])).rejects.toThrow(/append-only/);
      await expect(conn.query(`DELETE FROM "AuditEvent" WHERE "panelId" = ?`, [panel.id])).rejects.toThrow(/append-only/);
      if (dialect === "postgresql") await expect(conn.query(`TRUNCATE "AuditEvent" CASCADE`)).rejects.toThrow(/append-only/);
      expect(await count()).toBe(n);
      expect((await conn.query<{ n: number }>(`SELECT COUNT(*) AS "n" FROM "AuditEvent" WHERE "action" = 'nothing happened'`))[0].n).toBe(0);
    } finally {
      await conn.close();
    }
    // Deleting the panel keeps its audit trail.
    expect((await api("DELETE", `/api/v1/panels/${panel.id}`, { token })).status).toBe(200);
    const [{ n: kept }] = await sql<{ n: number }>(`SELECT COUNT(*) AS "n" FROM "AuditEvent" WHERE "panelId" = ?`, [panel.id]);
    expect(kept).toBeGreaterThanOrEqual(4);
  });
});
