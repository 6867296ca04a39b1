/**
 * Sharing a panel by e-mail does not tell its owner which e-mails have accounts (THREATS.md):
 * sharing with an e-mail that has an account and with one that has none answers alike (status,
 * content type, the same fields), the share list shows the e-mails as typed (no account names),
 * a share made before its account existed gives access once the account is created (admin CLI),
 * a reviewer account shared as co-organiser still reads only, and a share is withdrawn by e-mail
 * whether or not its account exists.
 *
 * Accounts come from the admin CLI; people and e-mails are invented (example.com).
 */
import { randomBytes } from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { api, apiTokenFor, cli, clearDatabase, createAccount, signIn, type ApiResult, type TestUser } from "./api-client";

const QUESTION = { text: "Units in year one?", unit: "units", targetPeriod: "year one", lowerBound: 0, upperBound: 1000, answerFormat: "single", aggregation: "shared" };

let owner = "";
let known: TestUser;
let reviewerAccount: TestUser;
/** An e-mail without an account when it is shared; its account is created later in the test. */
const later = { email: `later.${randomBytes(4).toString("hex")}@example.com`, name: "Wynn Later", password: `pw-${randomBytes(9).toString("base64url")}` };
let panelId = "";

beforeAll(async () => {
  owner = await apiTokenFor(createAccount("Orla Sharer"));
  known = createAccount("Kit Known");
  reviewerAccount = createAccount("Remy Reader", "reviewer");
  const p = await api("POST", "/api/v1/panels", { token: owner, body: { title: "Shared panel", questions: [QUESTION] } });
  expect(p.status).toBe(201);
  panelId = p.body.id;
});
afterAll(() => clearDatabase());

const share = (email: string, role: "organiser" | "reviewer") => api("POST", `/api/v1/panels/${panelId}/shares`, { token: owner, body: { email, role } });
const unshare = (email: string) => api("DELETE", `/api/v1/panels/${panelId}/shares/${encodeURIComponent(email)}`, { token: owner });
const shape = (r: ApiResult) => ({ status: r.status, contentType: r.contentType, keys: Object.keys(r.body ?? {}).sort() });

describe("sharing by e-mail", () => {
  it("answers alike whether or not the e-mail has an account, and lists e-mails, not names", async () => {
    const withAccount = await share(known.email, "organiser");
    const withReviewerAccount = await share(reviewerAccount.email, "organiser");
    const without = await share(later.email, "organiser");

    expect(shape(withAccount)).toEqual({ status: 201, contentType: expect.stringContaining("application/json"), keys: ["email", "role"] });
    expect(shape(withReviewerAccount)).toEqual(shape(withAccount));
    expect(shape(without)).toEqual(shape(withAccount));
    // The role is echoed as asked, also for a reviewer account (a changed role would name the account's kind).
    expect(withAccount.body).toEqual({ email: known.email, role: "organiser" });
    expect(withReviewerAccount.body).toEqual({ email: reviewerAccount.email, role: "organiser" });
    expect(without.body).toEqual({ email: later.email, role: "organiser" });

    const list = await api("GET", `/api/v1/panels/${panelId}/shares`, { token: owner });
    expect(list.status).toBe(200);
    expect(list.body).toEqual(
      [known.email, reviewerAccount.email, later.email].sort().map((email) => ({ email, role: "organiser" })),
    );
    expect(list.text).not.toContain(known.name);
    expect(list.text).not.toContain(reviewerAccount.name);
  });

  it("gives the access to an account created after the share, and to existing accounts by their e-mail", async () => {
    cli(["create-organiser", "--email", later.email, "--name", later.name, "--password", later.password]);
    const laterToken = await apiTokenFor(later);
    const opened = await api("GET", `/api/v1/panels/${panelId}`, { token: laterToken });
    expect(opened.status).toBe(200);
    expect(opened.body.role).toBe("organiser");
    expect((await api("GET", "/api/v1/panels", { token: laterToken })).body.map((p: { id: string }) => p.id)).toContain(panelId);

    const knownToken = await apiTokenFor(known);
    expect((await api("GET", `/api/v1/panels/${panelId}`, { token: knownToken })).body.role).toBe("organiser");

    // lib/panels/access.ts: a reviewer account reads only, whatever role it was shared with.
    const reviewerCookie = await signIn(reviewerAccount);
    const asReviewer = await api("GET", `/api/v1/panels/${panelId}`, { cookie: reviewerCookie });
    expect(asReviewer.status).toBe(200);
    expect(asReviewer.body.role).toBe("reviewer");
    expect((await api("PATCH", `/api/v1/panels/${panelId}`, { cookie: reviewerCookie, body: { title: "Renamed" } })).status).toBe(403);
  });

  it("withdraws a share by e-mail, with or without an account behind it", async () => {
    const pending = `pending.${randomBytes(4).toString("hex")}@example.com`;
    expect((await share(pending, "reviewer")).status).toBe(201);
    for (const email of [known.email, later.email, pending]) {
      const res = await unshare(email);
      expect(res.status).toBe(200);
      expect(res.body).toEqual({ email, deleted: true });
    }
    expect((await unshare(pending)).status).toBe(404);
    const list = await api("GET", `/api/v1/panels/${panelId}/shares`, { token: owner });
    expect(list.body).toEqual([{ email: reviewerAccount.email, role: "organiser" }]);
    // The withdrawn accounts no longer reach the panel (unreachable panels are 404, lib/panels/access.ts).
    expect((await api("GET", `/api/v1/panels/${panelId}`, { token: await apiTokenFor(later) })).status).toBe(404);
    expect((await api("GET", `/api/v1/panels/${panelId}`, { token: await apiTokenFor(known) })).status).toBe(404);
  });
});
