"use client";

import type { ReactNode } from "react";
import type { DiffSummary } from "@/lib/data/push";
import type { SnapshotDependency } from "@/lib/inventory/snapshot";

/** Per table: enough to review by eye; the counts above always tell the whole size. */
const ROW_LIMIT = 200;

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
      <div className="overflow-x-auto rounded-md border border-line">{children}</div>
      {total > ROW_LIMIT && <p className="text-xs text-muted">Showing the first {ROW_LIMIT} of {total}.</p>}
    </section>
  );
}

const th = "px-3 py-1.5 text-left text-xs font-medium uppercase tracking-wide text-faint";
const td = "px-3 py-1.5 align-top";

function Table({ headers, children }: { headers: string[]; children: ReactNode }) {
  return (
    <table className="w-full text-sm">
      <thead className="bg-surface">
        <tr>
          {headers.map((h) => (
            <th key={h} className={th}>
              {h}
            </th>
          ))}
        </tr>
      </thead>
      <tbody>{children}</tbody>
    </table>
  );
}

/** Before → after per changed field, the label shown on the first field's row only. */
function FieldChanges({ what, items }: { what: string; items: Array<{ id: string; label: ReactNode; changes: Record<string, { before: unknown; after: unknown } | undefined> }> }) {
  return (
    <Table headers={[what, "Field", "Before", "After"]}>
      {items.slice(0, ROW_LIMIT).flatMap((item) =>
        Object.entries(item.changes).map(([field, delta], i) => (
          <tr key={`${item.id}.${field}`} className={i === 0 ? "border-t border-line" : ""}>
            <td className={td}>{i === 0 ? item.label : ""}</td>
            <td className={`${td} font-mono text-xs`}>{field}</td>
            <td className={`${td} text-down`}>{show(delta?.before)}</td>
            <td className={`${td} text-ok`}>{show(delta?.after)}</td>
          </tr>
        )),
      )}
    </Table>
  );
}

function dependencyLabel(d: Pick<SnapshotDependency, "from" | "to" | "group">) {
  return (
    <span className="font-mono">
      {d.from} → {d.to}
      {d.group && <span className="ml-2 font-sans text-xs text-muted">(one of a group)</span>}
    </span>
  );
}

function DependencyTable({ rows, mark }: { rows: SnapshotDependency[]; mark: "+" | "−" }) {
  return (
    <Table headers={["Dependency (needs)", "Strength", "Via", "Source"]}>
        {rows.slice(0, ROW_LIMIT).map((d, i) => (
          <tr key={i} className="border-t border-line">
            <td className={td}>
              <span className={mark === "+" ? "text-ok" : "text-down"}>{mark} </span>
              {dependencyLabel(d)}
            </td>
            <td className={td}>{d.strength === "startup" ? <span title="needed to start, not to keep running">start-up only</span> : d.strength}</td>
            <td className={`${td} text-muted`}>
              {d.via ?? "—"}
              {d.provenance?.includes("inferred") && (
                <span className="ml-2 rounded border border-line px-1 text-xs text-degraded" title="a host name in configuration named it; no file declares it outright">
                  inferred
                </span>
              )}
            </td>
            <td className={`${td} font-mono text-xs text-muted`}>{d.source ?? "—"}</td>
          </tr>
        ))}
    </Table>
  );
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
        <Table headers={["Key", "Kind", "Team", "Tier", "Source"]}>
            {diff.componentsAdded.slice(0, ROW_LIMIT).map((comp) => (
              <tr key={comp.key} className="border-t border-line" data-testid="diff-added">
                <td className={`${td} font-mono`}>
                  <span className="text-ok">+ </span>
                  {comp.key}
                </td>
                <td className={`${td} ${comp.kind === "undeclared" ? "text-undeclared" : ""}`}>{comp.kind === "undeclared" ? <span title="needed by something, declared by no source">undeclared</span> : comp.kind}</td>
                <td className={td}>{comp.team ?? (comp.kind === "undeclared" ? <span className="text-faint">—</span> : <span className="text-degraded">unowned</span>)}</td>
                <td className={`${td} font-mono`}>{comp.tier}</td>
                <td className={`${td} font-mono text-xs text-muted`}>{comp.source ?? "—"}</td>
              </tr>
            ))}
        </Table>
      </Section>

      <Section title="Components removed" total={diff.componentsRemoved.length}>
        <Table headers={["Key", "Kind", "Team", "Was declared by"]}>
            {diff.componentsRemoved.slice(0, ROW_LIMIT).map((comp) => (
              <tr key={comp.key} className="border-t border-line">
                <td className={`${td} font-mono`}>
                  <span className="text-down">− </span>
                  {comp.key}
                </td>
                <td className={td}>{comp.kind}</td>
                <td className={td}>{comp.team ?? "—"}</td>
                <td className={`${td} font-mono text-xs text-muted`}>{comp.source ?? "—"}</td>
              </tr>
            ))}
        </Table>
      </Section>

      <Section title="Components changed" total={diff.componentsChanged.length}>
        <FieldChanges what="Key" items={diff.componentsChanged.map((c) => ({ id: c.key, label: <span className="font-mono">{c.key}</span>, changes: c.changes }))} />
      </Section>

      <Section title="Dependencies added" total={diff.dependenciesAdded.length}>
        <DependencyTable rows={diff.dependenciesAdded} mark="+" />
      </Section>
      <Section title="Dependencies removed" total={diff.dependenciesRemoved.length}>
        <DependencyTable rows={diff.dependenciesRemoved} mark="−" />
      </Section>
      <Section title="Dependencies changed" total={diff.dependenciesChanged.length}>
        <FieldChanges what="Dependency" items={diff.dependenciesChanged.map((d) => ({ id: `${d.from}>${d.to}>${d.group ?? ""}`, label: dependencyLabel(d), changes: d.changes }))} />
      </Section>
    </div>
  );
}
