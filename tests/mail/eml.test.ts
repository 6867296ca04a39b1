/**
 * The outbox's .eml download (lib/mail/eml.ts) and the messages' one-recipient rule
 * (lib/mail/messages.ts). Expected encoded-words are Python's base64 of the UTF-8 text
 * (`base64.b64encode('Zoë Marr'.encode())`), decoded back by Python's email.header.decode_header
 * (RFC 2047), run outside this project when the test was written.
 */
import { describe, expect, it } from "vitest";
import { toEml } from "../../lib/mail/eml";
import { invitationMessage, mailbox, reminderMessage } from "../../lib/mail/messages";

describe("toEml", () => {
  it("writes RFC 5322 headers, encodes non-ASCII words (RFC 2047) and ends lines with CRLF", () => {
    const eml = toEml({ to: '"Zoë Marr" <zoe@quillmoor.example>', subject: "Round 2 – open", body: "line one\nline two" });
    expect(eml).toBe(
      "To: =?UTF-8?B?Wm/DqyBNYXJy?= <zoe@quillmoor.example>\r\n" +
        "Subject: =?UTF-8?B?Um91bmQgMiDigJMgb3Blbg==?=\r\n" +
        "X-Unsent: 1\r\nMIME-Version: 1.0\r\nContent-Type: text/plain; charset=utf-8\r\nContent-Transfer-Encoding: 8bit\r\n\r\n" +
        "line one\r\nline two\r\n",
    );
  });

  it("leaves plain ASCII headers as they are", () => {
    expect(toEml({ to: "a@quillmoor.example", subject: "Hello", body: "x" })).toContain("To: a@quillmoor.example\r\nSubject: Hello\r\n");
  });
});

describe("messages", () => {
  it("address one person, without line breaks or quotes from the name reaching the header", () => {
    expect(mailbox({ name: 'Evil"\r\nBcc: x@y', email: "e@quillmoor.example" })).toBe('"Evil Bcc: x@y" <e@quillmoor.example>');
    const m = invitationMessage({ name: "Tove Lindqvist", email: "tove@quillmoor.example" }, "Wren-2\r\nBcc: all", "https://t.example/p/abc", "2026-12-31T00:00:00Z");
    expect(m.subject).not.toMatch(/[\r\n]/);
    expect(m.text.split("\n")).toContain("https://t.example/p/abc");
  });

  it("a reminder names only its recipient and the panel", () => {
    const m = reminderMessage({ name: "Arjun Pellew", email: "arjun@quillmoor.example" }, "Wren-2 year one", 2, null);
    expect(m.to).toBe('"Arjun Pellew" <arjun@quillmoor.example>');
    expect(m.text).toContain("Round 2 of the expert panel \"Wren-2 year one\"");
  });
});
