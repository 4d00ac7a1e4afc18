"use client";
// Side panel for one component: what its measures mean for an on-call engineer, what it
// needs and who needs it, and (for leads, architects, admins) owner and notes.
import { useId, useState, type FormEvent, type ReactNode } from "react";
import { z } from "zod";
import { SLUG_PATTERN } from "@/lib/inventory/types";
import { betweennessPct, convergedMeasure, measure, pinchScore } from "@/components/ui/format";
import { KIND_LABEL } from "./shapes";
import type { MapGraph, MapMetrics, MapNode } from "./types";

export const NOTES_MAX = 4000;

const saveSchema = z.object({
  key: z.string().min(1),
  team: z.string().regex(SLUG_PATTERN).nullable(),
  notes: z.string().max(NOTES_MAX),
});
export type InspectorSave = z.infer<typeof saveSchema>;

type MeasureRow = { id: keyof MapMetrics; label: string; meaning: string; format(m: MapMetrics): string };

/** Our plain-language reading of each measure (definitions in DESIGN §3). */
export const MEASURE_ROWS: MeasureRow[] = [
  {
    id: "betweenness",
    label: "Betweenness",
    meaning: "Share of the shortest dependency paths between other components that pass through it.",
    format: (m) => betweennessPct(m.betweenness),
  },
  {
    id: "pinchScore",
    label: "Pinch score",
    meaning: "0–100: paths through it, what its failure takes down (weighted by tier), and whether it runs single.",
    format: (m) => pinchScore(m.pinchScore),
  },
  {
    id: "blastDown",
    label: "Takes down",
    meaning: "Components that go down when it alone fails, through hard needs (itself not counted).",
    format: (m) => m.blastDown.toString(),
  },
  {
    id: "entriesDominated",
    label: "Entry points it dominates",
    meaning: "Front doors (tier 1, nothing needs them) from which every path to something passes through it.",
    format: (m) => (m.entriesDominated === null || m.entriesDominated === undefined ? "—" : m.entriesDominated.toString()),
  },
  {
    id: "blastDegraded",
    label: "Degraded with it",
    meaning: "Components that stay up but degrade when it fails, through soft needs.",
    format: (m) => m.blastDegraded.toString(),
  },
  {
    id: "pagerank",
    label: "PageRank",
    meaning: "How much of the estate leans on it, directly or through the things that lean on it.",
    format: (m) => convergedMeasure(m.pagerank),
  },
  {
    id: "eigenvector",
    label: "Eigenvector",
    meaning: "High when its neighbours are themselves well connected: it sits in the dense core.",
    format: (m) => convergedMeasure(m.eigenvector),
  },
  {
    id: "clustering",
    label: "Clustering",
    meaning: "How often its neighbours also connect to each other; low means it is their only link.",
    format: (m) => measure(m.clustering),
  },
  {
    id: "articulation",
    label: "Splits the graph",
    meaning: "Removing it leaves parts of the estate with no path to each other.",
    format: (m) => (m.articulation ? "yes" : "no"),
  },
  {
    id: "inCycle",
    label: "In a cycle",
    meaning: "Part of a dependency cycle: these cannot cold-start without help.",
    format: (m) => (m.inCycle ? "yes" : "no"),
  },
];

export interface InspectorProps {
  environment: string;
  node: MapNode;
  needs: MapNode[];
  dependents: MapNode[];
  teams: MapGraph["teams"];
  notes?: string | null;
  canEdit: boolean;
  onSave?(value: InspectorSave): Promise<void>;
  onSelect?(key: string): void;
  onClose?(): void;
  /** shown under the key, e.g. the component's risk-review status */
  badge?: ReactNode;
}

