"use client";

import type { FilePosition, ImportNote, ImportNoteKind } from "@/lib/inventory/types";

/** Per group: enough to review by eye; the count in the heading tells the whole size. */
const ROW_LIMIT = 100;

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
        const rows = notes.filter((n) => g.kinds.includes(n.kind));
        if (rows.length === 0) return null;
        return (
          <div key={g.title} className="space-y-1.5" data-testid={`notes-${g.kinds[0]}`}>
            <h4 className="text-sm font-medium">
              {g.title} <span className="font-mono text-muted">({rows.length})</span>
            </h4>
            <p className="text-xs text-muted">{g.explain}</p>
            <div className="overflow-x-auto rounded-md border border-line">
              <table className="w-full text-sm">
                <thead className="bg-surface">
                  <tr>
                    <th className="px-3 py-1.5 text-left text-xs font-medium uppercase tracking-wide text-faint">{g.showTarget ? "Need" : "Component"}</th>
                    <th className="px-3 py-1.5 text-left text-xs font-medium uppercase tracking-wide text-faint">Why</th>
                    <th className="px-3 py-1.5 text-left text-xs font-medium uppercase tracking-wide text-faint">Where</th>
                  </tr>
                </thead>
                <tbody>
                  {rows.slice(0, ROW_LIMIT).map((n, i) => (
                    <tr key={i} className="border-t border-line">
                      <td className="whitespace-nowrap px-3 py-1.5 align-top font-mono">
                        {n.component}
                        {g.showTarget && n.target ? <> → {n.target}</> : null}
                      </td>
                      <td className="px-3 py-1.5 align-top">{n.reason}</td>
                      <td className="whitespace-nowrap px-3 py-1.5 align-top font-mono text-xs text-muted">{where(n.at)}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
            {rows.length > ROW_LIMIT && <p className="text-xs text-muted">Showing the first {ROW_LIMIT} of {rows.length}.</p>}
          </div>
        );
      })}
    </section>
  );
}
