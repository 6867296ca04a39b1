import type { Metadata } from "next";
import { notFound, redirect } from "next/navigation";
import { NotFoundError } from "@/lib/errors";
import { toEml } from "@/lib/mail/eml";
import { smtpConfigured } from "@/lib/mail/smtp";
import { listOutbox } from "@/lib/panels/messages";
import { getPanel } from "@/lib/panels/panels";
import ActionForm from "@/lib/ui/action-form";
import { CopyButton, DownloadButton } from "@/lib/ui/copy-button";
import { formatDateTime } from "@/lib/ui/format";
import { requireSignedIn } from "@/lib/ui/require-user";
import { deleteOutboxAction } from "../actions";

export const metadata: Metadata = { title: "Outbox" };

const KIND = { invitation: "Invitation", "round-opened": "Round open", reminder: "Reminder" } as Record<string, string>;

export default async function OutboxPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const user = await requireSignedIn(`/panels/${id}/outbox`);
  if (user.role === "reviewer") redirect(`/reports/${id}`);
  let panel;
  try {
    panel = await getPanel(user, id);
  } catch (error) {
    if (error instanceof NotFoundError) notFound();
    throw error;
  }
  if (panel.role === "reviewer") redirect(`/reports/${id}`);
  const messages = await listOutbox(user, id);
  return (
    <article>
      <p className="muted small">
        <a href="/panels">Panels</a> / <a href={`/panels/${id}`}>{panel.title}</a> /
      </p>
      <h1>Outbox</h1>
      <p>
        {smtpConfigured()
          ? "E-mails the mail server refused wait here for you to send by hand."
          : "No mail server is set up (SMTP_URL), so the app cannot send e-mail itself: each message waits here. Copy it into your own e-mail, or download it and open it in your mail program, then delete it here."}{" "}
        Each message is for one person and names nobody else on the panel.
      </p>
      <p className="hint">An invitation holds the person&apos;s private link: delete it here once it is sent.</p>
      {messages.length === 0 ? <p className="muted">The outbox is empty.</p> : null}
      {messages.map((m, i) => (
        <section className="card" key={m.id} data-outbox-message={m.id} aria-label={`Message ${i + 1}: ${(KIND[m.kind] ?? m.kind).toLowerCase()} to ${m.to}`}>
          <h2>{m.subject}</h2>
          <dl className="facts">
            <dt>To</dt>
            <dd data-outbox-to>{m.to}</dd>
            <dt>Kind</dt>
            <dd>{KIND[m.kind] ?? m.kind}</dd>
            <dt>Written</dt>
            <dd>{formatDateTime(m.createdAt)}</dd>
            <dt>Not sent because</dt>
            <dd>{m.reason}</dd>
          </dl>
          <pre className="mail-body" data-outbox-body>
            {m.body}
          </pre>
          <div className="actions">
            <CopyButton text={m.to} label="Copy address" />
            <CopyButton text={m.subject} label="Copy subject" />
            <CopyButton text={m.body} label="Copy message" />
            <DownloadButton text={toEml(m)} filename={`${m.kind}-${m.id}.eml`} type="message/rfc822" label="Download .eml" />
          </div>
          <ActionForm action={deleteOutboxAction} submitLabel="Delete (sent)" submitClassName="secondary" ariaLabel={`Delete message ${i + 1}`}>
            <input type="hidden" name="panelId" value={id} />
            <input type="hidden" name="messageId" value={m.id} />
          </ActionForm>
        </section>
      ))}
    </article>
  );
}
