"use client";
// The mail outbox for the facility admin: every message Rimelog queued (one per event), whether it
// went out, and its text. With the local fake transport this is where the messages are read.
import { Loading, Notice, Panel, Tag } from "@/components/ui/panel";
import { useJson } from "@/components/ui/use-json";
import { formatDate } from "@/lib/format";
import type { MailRow } from "@/lib/mail/messages";

export function MailAdmin() {
  const { data, error } = useJson<{
    transport: string;
    messages: (Omit<MailRow, "createdAt" | "sentAt"> & { createdAt: string; sentAt: string | null })[];
  }>("/api/mail");
  if (error) return <Notice tone="danger" role="alert" title={error.message} />;
  if (!data) return <Loading />;
  return (
    <div className="flex flex-col gap-3">
      <Notice
        tone="neutral"
        title={
          data.transport === "fake"
            ? "Local mail: messages are kept here and not sent anywhere (set RIMELOG_MAIL=smtp and SMTP_URL to send)."
            : "Messages are sent by SMTP; this is the stored copy."
        }
      />
      {!data.messages.length && <p className="text-muted">No messages yet.</p>}
      {data.messages.map((m) => (
        <Panel key={m.id} data-event={m.eventKey}>
          <details>
            <summary className="flex min-h-12 cursor-pointer flex-wrap items-center gap-2">
              <span className="font-semibold">{m.subject}</span>
              <span className="text-base text-muted">
                to {m.to} · {formatDate(m.createdAt)}
              </span>
              {m.sentAt ? (
                <Tag tone="ok">sent {formatDate(m.sentAt)}</Tag>
              ) : m.error ? (
                <Tag tone="danger">not sent: {m.error}</Tag>
              ) : (
                <Tag>queued</Tag>
              )}
            </summary>
            <pre className="mt-2 whitespace-pre-wrap font-sans">{m.body}</pre>
            <p className="mt-1 text-sm text-muted">Event: {m.eventKey}</p>
          </details>
        </Panel>
      ))}
    </div>
  );
}
