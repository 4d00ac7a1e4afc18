"use client";
// Side panel for one component: what its measures mean for an on-call engineer, what it
// needs and who needs it, and (for leads, architects, admins) owner and notes.
import { useState, type ReactNode } from "react";
import { ApiForm, FormProblem, SERVER_ERROR, SubmitButton, useApiForm } from "@/components/ui/form/api-form";
import { SelectInput, TextAreaField } from "@/components/ui/form/fields";
import { betweennessPct, convergedMeasure, measure, pinchScore } from "@/components/ui/format";
import { annotateBodySchema } from "@/lib/api/schemas/components";
import type { ApiError } from "@/lib/client/api";
import { KIND_LABEL } from "./shapes";
import type { MapGraph, MapMetrics, MapNode } from "./types";

/** What the inspector saves: the owner team (null: unowned) and the notes, as PATCH …/components/{key} takes them. */
export interface InspectorSave {
  key: string;
  team: string | null;
  notes: string | null;
}

type MeasureRow = { id: keyof MapMetrics; label: string; meaning: string; format(m: MapMetrics): string };

/** Our plain-language reading of each measure (definitions in DESIGN §3). */
const MEASURE_ROWS: MeasureRow[] = [
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
  /** undefined while the component's notes are still loading */
  notes?: string | null;
  canEdit: boolean;
  /** resolves on success; an ApiError's issues go beside the fields */
  onSave?(value: InspectorSave): Promise<ApiError | null>;
  onSelect?(key: string): void;
  onClose?(): void;
  /** shown under the key, e.g. the component's risk-review status */
  badge?: ReactNode;
  /** "why does this need …?": show the chain from this component to `target` on the map */
  onWhy?(target: string): void;
  /** keys offered as targets of "why does this need …?" */
  allKeys?: readonly string[];
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

/** "Why does this need …?": pick a target; the map then highlights the chain of needs (?chain=from,to). */
function WhyNeeds({ node, keys, onWhy }: { node: MapNode; keys: readonly string[]; onWhy(target: string): void }) {
  const [target, setTarget] = useState("");
  const listId = `why-${node.key}`;
  return (
    <form
      className="mt-3 flex items-center gap-1"
      aria-label={`Why does ${node.key} need another component`}
      onSubmit={(e) => {
        e.preventDefault();
        const t = target.trim();
        if (t && t !== node.key) onWhy(t);
      }}
    >
      <label htmlFor={`${listId}-input`} className="shrink-0 text-sm text-muted">
        Why does it need
      </label>
      <input id={`${listId}-input`} list={listId} value={target} onChange={(e) => setTarget(e.target.value)} placeholder="key…" className="min-w-0 flex-1 rounded border border-line bg-raised px-2 py-0.5 font-mono text-sm" />
      <datalist id={listId}>{keys.length <= 5000 ? keys.map((k) => <option key={k} value={k} />) : null}</datalist>
      <button type="submit" className="pp-btn" aria-label="Show the chain of needs on the map">
        ?
      </button>
    </form>
  );
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

/** Owner and notes of one component, for leads of its team, architects and admins. */
function OwnerForm({ node, teams, notes, onSave }: { node: MapNode; teams: MapGraph["teams"]; notes: string | null | undefined; onSave(value: InspectorSave): Promise<ApiError | null> }) {
  const form = useApiForm(annotateBodySchema, { team: node.team, notes: notes ?? null });
  const [saved, setSaved] = useState(false);
  const onSubmit = form.handleSubmit(async (values) => {
    setSaved(false);
    const error = await onSave({ key: node.key, team: values.team ?? null, notes: values.notes ?? null });
    if (!error) return setSaved(true);
    const field = error.issues.find((i) => /^body\.(team|notes)$/.test(i.path));
    if (field) form.setError(field.path.slice(5) as "team" | "notes", { type: "server", message: field.message });
    else form.setError(SERVER_ERROR, { type: "server", message: error.message });
  });
  return (
    <ApiForm form={form} onSubmit={onSubmit} label={`Owner and notes of ${node.key}`} className="mt-2 space-y-2">
      <SelectInput name="team" label="Owner team" blank="null" options={[{ value: "", label: "Unowned" }, ...teams.map((t) => ({ value: t.slug, label: t.name }))]} onChange={() => setSaved(false)} />
      <TextAreaField name="notes" label="Notes" blank="null" rows={4} maxLength={5000} onChange={() => setSaved(false)} />
      <div className="flex items-center gap-3">
        <SubmitButton working="Saving…">Save</SubmitButton>
        <span role="status" className="text-sm">
          {saved ? <span className="text-ok">Saved</span> : null}
        </span>
      </div>
      <FormProblem />
    </ApiForm>
  );
}

export function Inspector(props: InspectorProps) {
  const { node, canEdit } = props;
  const teamName = node.team ? (props.teams.find((t) => t.slug === node.team)?.name ?? node.team) : null;
  const blastHref = `/environments/${encodeURIComponent(props.environment)}/drills?fail=${encodeURIComponent(node.key)}`;

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

      {props.onWhy ? <WhyNeeds node={node} keys={props.allKeys ?? []} onWhy={props.onWhy} /> : null}

      <LinkList title="Needs" items={props.needs} onSelect={props.onSelect} />
      <LinkList title="Dependents" items={props.dependents} onSelect={props.onSelect} />

      <section aria-label="Owner and notes" className="mt-4">
        <h3 className="text-xs font-semibold uppercase tracking-wide text-muted">Owner and notes</h3>
        {canEdit && props.onSave ? (
          // Mounted again when another component is inspected, and once its notes have loaded.
          <OwnerForm key={`${node.key}\u0000${props.notes === undefined ? "loading" : "loaded"}`} node={node} teams={props.teams} notes={props.notes} onSave={props.onSave} />
        ) : (
          <p className="mt-1 whitespace-pre-wrap text-sm text-muted">{props.notes ? props.notes : "No notes."}</p>
        )}
      </section>
    </aside>
  );
}
