"use client";
// Alerts of an incident as a table: what fires now, what resolved during it, or (history) every
// alert with its lifetime.
import { createColumnHelper } from "@tanstack/react-table";
import Link from "next/link";
import { Badge } from "@/components/ui/Badge";
import { DataTable } from "@/components/ui/data-table/DataTable";
import { safeHref } from "@/components/ui/format";
import { When } from "@/components/ui/When";
import type { IncidentAlert } from "@/lib/api/schemas/incidents";

type Show = "firing" | "resolved" | "history";

function KeyLink({ env, k }: { env: string; k: string }) {
  return (
    <Link href={`/environments/${env}/components/${encodeURIComponent(k)}`} className="font-mono text-ink hover:text-brass">
      {k}
    </Link>
  );
}

function AlertName({ a }: { a: IncidentAlert }) {
  const href = a.link ? safeHref(a.link) : null;
  const name = a.name ?? a.summary ?? a.fingerprint;
  return href ? (
    <a href={href} className="text-info hover:underline" target="_blank" rel="noreferrer">
      {name}
    </a>
  ) : (
    <span>{name}</span>
  );
}

const alertCol = createColumnHelper<IncidentAlert>();

function alertColumns(env: string, show: Show) {
  return [
    alertCol.accessor((a) => a.component ?? a.named?.value ?? "", {
      id: "component",
      header: "Component",
      meta: { fixed: true },
      cell: (i) => {
        const a = i.row.original;
        return a.component ? (
          <KeyLink env={env} k={a.component} />
        ) : (
          <span className="inline-flex items-center gap-1">
            <Badge tone="degraded" title="No component key or alias matches what the alert names">unknown</Badge>
            <span className="font-mono text-xs text-muted">{a.named ? `${a.named.label ? `${a.named.label}=` : ""}${a.named.value}` : "no component label"}</span>
          </span>
        );
      },
    }),
    alertCol.accessor((a) => a.name ?? a.summary ?? a.fingerprint, {
      id: "alert",
      header: "Alert",
      cell: (i) => (
        <>
          <AlertName a={i.row.original} />
          {i.row.original.summary && i.row.original.name && <span className="ml-2 text-xs text-muted">{i.row.original.summary}</span>}
        </>
      ),
    }),
    alertCol.accessor((a) => a.severity ?? "", {
      id: "severity",
      header: "Severity",
      cell: (i) => (i.getValue() ? <Badge tone={/crit|page|high|error/i.test(i.getValue()) ? "down" : "muted"}>{i.getValue()}</Badge> : <span className="text-faint">—</span>),
    }),
    alertCol.accessor("startsAt", { header: "Since", cell: (i) => <When at={i.getValue()} /> }),
    show === "firing"
      ? alertCol.accessor("lastReceivedAt", { header: "Last heard", cell: (i) => <When at={i.getValue()} /> })
      : alertCol.accessor("endsAt", {
          header: show === "resolved" ? "Resolved" : "Ended",
          cell: (i) => (i.getValue() ? <When at={i.getValue()} /> : <Badge tone="down">firing</Badge>),
        }),
    alertCol.accessor("fingerprint", { header: "Fingerprint", meta: { hidden: true }, cell: (i) => <span className="font-mono text-xs text-muted">{i.getValue()}</span> }),
  ];
}

export function AlertsTable({ env, alerts, show }: { env: string; alerts: IncidentAlert[]; show: Show }) {
  return (
    <DataTable
      id={`${show}-alerts`}
      testId={show === "history" ? "incident-alerts" : `${show}-alerts`}
      caption={show === "firing" ? "Firing alerts" : show === "resolved" ? "Alerts resolved during this incident" : "Alerts of this incident and their lifetimes"}
      columns={alertColumns(env, show)}
      data={alerts}
      rowKey={(a) => a.id}
      paging={{ mode: "client", pageSize: 50, initialSort: [{ id: "startsAt", desc: false }], search: { label: "Find an alert", placeholder: "component or alert name" } }}
      noun={["alert", "alerts"]}
      empty="No alert."
    />
  );
}

