// Observed edges in the environment's graph (DESIGN §10). Calls seen in traces become needs with
// provenance `observed`, so a trace-only environment gets components, an analysis and rankings, and
// an environment with both can be analysed on either view. Pure; the data layer applies it on every
// push and whenever the set of observed edges changes (never for a change of traffic alone, which
// lives in the trace aggregate tables, not in snapshots).
//
// - A traced pair that some source declares marks that declared need `observed` as well.
// - Any other pair becomes a need of the pseudo-source OBSERVED_SOURCE, strength hard (the analysis
//   counts observed-only needs as the environment's `observedNeeds` setting says, soft by default).
// - Trace names resolve through aliases first (`cartservice` → `cart`). A name that is still no
//   declared component becomes a component of OBSERVED_SOURCE, and such components are weak: a source
//   declaring the same key or alias later takes its place instead of conflicting with it, and an
//   `undeclared` placeholder for that key gives way to it (traces know its kind).
import { aliasMap } from "./merge";
import { canonicaliseSnapshot, provenanceOf, type SnapshotComponent, type SnapshotContent, type SnapshotDependency } from "./snapshot";
import type { DeclaredKind, Provenance } from "./types";

/** The pseudo-source of observed components and needs. Not a valid source name, so no push can claim it. */
export const OBSERVED_SOURCE = "(traces)";

/** One traced pair, in trace names (component keys as lib/traces/semconv.ts normalises them). */
export interface ObservedPair {
  from: string;
  to: string;
  /** What the callee looked like: a service, a datastore or a messaging destination. */
  toKind: "service" | "datastore" | "queue";
  via: string | null;
}

const KIND: Record<ObservedPair["toKind"], DeclaredKind> = { service: "service", datastore: "datastore", queue: "queue" };

const withoutObserved = (p: Provenance[] | undefined): Provenance[] | undefined => {
  const rest = (p ?? ["declared"]).filter((x) => x !== "observed");
  return rest.length === 0 || (rest.length === 1 && rest[0] === "declared") ? undefined : rest;
};

/** The declared graph alone: no observed components or needs, no `observed` marks. */
export function stripObserved(content: SnapshotContent): SnapshotContent {
  return {
    components: content.components.filter((c) => c.source !== OBSERVED_SOURCE),
    dependencies: content.dependencies
      .filter((d) => d.source !== OBSERVED_SOURCE)
      .map((d) => {
        if (!d.provenance?.includes("observed")) return d;
        const { provenance: _p, ...rest } = d;
        const p = withoutObserved(d.provenance);
        return p ? { ...rest, provenance: p } : rest;
      }),
  };
}

function weakComponent(key: string, kind: DeclaredKind): SnapshotComponent {
  return { key, name: key, kind, team: null, tier: 3, replicas: 1, zones: [], tags: [], links: {}, source: OBSERVED_SOURCE };
}

/** `declared` (no observed parts; see stripObserved) with `pairs` laid over it, canonical. */
export function applyObserved(declared: SnapshotContent, pairs: readonly ObservedPair[]): SnapshotContent {
  if (pairs.length === 0) return canonicaliseSnapshot(declared);
  const aliases = aliasMap(declared.components);
  const resolve = (name: string): string => aliases.get(name) ?? name;
  const declaredKeys = new Set(declared.components.filter((c) => c.source !== null).map((c) => c.key));

  // Needs by pair, across sources and any_of groups.
  const declaredPairs = new Set(declared.dependencies.map((d) => `${d.from}\u0000${d.to}`));
  const seen = new Set<string>();
  const observedOnly: SnapshotDependency[] = [];
  const callers = new Set<string>();
  const calleeKind = new Map<string, DeclaredKind>();
  for (const p of [...pairs].sort((a, b) => (a.from < b.from ? -1 : a.from > b.from ? 1 : a.to < b.to ? -1 : a.to > b.to ? 1 : 0))) {
    const from = resolve(p.from);
    const to = resolve(p.to);
    if (from === to) continue;
    const id = `${from}\u0000${to}`;
    if (seen.has(id)) continue;
    seen.add(id);
    callers.add(from);
    // The first specific kind (datastore, queue) a callee was seen as wins over "service".
    if ((calleeKind.get(to) ?? "service") === "service") calleeKind.set(to, KIND[p.toKind]);
    if (declaredPairs.has(id)) continue;
    observedOnly.push({ from, to, strength: "hard", group: null, via: p.via, source: OBSERVED_SOURCE, provenance: ["observed"] });
  }
  // A name that calls something runs code: it is a service whatever else named it.
  const weak = new Map<string, DeclaredKind>();
  for (const k of [...callers, ...calleeKind.keys()]) {
    if (!declaredKeys.has(k)) weak.set(k, callers.has(k) ? "service" : (calleeKind.get(k) ?? "service"));
  }

  const dependencies = declared.dependencies.map((d) => {
    if (!seen.has(`${d.from}\u0000${d.to}`)) return d;
    return { ...d, provenance: [...new Set<Provenance>([...provenanceOf(d), "observed"])] };
  });
  const components = declared.components.filter((c) => !(c.source === null && weak.has(c.key)));
  for (const [key, kind] of weak) components.push(weakComponent(key, kind));
  return canonicaliseSnapshot({ components, dependencies: [...dependencies, ...observedOnly] });
}
