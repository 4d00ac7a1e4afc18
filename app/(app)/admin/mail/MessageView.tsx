// One message of the sink: its headers, then the HTML part in a sandboxed frame or the text part.
import Link from "next/link";
import { Card } from "@/components/ui/Card";
import { When } from "@/components/ui/When";
import type { SinkMessage } from "@/lib/mail/sink-store";

// The HTML is data, not our page: an empty sandbox runs no script, submits no form and gets an
// opaque origin; the CSP keeps it from fetching anything (no tracking pixels, no remote CSS).
const CSP = `<meta http-equiv="Content-Security-Policy" content="default-src 'none'; style-src 'unsafe-inline'; img-src data:">`;
// Always first: a policy inserted after the message's own <head> could follow tags that already fetch.
const framed = (html: string): string => `${CSP}${html}`;

export function MessageView({ message, view }: { message: SinkMessage; view: "html" | "text" }) {
  const show = view === "html" && message.html !== null ? "html" : "text";
  const tab = (target: "html" | "text", label: string, available: boolean) =>
    available ? (
      <Link
        href={`/admin/mail?m=${encodeURIComponent(message.id)}${target === "text" ? "&view=text" : ""}`}
        aria-current={show === target ? "true" : undefined}
        className={`rounded px-2 py-1 text-xs ${show === target ? "bg-raised text-ink" : "text-muted hover:text-ink"}`}
      >
        {label}
      </Link>
    ) : (
      <span className="px-2 py-1 text-xs text-faint">{label}: none</span>
    );

  return (
    <Card
      title={message.subject || "(no subject)"}
      action={
        <div className="flex gap-1" role="group" aria-label="Part">
          {tab("html", "HTML", message.html !== null)}
          {tab("text", "Plain text", message.text !== null)}
        </div>
      }
    >
      <dl className="mb-4 grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
        <dt className="text-faint">From</dt>
        <dd className="font-mono text-xs leading-5 text-ink">{message.from}</dd>
        <dt className="text-faint">To</dt>
        <dd className="font-mono text-xs leading-5 text-ink" data-testid="mail-to">{message.to}</dd>
        <dt className="text-faint">Date</dt>
        <dd className="font-mono text-xs leading-5 text-ink"><When at={message.date} seconds empty="unknown" /></dd>
        <dt className="text-faint">Size</dt>
        <dd className="font-mono text-xs leading-5 text-muted">{(message.bytes / 1024).toFixed(1)} KiB · {message.id}.eml</dd>
      </dl>
      {show === "html" && message.html !== null ? (
        <iframe
          title={`HTML part of “${message.subject}”`}
          sandbox=""
          referrerPolicy="no-referrer"
          srcDoc={framed(message.html)}
          className="h-[560px] w-full rounded-md border border-line bg-white"
        />
      ) : (
        <pre className="max-h-[560px] overflow-auto whitespace-pre-wrap rounded-md border border-line bg-canvas p-3 font-mono text-xs leading-5 text-ink">
          {message.text ?? "(no plain-text part)"}
        </pre>
      )}
    </Card>
  );
}