/** Needs and dependents of a key, for the Inspector's props. */
export function inspectorLinks(graph: MapGraph, key: string): { needs: MapNode[]; dependents: MapNode[] } {
  const byKey = new Map(graph.nodes.map((n) => [n.key, n]));
  const needs = new Set<string>();
  const dependents = new Set<string>();
  for (const e of graph.edges) {
    if (e.from === key) needs.add(e.to);
    if (e.to === key) dependents.add(e.from);
  }
  const resolve = (keys: Set<string>) =>
    [...keys].flatMap((k) => byKey.get(k) ?? []).sort((a, b) => a.key.localeCompare(b.key));
  return { needs: resolve(needs), dependents: resolve(dependents) };
}

function LinkList(props: { title: string; items: MapNode[]; onSelect?(key: string): void }) {
  return (
    <section aria-label={props.title} className="mt-4">
      <h3 className="text-xs font-semibold uppercase tracking-wide text-muted">
        {props.title} <span className="text-faint">({props.items.length})</span>
      </h3>
      {props.items.length === 0 ? (
        <p className="mt-1 text-sm text-faint">None</p>
      ) : (
        <ul className="mt-1 max-h-40 space-y-0.5 overflow-y-auto">
          {props.items.map((n) => (
            <li key={n.key}>
              <button
                type="button"
                className="w-full rounded px-1.5 py-0.5 text-left font-mono text-sm text-ink hover:bg-raised"
                onClick={() => props.onSelect?.(n.key)}
                aria-label={`Select ${n.name} (${n.key})`}
              >
                {n.key}
                {n.undeclared ? <span className="ml-2 text-xs text-undeclared">undeclared</span> : null}
              </button>
            </li>
          ))}
        </ul>
      )}
    </section>
  );
}

