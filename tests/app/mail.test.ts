/**
 * E-mail to panelists (lib/panels/messages.ts) against a real SMTP server: the `smtp-server`
 * package, started by this test on 127.0.0.1 (an implementation of RFC 5321 outside this
 * project). A second app instance on the suite's database is started with SMTP_URL naming it.
 * Checked on what the SMTP server received, parsed here from the raw messages:
 * - invitations with send: true — one message per person, envelope and To: that person only,
 *   the private link in the body opens that panelist's page; a recipient the server refuses
 *   ends in the outbox with the server's reason;
 * - the round-opened notice goes to every panelist whose link works; a reminder only to those
 *   who have not answered every question of the open round, and the organiser gets counts only;
 * - no message holds another panelist's name, e-mail, link or any pseudonym.
 * On the suite's own server (no SMTP_URL) the same notices go to the outbox, and reminders are
 * refused (409 smtp-required), so the outbox never shows who has not answered.
 */
import { randomBytes } from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { inject } from "vitest";
import { freePort, startServer, type RunningServer } from "../harness/harness";
import { expectNothingOfOthers, linkIn, startSmtpInbox, type Received, type SmtpInbox } from "./smtp-inbox";
import { api, apiTokenFor, baseURL, clearDatabase, createAccount, databaseUrl, signIn } from "./api-client";

let inbox: SmtpInbox;
let received: Received[] = [];
let second: RunningServer | undefined;
let B = "";
let token = "";

/** A request to the instance with SMTP (api() of api-client goes to the suite's server). */
async function atB(method: string, path: string, body?: unknown, bearer = token) {
  const headers: Record<string, string> = { authorization: `Bearer ${bearer}` };
  if (body !== undefined) headers["content-type"] = "application/json";
  const res = await fetch(`${B}${path}`, { method, headers, body: body === undefined ? undefined : JSON.stringify(body) });
  const text = await res.text();
  return { status: res.status, body: text ? JSON.parse(text) : undefined };
}

/** The messages received since `from` (the app answers only after the SMTP server accepted them). */
function takeReceived(from: number): Received[] {
  return received.slice(from);
}

const QUESTION = { text: "Wren-2 sensors shipped in the first year?", unit: "units", targetPeriod: "first 12 months", lowerBound: 0, upperBound: 100_000, answerFormat: "single", aggregation: "shared" };

interface Member {
  readonly id: string;
  readonly name: string;
  readonly email: string;
}

async function rosterOf(names: readonly string[], at: (m: string, p: string, b?: unknown) => Promise<{ status: number; body: any }>): Promise<Member[]> {
  const out: Member[] = [];
  for (const name of names) {
    const email = `${name.toLowerCase().replace(/[^a-z]+/g, ".")}.${randomBytes(3).toString("hex")}@quillmoor.example`;
    const r = await at("POST", "/api/v1/roster", { name, email });
    expect(r.status).toBe(201);
    out.push({ id: r.body.id, name, email });
  }
  return out;
}

beforeAll(async () => {
  inbox = await startSmtpInbox();
  received = inbox.received;
  second = await startServer({
    databaseUrl,
    port: await freePort(),
    distDir: process.env.NEXT_DIST_DIR || ".next",
    secret: inject("authSecret"),
    env: inbox.env,
  });
  B = second.baseURL;
  token = await apiTokenFor(createAccount("Mirela Stroud"));
});

afterAll(async () => {
  await second?.stop();
  await inbox?.close();
  await clearDatabase();
});

