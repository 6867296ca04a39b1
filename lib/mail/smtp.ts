/**
 * Hands messages to the SMTP server named by SMTP_URL (lib/env.ts) through nodemailer, one
 * message per recipient. Without SMTP_URL there is no server: `smtpConfigured()` is false and
 * the callers keep the messages in the outbox (lib/panels/messages.ts).
 */
import nodemailer, { type Transporter } from "nodemailer";
import { env } from "../env";
import type { Message } from "./messages";

let transport: Transporter | undefined;

/** True when SMTP_URL is set. */
export function smtpConfigured(): boolean {
  return Boolean(env().SMTP_URL);
}

function transporter(): Transporter {
  // nodemailer reads host, port, user, password and smtps: (TLS at once) from the URL; on
  // smtp: it upgrades with STARTTLS when the server offers it.
  transport ??= nodemailer.createTransport(env().SMTP_URL!, { from: env().MAIL_FROM });
  return transport;
}

/**
 * Sends one message. Returns null when the server accepted it, else the reason it did not
 * (the server's reply or the connection error), never throwing.
 */
export async function sendMail(m: Message): Promise<string | null> {
  try {
    const info = await transporter().sendMail({ to: m.to, subject: m.subject, text: m.text });
    return info.rejected.length > 0 ? `refused by the SMTP server: ${String(info.response)}` : null;
  } catch (error) {
    return `not sent: ${(error as Error).message}`.slice(0, 500);
  }
}
