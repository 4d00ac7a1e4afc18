"use client";
// Needs read from configuration rather than declared: each with the variable or key and the reason, to check before pushing.
import { createColumnHelper } from "@tanstack/react-table";
import { DataTable } from "@/components/ui/data-table/DataTable";
import type { InferredNeed } from "@/lib/api/schemas/inventory";

const col = createColumnHelper<InferredNeed & { id: string }>();

const columns = [
  col.accessor((n) => `${n.from} ${n.to.join(" ")}`, {
    id: "need",
    header: "Need",
    meta: { fixed: true },
    cell: (i) => (
      <span className="font-mono">
        {i.row.original.from} → {i.row.original.to.length === 1 ? i.row.original.to[0] : `one of ${i.row.original.to.join(", ")}`}
      </span>
    ),
  }),
  col.accessor("strength", { header: "Strength", cell: (i) => (i.getValue() === "startup" ? "start-up only" : i.getValue()) }),
  col.accessor((n) => n.via ?? "", { id: "via", header: "Via", cell: (i) => <span className="font-mono text-xs">{i.getValue() || "—"}</span> }),
  col.accessor((n) => n.reason ?? "", { id: "reason", header: "Reason", cell: (i) => <span className="text-muted">{i.getValue() || "—"}</span> }),
  col.accessor((n) => (n.at?.line !== undefined ? `${n.at.file ? `${n.at.file}:` : ""}${n.at.line}:${n.at.column ?? 1}` : ""), {
    id: "line",
    header: "Line",
    cell: (i) => <span className="font-mono text-xs text-muted">{i.getValue() || "—"}</span>,
  }),
];

export function InferredNeeds({ inferred }: { inferred: { total: number; needs: InferredNeed[] } }) {
  const rows = inferred.needs.map((n, i) => ({ ...n, id: String(i) }));
  return (
    <section className="space-y-2" aria-label="Inferred needs">
      <h3 className="text-sm font-semibold">
        Needs inferred from configuration <span className="font-mono text-muted">({inferred.total})</span>
      </h3>
      <p className="text-xs text-muted">
        Host names in environment variables, env files, ConfigMaps, commands and arguments that name another component. Nothing declared them: check each reason. How they count
        (hard or soft) is an environment setting.
      </p>
      <DataTable
        id="inferred-needs"
        caption="Needs inferred from configuration"
        columns={columns}
        data={rows}
        rowKey={(n) => n.id}
        rowTestId={() => "inferred-need"}
        paging={{ mode: "client", pageSize: 25, search: { label: "Find", placeholder: "component, variable or reason" } }}
        noun={["need", "needs"]}
        empty="None matches."
      />
      {inferred.total > rows.length && <p className="text-xs text-muted">The dry run lists the first {rows.length} of {inferred.total}.</p>}
    </section>
  );
}