describe("e-mail through a real SMTP server", () => {
  let panelId = "";
  let members: Member[] = [];
  const links = new Map<string, string>(); // e-mail → link from the API
  const tokens = new Map<string, string>();
  let pseudonyms: string[] = [];

  /** No message names anyone but its recipient, nor carries another's link or a pseudonym. */
  function expectOnlyOwn(m: Received, own: Member): void {
    expectNothingOfOthers(m, own.email, members.map((o) => ({ name: o.name, email: o.email, secret: tokens.get(o.email) })), pseudonyms);
  }

  it("e-mails each invited person their own private link, which opens their panelist page", async () => {
    const panel = await atB("POST", "/api/v1/panels", { title: `Wren-2 year one ${randomBytes(3).toString("hex")}`, questions: [QUESTION] });
    expect(panel.status).toBe(201);
    panelId = panel.body.id;
    members = await rosterOf(["Tove Lindqvist", "Arjun Pellew", "Maren Colquhoun"], (m, p, b) => atB(m, p, b));
    const before = received.length;
    const inv = await atB("POST", `/api/v1/panels/${panelId}/invitations`, { rosterMemberIds: members.map((m) => m.id), send: true });
    expect(inv.status).toBe(201);
    for (const i of inv.body) {
      expect(i.delivery).toBe("sent");
      links.set(i.email, `${B}${i.link}`);
      tokens.set(i.email, i.token);
    }
    const mails = takeReceived(before);
    expect(mails).toHaveLength(3);
    pseudonyms = (await atB("GET", `/api/v1/panels/${panelId}/progress`)).body.panelists.map((p: { pseudonym: string }) => p.pseudonym);
    expect(pseudonyms).toHaveLength(3);
    for (const m of members) {
      const mail = mails.find((x) => x.rcptTo.includes(m.email));
      expect(mail, `an invitation to ${m.email}`).toBeDefined();
      // The envelope and the header name this one person only (no Cc, no Bcc).
      expect(mail!.rcptTo).toEqual([m.email]);
      expect(mail!.headers.to).toContain(`<${m.email}>`);
      expect(mail!.headers.cc).toBeUndefined();
      expect(mail!.headers.from).toContain("panels@quillmoor.example");
      expect(mail!.headers.subject).toContain("Invitation");
      expect(mail!.body).toContain(`Dear ${m.name},`);
      const link = linkIn(mail!);
      expect(link).toBe(links.get(m.email));
      expectOnlyOwn(mail!, m);
      // The link opens the panelist's page (the panel's question is on it).
      const page = await fetch(link!);
      expect(page.status).toBe(200);
      expect(await page.text()).toContain(QUESTION.text);
    }
  });

  it("keeps an invitation the SMTP server refuses in the outbox, with the server's reason", async () => {
    const [bounce] = await rosterOf(["Bounce Tester"], (m, p, b) => atB(m, p, b));
    const before = received.length;
    const inv = await atB("POST", `/api/v1/panels/${panelId}/invitations`, { rosterMemberIds: [bounce.id], send: true });
    expect(inv.status).toBe(201);
    expect(inv.body[0].delivery).toBe("outbox");
    expect(received.length).toBe(before);
    const outbox = await atB("GET", `/api/v1/panels/${panelId}/outbox`);
    expect(outbox.body).toHaveLength(1);
    expect(outbox.body[0].to).toContain(bounce.email);
    expect(outbox.body[0].reason).toMatch(/550|No such mailbox/);
    expect(outbox.body[0].body).toContain(inv.body[0].link);
    expect((await atB("DELETE", `/api/v1/panels/${panelId}/outbox/${outbox.body[0].id}`)).status).toBe(200);
    // Revoked, so that the rest of the test has the three invitations only.
    expect((await atB("DELETE", `/api/v1/panels/${panelId}/invitations/${inv.body[0].id}`)).status).toBe(200);
  });

  it("sends the round-opened notice to every panelist, and a reminder only to those who have not answered", async () => {
    expect((await atB("POST", `/api/v1/panels/${panelId}/rounds/1/open`, { deadline: new Date(Date.now() + 7 * 86_400_000).toISOString() })).status).toBe(200);
    let before = received.length;
    const notice = await atB("POST", `/api/v1/panels/${panelId}/messages`, { kind: "round-opened" });
    expect(notice.status).toBe(200);
    expect(notice.body).toEqual({ kind: "round-opened", roundNumber: 1, recipients: 3, sent: 3, outbox: 0, failed: 0 });
    const notices = takeReceived(before);
    expect(notices.map((m) => m.rcptTo).flat().sort()).toEqual(members.map((m) => m.email).sort());
    for (const m of members) {
      const mail = notices.find((x) => x.rcptTo.includes(m.email))!;
      expect(mail.rcptTo).toEqual([m.email]);
      expect(mail.body).toContain("Round 1");
      expectOnlyOwn(mail, m);
    }

    // The first panelist answers; the others do not.
    const question = (await atB("GET", "/api/v1/panelist/panel", undefined, tokens.get(members[0].email))).body.questions[0];
    expect((await atB("POST", "/api/v1/panelist/answers", { questionId: question.id, value: 4200 }, tokens.get(members[0].email))).status).toBe(201);

    before = received.length;
    const reminder = await atB("POST", `/api/v1/panels/${panelId}/messages`, { kind: "reminder" });
    expect(reminder.status).toBe(200);
    // Counts only: nothing in the answer says who was reminded.
    expect(reminder.body).toEqual({ kind: "reminder", roundNumber: 1, recipients: 2, sent: 2, outbox: 0, failed: 0 });
    expect(JSON.stringify(reminder.body)).not.toContain("@");
    const reminders = takeReceived(before);
    expect(reminders.map((m) => m.rcptTo).flat().sort()).toEqual([members[1].email, members[2].email].sort());
    for (const m of members.slice(1)) {
      const mail = reminders.find((x) => x.rcptTo.includes(m.email))!;
      expect(mail.rcptTo).toEqual([m.email]);
      expect(mail.headers.subject).toContain("Reminder");
      expectOnlyOwn(mail, m);
      // Nothing about who answered: not the one who did, not how many.
      expect(mail.body).not.toContain(members[0].name);
      expect(mail.body).not.toMatch(/\b[0-9]+ (of [0-9]+|panelists?|people|others?|have answered)\b/);
    }
    expect((await atB("GET", `/api/v1/panels/${panelId}/outbox`)).body).toHaveLength(0);
  });
});

