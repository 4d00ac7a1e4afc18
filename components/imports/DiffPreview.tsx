"use client";
// What a push would change, table by table, each sorted and paged in the browser (the dry run
// answers the whole diff at once; the counts above the tables always tell its whole size).
import { createColumnHelper } from "@tanstack/react-table";
import type { ReactNode } from "react";
import { DataTable } from "@/components/ui/data-table/DataTable";
import type { SnapshotDependency } from "@/lib/api/schemas/history";
import type { DiffSummary } from "@/lib/api/schemas/inventory";

type Component = DiffSummary["componentsAdded"][number];
interface FieldRow {
  id: string;
  what: string;
  label: ReactNode;
  field: string;
  before: unknown;
  after: unknown;
}

function show(value: unknown): string {
  if (value === null || value === undefined) return "—";
  if (Array.isArray(value)) return value.length ? value.join(", ") : "[]";
  if (typeof value === "object") {
    const entries = Object.entries(value as Record<string, unknown>);
    return entries.length ? entries.map(([k, v]) => `${k}: ${String(v)}`).join(", ") : "{}";
  }
  return String(value);
}
function Count({ label, value, tone }: { label: string; value: number; tone: "add" | "remove" | "change" }) {
  const colour = value === 0 ? "text-faint" : tone === "add" ? "text-ok" : tone === "remove" ? "text-down" : "text-degraded";
  const sign = tone === "add" ? "+" : tone === "remove" ? "−" : "~";
  return (
    <div className="rounded-md border border-line bg-raised px-3 py-2">
      <div className="text-xs text-muted">{label}</div>
      <div className={`font-mono text-xl font-semibold tabular-nums ${colour}`}>
        {value > 0 ? sign : ""}
        {value}
      </div>
    </div>
  );
}

function Section({ title, total, children }: { title: string; total: number; children: ReactNode }) {
  if (total === 0) return null;
  return (
    <section className="space-y-2">
      <h3 className="text-sm font-semibold">
        {title} <span className="font-mono text-muted">({total})</span>
      </h3>
      {children}
    </section>
  );
}

const PAGING = { mode: "client", pageSize: 25, search: { label: "Find", placeholder: "key or field" } } as const;

const componentCol = createColumnHelper<Component>();

function ComponentTable({ id, rows, mark }: { id: string; rows: Component[]; mark: "+" | "−" }) {
  const columns = [
    componentCol.accessor("key", {
      header: "Key",
      meta: { fixed: true },
      cell: (i) => (
        <span className="font-mono">
          <span className={mark === "+" ? "text-ok" : "text-down"}>{mark} </span>
          {i.getValue()}
        </span>
      ),
    }),
    componentCol.accessor("kind", {
      header: "Kind",
      cell: (i) => (i.getValue() === "undeclared" ? <span className="text-undeclared" title="needed by something, declared by no source">undeclared</span> : i.getValue()),
    }),
    componentCol.accessor("team", {
      header: "Team",
      cell: (i) => i.getValue() ?? (i.row.original.kind === "undeclared" ? <span className="text-faint">—</span> : <span className="text-degraded">unowned</span>),
    }),
    componentCol.accessor("tier", { header: "Tier", meta: { numeric: true } }),
    componentCol.accessor("source", { header: mark === "+" ? "Source" : "Was declared by", cell: (i) => <span className="font-mono text-xs text-muted">{i.getValue() ?? "—"}</span> }),
  ];
  return (
    <DataTable
      id={id}
      caption={mark === "+" ? "Components added" : "Components removed"}
      columns={columns}
      data={rows}
      rowKey={(c) => c.key}
      rowTestId={() => (mark === "+" ? "diff-added" : "diff-removed")}
      paging={PAGING}
      noun={["component", "components"]}
      empty="None matches."
    />
  );
}

const fieldCol = createColumnHelper<FieldRow>();

/** Before → after, one row per changed field. */
function FieldChanges({ id, what, rows }: { id: string; what: string; rows: FieldRow[] }) {
  const columns = [
    fieldCol.accessor("what", { header: what, meta: { fixed: true }, cell: (i) => i.row.original.label }),
    fieldCol.accessor("field", { header: "Field", cell: (i) => <span className="font-mono text-xs">{i.getValue()}</span> }),
    fieldCol.accessor((r) => show(r.before), { id: "before", header: "Before", cell: (i) => <span className="text-down">{i.getValue()}</span> }),
    fieldCol.accessor((r) => show(r.after), { id: "after", header: "After", cell: (i) => <span className="text-ok">{i.getValue()}</span> }),
  ];
  return <DataTable id={id} caption={`${what}: fields changed`} columns={columns} data={rows} rowKey={(r) => r.id} paging={PAGING} noun={["change", "changes"]} empty="None matches." />;
}