export function Inspector(props: InspectorProps) {
  const { node, canEdit } = props;
  const formId = useId();
  const [team, setTeam] = useState<string>(node.team ?? "");
  const [notes, setNotes] = useState<string>(props.notes ?? "");
  const [status, setStatus] = useState<{ kind: "idle" | "saving" | "saved" } | { kind: "error"; message: string }>({
    kind: "idle",
  });
  // Reset the form when another component is inspected (state adjusted during render, not in an effect).
  const [shownKey, setShownKey] = useState(node.key);
  if (shownKey !== node.key) {
    setShownKey(node.key);
    setTeam(node.team ?? "");
    setNotes(props.notes ?? "");
    setStatus({ kind: "idle" });
  }

  const teamName = node.team ? (props.teams.find((t) => t.slug === node.team)?.name ?? node.team) : null;
  const blastHref = `/environments/${encodeURIComponent(props.environment)}/drills?fail=${encodeURIComponent(node.key)}`;

  async function submit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const parsed = saveSchema.safeParse({ key: node.key, team: team === "" ? null : team, notes });
    if (!parsed.success) {
      setStatus({ kind: "error", message: parsed.error.issues[0]?.message ?? "Invalid input" });
      return;
    }
    if (!props.onSave) return;
    setStatus({ kind: "saving" });
    try {
      await props.onSave(parsed.data);
      setStatus({ kind: "saved" });
    } catch (err) {
      setStatus({ kind: "error", message: err instanceof Error ? err.message : "Could not save" });
    }
  }

  return (
    <aside aria-label={`Inspector: ${node.name}`} className="pp-inspector flex h-full flex-col overflow-y-auto bg-surface p-4 text-ink">
      <div className="flex items-start justify-between gap-2">
        <div className="min-w-0">
          <h2 className="truncate text-base font-semibold" title={node.name}>
            {node.name}
          </h2>
          <p className="font-mono text-xs text-muted">{node.key}</p>
          {props.badge ? <div className="mt-1">{props.badge}</div> : null}
        </div>
        {props.onClose ? (
          <button type="button" onClick={props.onClose} aria-label="Close inspector" className="rounded px-2 py-1 text-muted hover:bg-raised">
            ×
          </button>
        ) : null}
      </div>

      <dl className="mt-3 grid grid-cols-[auto_1fr] gap-x-3 gap-y-1 text-sm">
        <dt className="text-muted">Kind</dt>
        <dd>{KIND_LABEL[node.kind]}</dd>
        <dt className="text-muted">Owner</dt>
        <dd>{teamName ?? <span className="text-degraded">unowned</span>}</dd>
        <dt className="text-muted">Tier</dt>
        <dd>{node.tier}</dd>
        <dt className="text-muted">Replicas</dt>
        <dd>{node.replicas}</dd>
        <dt className="text-muted">Zones</dt>
        <dd>{node.zones.length > 0 ? node.zones.join(", ") : <span className="text-faint">none declared</span>}</dd>
      </dl>

      {node.undeclared ? (
        <p className="mt-3 rounded border border-dashed border-undeclared p-2 text-sm text-muted">
          Nobody declares this key: something needs it, but no inventory file describes it. Its measures are only as good as that guess.
        </p>
      ) : null}

      <a
        href={blastHref}
        className="mt-3 inline-block rounded bg-brass px-3 py-1.5 text-center text-sm font-semibold text-on-brass hover:bg-brass-strong"
      >
        Blast radius: what fails with it
      </a>

      <section aria-label="Measures" className="mt-4">
        <h3 className="text-xs font-semibold uppercase tracking-wide text-muted">Measures</h3>
        {node.metrics ? (
          <dl className="mt-1 space-y-2">
            {MEASURE_ROWS.map((row) => (
              <div key={row.id}>
                <div className="flex justify-between text-sm">
                  <dt>{row.label}</dt>
                  <dd className="font-mono">{node.metrics ? row.format(node.metrics) : "–"}</dd>
                </div>
                <p className="text-xs text-faint">{row.meaning}</p>
              </div>
            ))}
          </dl>
        ) : (
          <p className="mt-1 text-sm text-faint">Not analysed yet for this snapshot.</p>
        )}
      </section>

      <LinkList title="Needs" items={props.needs} onSelect={props.onSelect} />
      <LinkList title="Dependents" items={props.dependents} onSelect={props.onSelect} />

      <section aria-label="Owner and notes" className="mt-4">
        <h3 className="text-xs font-semibold uppercase tracking-wide text-muted">Owner and notes</h3>
        {canEdit && props.onSave ? (
          <form onSubmit={submit} className="mt-2 space-y-2" aria-describedby={`${formId}-status`}>
            <label className="block text-sm" htmlFor={`${formId}-team`}>
              Owner team
            </label>
            <select
              id={`${formId}-team`}
              value={team}
              onChange={(e) => setTeam(e.target.value)}
              className="w-full rounded border border-line bg-raised px-2 py-1 text-sm text-ink"
            >
              <option value="">Unowned</option>
              {props.teams.map((t) => (
                <option key={t.slug} value={t.slug}>
                  {t.name}
                </option>
              ))}
            </select>
            <label className="block text-sm" htmlFor={`${formId}-notes`}>
              Notes
            </label>
            <textarea
              id={`${formId}-notes`}
              value={notes}
              maxLength={NOTES_MAX}
              rows={4}
              onChange={(e) => setNotes(e.target.value)}
              className="w-full rounded border border-line bg-raised px-2 py-1 text-sm text-ink"
            />
            <div className="flex items-center gap-3">
              <button
                type="submit"
                disabled={status.kind === "saving"}
                className="rounded bg-brass px-3 py-1.5 text-sm font-semibold text-on-brass hover:bg-brass-strong disabled:opacity-60"
              >
                {status.kind === "saving" ? "Saving…" : "Save"}
              </button>
              <span id={`${formId}-status`} role="status" className="text-sm">
                {status.kind === "saved" ? <span className="text-ok">Saved</span> : null}
                {status.kind === "error" ? <span className="text-down">{status.message}</span> : null}
              </span>
            </div>
          </form>
        ) : (
          <p className="mt-1 whitespace-pre-wrap text-sm text-muted">{props.notes ? props.notes : "No notes."}</p>
        )}
      </section>
    </aside>
  );
}