describe("without an SMTP server (the suite's own instance)", () => {
  it("puts invitations and notices in the outbox, refuses reminders, and deletes a sent message", async () => {
    const user = createAccount("Oskar Brennan");
    const own = await apiTokenFor(user);
    const at = async (method: string, path: string, body?: unknown) => api(method, path, { token: own, body });
    const panel = await at("POST", "/api/v1/panels", { title: "Wren-2 outbox panel", questions: [QUESTION] });
    const members = await rosterOf(["Lucia Farrant", "Benedek Orme"], at);
    const inv = await at("POST", `/api/v1/panels/${panel.body.id}/invitations`, { rosterMemberIds: members.map((m) => m.id), send: true });
    expect(inv.status).toBe(201);
    expect(inv.body.map((i: { delivery: string }) => i.delivery)).toEqual(["outbox", "outbox"]);
    await at("POST", `/api/v1/panels/${panel.body.id}/rounds/1/open`, {});
    const notice = await at("POST", `/api/v1/panels/${panel.body.id}/messages`, { kind: "round-opened" });
    expect(notice.body).toMatchObject({ recipients: 2, sent: 0, outbox: 2 });
    const reminder = await at("POST", `/api/v1/panels/${panel.body.id}/messages`, { kind: "reminder" });
    expect(reminder.status).toBe(409);
    expect(reminder.body.type).toBe("/problems/smtp-required");
    const outbox = (await at("GET", `/api/v1/panels/${panel.body.id}/outbox`)).body as { id: string; kind: string; to: string; body: string; reason: string }[];
    expect(outbox.map((m) => m.kind).sort()).toEqual(["invitation", "invitation", "round-opened", "round-opened"]);
    for (const m of outbox) {
      const owner = members.find((x) => m.to.includes(x.email))!;
      const other = members.find((x) => x !== owner)!;
      expect(m.body).not.toContain(other.name);
      expect(m.reason).toContain("no SMTP server");
      if (m.kind === "invitation") expect(m.body).toContain(`${baseURL}${inv.body.find((i: { email: string }) => i.email === owner.email).link}`);
    }
    // Another organiser cannot read or delete it.
    const stranger = await apiTokenFor(createAccount("Nadia Kerr"));
    expect((await api("GET", `/api/v1/panels/${panel.body.id}/outbox`, { token: stranger })).status).toBe(404);
    expect((await api("DELETE", `/api/v1/panels/${panel.body.id}/outbox/${outbox[0].id}`, { token: stranger })).status).toBe(404);
    expect((await at("DELETE", `/api/v1/panels/${panel.body.id}/outbox/${outbox[0].id}`)).status).toBe(200);
    expect((await at("GET", `/api/v1/panels/${panel.body.id}/outbox`)).body).toHaveLength(3);
    // The organiser's outbox page lists the rest, each with its copy and download buttons.
    const cookie = await signIn(user);
    const page = await fetch(`${baseURL}/panels/${panel.body.id}/outbox`, { headers: { cookie } });
    const html = await page.text();
    expect(html.match(/data-outbox-message=/g)).toHaveLength(3);
    expect(html).toContain("Copy message");
    expect(html).toContain("Download .eml");
  });
});
