// /admin/mail: what Pinchpoint has sent. In demo mode the local sink's messages can be read here;
// elsewhere mail leaves for the configured SMTP server and only the outbox's state is shown.
import Link from "next/link";
import { dateTime } from "@/components/ui/format";
import { Card, Stat } from "@/components/ui/Card";
import { requirePagePermission } from "@/lib/auth/page";
import { demoMode } from "@/lib/config";
import { mailDir, smtpUrl } from "@/lib/mail/config";
import { outboxOverview } from "@/lib/data/mail-outbox";
import { isSinkMessageId, listSinkMessages, readSinkMessage } from "@/lib/mail/sink-store";
import { MessageView } from "./MessageView";

export const metadata = { title: "Admin · Mail" };

/** host:port of the SMTP URL, never its credentials */
function smtpServer(): string {
  try {
    const url = new URL(smtpUrl());
    return `${url.protocol}//${url.host}`;
  } catch {
    return "(PINCHPOINT_SMTP_URL is not a valid URL)";
  }
}

const when = (d: Date | null) => (d ? dateTime(d, { seconds: true }) : "no date");

export default async function AdminMailPage({ searchParams }: { searchParams: Promise<{ m?: string | string[]; view?: string | string[] }> }) {
  await requirePagePermission("admin");
  const query = await searchParams;
  const outbox = await outboxOverview().catch(() => null);

  return (
    <div className="space-y-5">
      <div className="grid grid-cols-1 gap-3 sm:grid-cols-3">
        <Stat label="Queued" value={outbox?.counts.queued ?? "–"} hint="waiting or between retries" />
        <Stat label="Sent" value={outbox?.counts.sent ?? "–"} tone="ok" hint={`to ${smtpServer()}`} />
        <Stat label="Failed" value={outbox?.counts.failed ?? "–"} tone={outbox?.counts.failed ? "down" : "ink"} hint="given up after retries or a permanent refusal" />
      </div>

      {outbox && outbox.pending.length > 0 && (
        <Card title="Not sent yet, or given up on">
          <ul className="divide-y divide-line text-sm">
            {outbox.pending.map((p) => (
              <li key={p.id} className="py-2">
                <div className="flex flex-wrap items-baseline justify-between gap-2">
                  <span className="text-ink">{p.subject}</span>
                  <span className={`font-mono text-xs ${p.status === "failed" ? "text-down" : "text-degraded"}`}>
                    {p.status} · {p.attempts} attempt{p.attempts === 1 ? "" : "s"}
                    {p.status === "queued" && p.nextAttemptAt ? ` · next ${when(p.nextAttemptAt)}` : ""}
                  </span>
                </div>
                <div className="font-mono text-xs text-muted">{p.to.join(", ")}</div>
                {p.lastError && <div className="mt-0.5 font-mono text-xs text-faint">{p.lastError}</div>}
              </li>
            ))}
          </ul>
        </Card>
      )}

      {demoMode() ? (
        <SinkMessages selected={typeof query.m === "string" ? query.m : undefined} view={query.view === "text" ? "text" : "html"} />
      ) : (
        <Card title="Mail delivery">
          <p className="text-sm text-muted">
            Mail goes to the SMTP server configured in <span className="font-mono text-ink">PINCHPOINT_SMTP_URL</span> ({smtpServer()}). Messages are read in
            people&apos;s own mailboxes; this page shows their contents only in demo mode, where a local sink keeps them.
          </p>
        </Card>
      )}
    </div>
  );
}

async function SinkMessages({ selected, view }: { selected?: string; view: "html" | "text" }) {
  const dir = mailDir();
  const { items, total } = await listSinkMessages({ dir, limit: 100 });
  const id = selected && isSinkMessageId(selected) ? selected : items[0]?.id;
  const message = id ? await readSinkMessage({ dir, id }) : null;

  return (
    <div className="grid grid-cols-1 gap-4 lg:grid-cols-[minmax(0,2fr)_minmax(0,3fr)]">
      <Card
        title={`Sent messages${total > items.length ? ` (newest ${items.length} of ${total})` : ` (${total})`}`}
        action={
          <Link href="/admin/mail" className="text-xs text-muted hover:text-ink">
            Refresh
          </Link>
        }
      >
        <p className="mb-3 text-xs text-faint">
          Demo mode: every message goes to the local mail sink on the server (the folder PINCHPOINT_MAIL_DIR names). Nothing leaves this machine.
        </p>
        {items.length === 0 ? (
          <p className="text-sm text-muted">No messages yet. Assigning an owner to a component with a team address sends one.</p>
        ) : (
          <ul className="-mx-2 max-h-[640px] overflow-y-auto" data-testid="mail-list">
            {items.map((m) => {
              const active = m.id === id;
              return (
                <li key={m.id}>
                  <Link
                    href={`/admin/mail?m=${encodeURIComponent(m.id)}${view === "text" ? "&view=text" : ""}`}
                    aria-current={active ? "true" : undefined}
                    className={`block rounded-md border-l-2 px-2 py-2 ${active ? "border-brass bg-raised" : "border-transparent hover:bg-raised"}`}
                  >
                    <div className="truncate text-sm text-ink">{m.subject || "(no subject)"}</div>
                    <div className="truncate font-mono text-xs text-muted">to {m.to || "(nobody)"}</div>
                    <div className="font-mono text-xs text-faint">{when(m.date)}</div>
                  </Link>
                </li>
              );
            })}
          </ul>
        )}
      </Card>
      {message ? <MessageView message={message} view={view} /> : items.length > 0 && <Card title="Message">This message is no longer in the sink folder.</Card>}
    </div>
  );
}
