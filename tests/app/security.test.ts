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
    const res = await fetch(`${baseURL}/api/v1/panels`, { method: "POST", headers: { authorization: `Bearer ${token}`, "content-type": "application/json" }, body: JSON.stringify({ title: "Quillmoor script" }) });
    expect(res.status).toBe(201);
  });
});

describe("request bodies", () => {
  const post = (body: BodyInit) =>
    fetch(`${baseURL}/api/v1/panels`, { method: "POST", headers: { authorization: `Bearer ${token}`, "content-type": "application/json" }, body });

  /**
   * Posts a 2.5 MiB body (`prefix` + 40 × 64 KiB + `suffix`) to `path` in 64 KiB chunks on its
   * own connection (node:http, no keep-alive, so a connection the server stops reading cannot
   * spoil later requests), with a Content-Length or chunked without one, pausing between chunks
   * and stopping as soon as the response arrives. A server that refuses a large body answers and
   * then closes the connection (RFC 9110 §15.5.14); a write that races that close fails with
   * EPIPE/ECONNRESET before the answer is read, so such a transport race is retried (at most 3
   * times) — the assertion is still on the status and body the server sends.
   */
  const postBigOnce = (chunked: boolean, path: string, headers: Record<string, string>, prefix: string, suffix: string) =>
    new Promise<{ status: number; body: string } | "connection closed">((resolve, reject) => {
      const chunk = "x".repeat(64 * 1024);
      const total = prefix.length + 40 * chunk.length + suffix.length;
      let answered = false;
      const req = http.request(`${baseURL}${path}`, {
        method: "POST",
        agent: false,
        headers: { ...headers, ...(chunked ? { "transfer-encoding": "chunked" } : { "content-length": String(total) }) },
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
      req.write(prefix);
      void (async () => {
        for (let sent = 0; sent < 40; sent++) {
          if (answered || req.destroyed) return;
          if (!req.write(chunk)) await new Promise((r) => req.once("drain", r));
          await new Promise((r) => setTimeout(r, 10));
        }
        if (!answered && !req.destroyed) req.end(suffix);
      })();
    });
  const postBig = async (chunked: boolean, path = "/api/v1/panels", headers: Record<string, string> = { authorization: `Bearer ${token}`, "content-type": "application/json" }, prefix = '{"title":"', suffix = '"}') => {
    for (let attempt = 0; attempt < 3; attempt++) {
      const res = await postBigOnce(chunked, path, headers, prefix, suffix);
      if (res !== "connection closed") return res;
    }
    throw new Error("the server closed the connection three times without an answer");
  };

  it("over 2 MiB is 413 problem+json, whether declared by Content-Length or streamed without one", async () => {
    for (const chunked of [false, true]) {
      const res = await postBig(chunked);
      expect(res.status, chunked ? "chunked" : "content-length").toBe(413);
      expect(JSON.parse(res.body)).toMatchObject({ type: "/problems/too-large", status: 413, title: "Payload Too Large" });
    }
  });

  it("sign-in (unauthenticated) over 16 KiB is 413 problem+json, declared or streamed, before next-auth reads it", async () => {
    const form = { "content-type": "application/x-www-form-urlencoded" };
    for (const chunked of [false, true]) {
      const res = await postBig(chunked, "/api/auth/callback/credentials", form, "email=a%40example.com&password=", "");
      expect(res.status, chunked ? "chunked" : "content-length").toBe(413);
      expect(JSON.parse(res.body)).toMatchObject({ type: "/problems/too-large", status: 413, title: "Payload Too Large" });
    }
    // A sign-in of ordinary size still works.
    expect(await signIn(createAccount("Odile Brand"))).toMatch(/^next-auth.session-token=/);
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
    expect((await limited.clone().json()).type).toBe("/problems/rate-limited");
    // Another account is not affected.
    expect(await signIn(createAccount("Vera Holm"))).toMatch(/^next-auth.session-token=/);
  });

  it("sign-in: the limit holds on the decoded path and on JSON bodies (the encodings next-auth accepts)", async () => {
    const user = createAccount("Ilse Varga");
    /** An attempt on `path` (percent-encoded variants route to the same handler), form or JSON body. */
    const attempt = async (path: string, password: string, json: boolean) => {
      const csrfRes = await fetch(`${baseURL}/api/auth/csrf`);
      const { csrfToken } = (await csrfRes.json()) as { csrfToken: string };
      const fields = { csrfToken, email: user.email, password, json: "true" };
      return fetch(`${baseURL}${path}`, {
        method: "POST",
        redirect: "manual",
        headers: { "content-type": json ? "application/json" : "application/x-www-form-urlencoded", cookie: csrfRes.headers.getSetCookie().map((c) => c.split(";")[0]).join("; ") },
        body: json ? JSON.stringify(fields) : new URLSearchParams(fields).toString(),
      });
    };
    const hasSession = (res: Response) => res.headers.getSetCookie().some((c) => c.startsWith("next-auth.session-token="));
    // 10 wrong passwords, as JSON and on encoded paths: each counts against the account.
    const paths = ["/api/auth/callback/credentials", "/api/auth/callback/credential%73", "/api/auth/%63allback/credentials"];
    for (let i = 0; i < 10; i++) {
      const json = i % 2 === 0;
      const res = await attempt(paths[i % 3], `wrong-${i}`, json);
      expect(hasSession(res)).toBe(false);
      if (json) {
        // An API client (JSON body) gets 401 problem+json; the browser's form keeps next-auth's answer.
        expect(res.status).toBe(401);
        expect(res.headers.get("content-type")).toBe("application/problem+json");
        expect(await res.json()).toMatchObject({ type: "/problems/sign-in-failed", status: 401 });
      } else {
        expect(res.headers.get("content-type")).toContain("application/json");
        expect((await res.json()).url).toMatch(/error=CredentialsSignin/);
      }
    }
    for (const path of paths) {
      for (const json of [false, true]) {
        const res = await attempt(path, user.password, json);
        expect(res.status, `${path} ${json ? "JSON" : "form"}`).toBe(429);
        expect(hasSession(res)).toBe(false);
      }
    }
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

/** Where a page sends the caller: its 3xx Location, or (once the page has started streaming) Next.js's refresh tag. */
async function redirectTarget(path: string, cookie: string): Promise<URL> {
  const res = await fetch(`${baseURL}${path}`, { headers: { cookie }, redirect: "manual" });
  const refresh = /<meta[^>]*http-equiv="refresh"[^>]*content="\d+;\s*url=([^"]*)"/i.exec(res.status === 200 ? await res.text() : "")?.[1];
  const location = res.headers.get("location") ?? refresh?.replaceAll("&amp;", "&");
  expect(location, `${path}: no redirect (status ${res.status})`).toBeTruthy();
  return new URL(location!, baseURL);
}

describe("sign-in redirect", () => {
  it("follows only paths of this site: encoded backslash and tab tricks land on the home page", async () => {
    const own = await signIn(createAccount("Pia Lund"));
    const origin = new URL(baseURL).origin;
    // WHATWG URL parsing (the browser's, https://url.spec.whatwg.org/) turns "\\" into "/" and drops tabs,
    // so "/\\evil.example/x" and "/<tab>/evil.example/x" both mean "//evil.example/x": another host.
    const target = (next: string) => redirectTarget(`/sign-in?next=${next}`, own);
    for (const next of ["/%5Cevil.example/x", "/%09/evil.example/x", "//evil.example/x", "https://evil.example/x"]) {
      const to = await target(next);
      expect(to.origin, next).toBe(origin);
      expect(to.pathname, next).toBe("/panels");
    }
    // "/.//evil.example/x" is the path "//evil.example/x" of this site (URL Standard, "." segments): kept on this site.
    expect((await target("/.//evil.example/x")).href).toBe(`${origin}/evil.example/x`);
    expect((await target(encodeURIComponent("/roster?x=1"))).href).toBe(`${origin}/roster?x=1`);
  });
});

/** Signs out through next-auth (CSRF token first), as the sign-out button does. */
async function signOut(session: string): Promise<Response> {
  const csrfRes = await fetch(`${baseURL}/api/auth/csrf`, { headers: { cookie: session } });
  const { csrfToken } = (await csrfRes.json()) as { csrfToken: string };
  const cookies = [session, ...csrfRes.headers.getSetCookie().map((c) => c.split(";")[0])].join("; ");
  return fetch(`${baseURL}/api/auth/signout`, {
    method: "POST",
    redirect: "manual",
    headers: { "content-type": "application/x-www-form-urlencoded", cookie: cookies },
    body: new URLSearchParams({ csrfToken, json: "true" }).toString(),
  });
}

describe("sessions", () => {
  it("a session cookie with a malformed %-escape is no session: 401, not 500", async () => {
    for (const value of ["%E0%A4%A", "%", "abc%zz"]) {
      const res = await fetch(`${baseURL}/api/v1/account`, { headers: { cookie: `next-auth.session-token=${value}` } });
      expect(res.status, value).toBe(401);
      expect(res.headers.get("content-type")).toBe("application/problem+json");
    }
  });

  it("after sign-out, a copy of the session cookie no longer works (reads, token minting), on pages neither", async () => {
    const user = createAccount("Rhea Stoll");
    const copy = await signIn(user);
    const other = await signIn(user);
    expect((await api("GET", "/api/v1/account", { cookie: copy })).status).toBe(200);
    expect((await signOut(copy)).status).toBe(200);
    expect((await api("GET", "/api/v1/account", { cookie: copy })).status).toBe(401);
    expect((await api("POST", "/api/v1/tokens", { cookie: copy, body: { name: "after sign-out" } })).status).toBe(401);
    expect((await redirectTarget("/account/tokens", copy)).pathname).toBe("/sign-in");
    // Signing out ends the user's sessions everywhere; a new sign-in works.
    expect((await api("GET", "/api/v1/account", { cookie: other })).status).toBe(401);
    expect((await api("GET", "/api/v1/account", { cookie: await signIn(user) })).status).toBe(200);
  });
});

describe("personal API tokens", () => {
  it("only a signed-in session creates or revokes tokens: a token cannot mint a child or revoke its parent", async () => {
    const own = await signIn(createAccount("Lars Ekholm"));
    const parent = (await api("POST", "/api/v1/tokens", { cookie: own, body: { name: "parent" } })).body;
    const child = await api("POST", "/api/v1/tokens", { token: parent.token, body: { name: "child" } });
    expect(child.status).toBe(403);
    expect(child.contentType).toBe("application/problem+json");
    expect((await api("DELETE", `/api/v1/tokens/${parent.id}`, { token: parent.token })).status).toBe(403);
    expect((await api("GET", "/api/v1/account", { token: parent.token })).status).toBe(200);
    expect((await api("DELETE", `/api/v1/tokens/${parent.id}`, { cookie: own })).status).toBe(200);
    expect((await api("GET", "/api/v1/account", { token: parent.token })).status).toBe(401);
  });

  it("expire: 90 days by default, at most 365, and an expired token is 401", async () => {
    const own = await signIn(createAccount("Mira Dahl"));
    const day = 86_400_000;
    const made = await api("POST", "/api/v1/tokens", { cookie: own, body: { name: "default expiry" } });
    expect(made.status).toBe(201);
    // 90 days: the project's default (THREATS.md), checked against the creation time.
    expect(Date.parse(made.body.expiresAt) - Date.parse(made.body.createdAt)).toBe(90 * day);
    const short = await api("POST", "/api/v1/tokens", { cookie: own, body: { name: "a week", expiresInDays: 7 } });
    expect(Date.parse(short.body.expiresAt) - Date.parse(short.body.createdAt)).toBe(7 * day);
    for (const expiresInDays of [0, 366, 1.5, "30"]) {
      const res = await api("POST", "/api/v1/tokens", { cookie: own, body: { name: "bad", expiresInDays } });
      expect(res.status, String(expiresInDays)).toBe(422);
      expect(res.text).toContain("expiresInDays");
    }
    expect((await api("GET", "/api/v1/account", { token: made.body.token })).status).toBe(200);
    await sql(`UPDATE "ApiToken" SET "expiresAt" = ? WHERE "id" = ?`, [new Date(Date.now() - 1000), made.body.id]);
    expect((await api("GET", "/api/v1/account", { token: made.body.token })).status).toBe(401);
  });
});

describe("password change", () => {
  it("needs the current password and a session, ends every session, and the new password signs in", async () => {
    const user = createAccount("Nils Orrin");
    const session = await signIn(user);
    const elsewhere = await signIn(user);
    const pat = await apiTokenFor(user);
    const change = (cookie: string, currentPassword: string, newPassword: string) => api("POST", "/api/v1/account/password", { cookie, body: { currentPassword, newPassword } });
    const wrong = await change(session, "not-the-password", "a-new-long-password-1");
    expect(wrong.status).toBe(422);
    expect(wrong.text).toContain("currentPassword");
    expect((await change(session, user.password, "short")).status).toBe(422);
    expect((await api("POST", "/api/v1/account/password", { token: pat, body: { currentPassword: user.password, newPassword: "a-new-long-password-1" } })).status).toBe(403);
    expect((await change(session, user.password, "a-new-long-password-1")).status).toBe(200);
    expect((await api("GET", "/api/v1/account", { cookie: elsewhere })).status).toBe(401);
    expect((await api("GET", "/api/v1/account", { cookie: session })).status).toBe(401);
    expect((await signInAttempt(user.email, user.password)).headers.getSetCookie().some((c) => c.startsWith("next-auth.session-token="))).toBe(false);
    expect(await signIn({ ...user, password: "a-new-long-password-1" })).toMatch(/^next-auth.session-token=/);
  });

  it("is rate-limited like sign-in: after 10 wrong current passwords the 11th try is 429 even when right", async () => {
    const user = createAccount("Olaf Rinne");
    const session = await signIn(user); // counts as the first attempt
    for (let i = 0; i < 9; i++) expect((await api("POST", "/api/v1/account/password", { cookie: session, body: { currentPassword: `wrong-${i}`, newPassword: "a-new-long-password-2" } })).status).toBe(422);
    const limited = await api("POST", "/api/v1/account/password", { cookie: session, body: { currentPassword: user.password, newPassword: "a-new-long-password-2" } });
    expect(limited.status).toBe(429);
    expect((await api("GET", "/api/v1/account", { cookie: session })).status).toBe(200);
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
    // Each event also in plain words, with the old value the update replaced.
    const updated = (log.body as { action: string; sentence: string }[]).find((e) => e.action === "question.updated")!;
    expect(updated.sentence).toMatch(/ changed the question 'QF-3 units in year one\?': the unit from 'units' to 'boxes'\.$/);
    // The panel page shows the same log to the organiser.
    const page = await fetch(`${baseURL}/panels/${panel.id}`, { headers: { cookie } });
    expect(page.status).toBe(200);
    const html = await page.text();
    expect(html).toContain("Audit log");
    // …in plain sentences (lib/panels/audit-text.ts), without the raw action ids.
    for (const a of ["opened round 1.", "closed round 1.", "revealed the names behind", "(reason: audit check)"]) expect(html).toContain(a);
    for (const a of ["round.opened", "identities.revealed"]) expect(html).not.toContain(a);

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
