/**
 * A message as an .eml file (RFC 5322 with the MIME headers of RFC 2045), for the outbox's
 * download button: a mail client opens it as a message to send. The subject is encoded as an
 * RFC 2047 encoded-word when it is not plain ASCII; the body is UTF-8 with CRLF line ends.
 * "X-Unsent: 1" asks clients that know it to open the file as a draft.
 */
export function toEml(m: { readonly to: string; readonly subject: string; readonly body: string }): string {
  const ascii = /^[\x20-\x7e]*$/;
  const subject = ascii.test(m.subject) ? m.subject : `=?UTF-8?B?${Buffer.from(m.subject, "utf8").toString("base64")}?=`;
  const to = ascii.test(m.to) ? m.to : m.to.replace(/^"?(.*?)"?\s*<([^>]*)>$/, (_, name: string, address: string) => `=?UTF-8?B?${Buffer.from(name, "utf8").toString("base64")}?= <${address}>`);
  const headers = [`To: ${to}`, `Subject: ${subject}`, "X-Unsent: 1", "MIME-Version: 1.0", "Content-Type: text/plain; charset=utf-8", "Content-Transfer-Encoding: 8bit"];
  return `${headers.join("\r\n")}\r\n\r\n${m.body.replace(/\r?\n/g, "\r\n")}\r\n`;
}