function fieldRows(items: Array<{ id: string; what: string; label: ReactNode; changes: Record<string, { before: unknown; after: unknown } | undefined> }>): FieldRow[] {
  return items.flatMap((item) => Object.entries(item.changes).map(([field, delta]) => ({ id: `${item.id}.${field}`, what: item.what, label: item.label, field, before: delta?.before, after: delta?.after })));
}

function dependencyLabel(d: Pick<SnapshotDependency, "from" | "to" | "group">) {
  return (
    <span className="font-mono">
      {d.from} → {d.to}
      {d.group && <span className="ml-2 font-sans text-xs text-muted">(one of a group)</span>}
    </span>
  );
}

const dependencyCol = createColumnHelper<SnapshotDependency>();
const dependencyId = (d: Pick<SnapshotDependency, "from" | "to" | "group">) => `${d.from}>${d.to}>${d.group ?? ""}`;

function DependencyTable({ id, rows, mark }: { id: string; rows: SnapshotDependency[]; mark: "+" | "−" }) {
  const columns = [
    dependencyCol.accessor((d) => `${d.from} ${d.to}`, {
      id: "need",
      header: "Dependency (needs)",
      meta: { fixed: true },
      cell: (i) => (
        <>
          <span className={mark === "+" ? "text-ok" : "text-down"}>{mark} </span>
          {dependencyLabel(i.row.original)}
        </>
      ),
    }),
    dependencyCol.accessor("strength", { header: "Strength", cell: (i) => (i.getValue() === "startup" ? <span title="needed to start, not to keep running">start-up only</span> : i.getValue()) }),
    dependencyCol.accessor((d) => d.via ?? "", {
      id: "via",
      header: "Via",
      cell: (i) => (
        <span className="text-muted">
          {i.getValue() || "—"}
          {i.row.original.provenance?.includes("inferred") && (
            <span className="ml-2 rounded border border-line px-1 text-xs text-degraded" title="a host name in configuration named it; no file declares it outright">
              inferred
            </span>
          )}
        </span>
      ),
    }),
    dependencyCol.accessor("source", { header: "Source", cell: (i) => <span className="font-mono text-xs text-muted">{i.getValue() ?? "—"}</span> }),
  ];
  return <DataTable id={id} caption={mark === "+" ? "Dependencies added" : "Dependencies removed"} columns={columns} data={rows} rowKey={dependencyId} paging={PAGING} noun={["dependency", "dependencies"]} empty="None matches." />;
}

export function DiffPreview({ diff }: { diff: DiffSummary }) {
  const c = diff.counts;
  return (
    <div className="space-y-5">
      <div className="grid grid-cols-2 gap-2 sm:grid-cols-3 lg:grid-cols-6" data-testid="diff-counts">
        <Count label="Components added" value={c.componentsAdded} tone="add" />
        <Count label="Components removed" value={c.componentsRemoved} tone="remove" />
        <Count label="Components changed" value={c.componentsChanged} tone="change" />
        <Count label="Dependencies added" value={c.dependenciesAdded} tone="add" />
        <Count label="Dependencies removed" value={c.dependenciesRemoved} tone="remove" />
        <Count label="Dependencies changed" value={diff.dependenciesChanged.length} tone="change" />
      </div>
      <Section title="Components added" total={diff.componentsAdded.length}>
        <ComponentTable id="diff-components-added" rows={diff.componentsAdded} mark="+" />
      </Section>
      <Section title="Components removed" total={diff.componentsRemoved.length}>
        <ComponentTable id="diff-components-removed" rows={diff.componentsRemoved} mark="−" />
      </Section>
      <Section title="Components changed" total={diff.componentsChanged.length}>
        <FieldChanges id="diff-components-changed" what="Key" rows={fieldRows(diff.componentsChanged.map((x) => ({ id: x.key, what: x.key, label: <span className="font-mono">{x.key}</span>, changes: x.changes })))} />
      </Section>
      <Section title="Dependencies added" total={diff.dependenciesAdded.length}>
        <DependencyTable id="diff-dependencies-added" rows={diff.dependenciesAdded} mark="+" />
      </Section>
      <Section title="Dependencies removed" total={diff.dependenciesRemoved.length}>
        <DependencyTable id="diff-dependencies-removed" rows={diff.dependenciesRemoved} mark="−" />
      </Section>
      <Section title="Dependencies changed" total={diff.dependenciesChanged.length}>
        <FieldChanges
          id="diff-dependencies-changed"
          what="Dependency"
          rows={fieldRows(diff.dependenciesChanged.map((d) => ({ id: dependencyId(d), what: `${d.from} ${d.to}`, label: dependencyLabel(d), changes: d.changes })))}
        />
      </Section>
    </div>
  );
}
