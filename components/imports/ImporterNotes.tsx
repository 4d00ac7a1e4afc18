"use client";
// What the importer read into the files beyond what they say outright, grouped by kind, each note
// with its reason and where in the files it comes from.
import { createColumnHelper } from "@tanstack/react-table";
import { DataTable } from "@/components/ui/data-table/DataTable";
import type { ImportNote } from "@/lib/api/schemas/inventory";
import type { FilePosition, ImportNoteKind } from "@/lib/inventory/types";

type Row = ImportNote & { id: string };
const col = createColumnHelper<Row>();

function columns(showTarget: boolean) {
  return [
    col.accessor((n) => `${n.component} ${n.target ?? ""}`, {
      id: "component",
      header: showTarget ? "Need" : "Component",
      meta: { fixed: true, className: "whitespace-nowrap font-mono" },
      cell: (i) => (
        <>
          {i.row.original.component}
          {showTarget && i.row.original.target ? <> → {i.row.original.target}</> : null}
        </>
      ),
    }),
    col.accessor("reason", { header: "Why" }),
    col.accessor((n) => where(n.at), { id: "where", header: "Where", meta: { className: "whitespace-nowrap font-mono text-xs text-muted" } }),
  ];
}

// What each kind of note means and how to change it, in the order a reviewer should read them.
const GROUPS: { kinds: ImportNoteKind[]; title: string; explain: string; showTarget: boolean }[] = [
  {
    kinds: ["startup-need"],
    title: "Start-up-only needs",
    explain: "Needed to start, not to keep running: boot order uses them, blast radius and drills do not.",
    showTarget: true,
  },
  {
    kinds: ["soft-on-telemetry"],
    title: "Soft because the target is telemetry",
    explain: "Losing a collector or agent degrades observability, not the service. Set x-pinchpoint.needs.<name>: hard to count it as hard.",
    showTarget: true,
  },
  {
    kinds: ["kind-from-image", "kind-from-completion"],
    title: "Kinds inferred",
    explain: "Set x-pinchpoint.kind on the service to change a kind.",
    showTarget: false,
  },
  {
    kinds: ["left-out"],
    title: "Left out by profile",
    explain: "Services only in profiles that are not active are not pushed. Name the profiles to include them.",
    showTarget: false,
  },
];

function where(at: FilePosition | undefined): string {
  if (!at || at.line === undefined) return "";
  return `${at.file ? `${at.file}:` : "line "}${at.line}${at.column !== undefined ? `:${at.column}` : ""}`;
}

/** What the importer read into the files beyond what they say outright, each with its reason. */
export function ImporterNotes({ notes }: { notes: ImportNote[] }) {
  if (notes.length === 0) return null;
  return (
    <section className="space-y-4" aria-label="What the importer inferred" data-testid="importer-notes">
      <div>
        <h3 className="text-sm font-semibold">What else Pinchpoint read into the files</h3>
        <p className="text-xs text-muted">Not written out in the files, so check each one: the rankings are only as good as these guesses.</p>
      </div>
      {GROUPS.map((g) => {
        const rows = notes.filter((n) => g.kinds.includes(n.kind)).map((n, i) => ({ ...n, id: String(i) }));
        if (rows.length === 0) return null;
        return (
          <div key={g.title} className="space-y-1.5" data-testid={`notes-${g.kinds[0]}`}>
            <h4 className="text-sm font-medium">
              {g.title} <span className="font-mono text-muted">({rows.length})</span>
            </h4>
            <p className="text-xs text-muted">{g.explain}</p>
            <DataTable
              id={`notes-${g.kinds[0]}-table`}
              caption={g.title}
              columns={columns(g.showTarget)}
              data={rows}
              rowKey={(n) => n.id}
              paging={{ mode: "client", pageSize: 25, search: { label: "Find", placeholder: "component or reason" } }}
              noun={["note", "notes"]}
              empty="None matches."
            />
          </div>
        );
      })}
    </section>
  );
}
