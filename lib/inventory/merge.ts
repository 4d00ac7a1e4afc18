// One source's push merged into an environment's current graph (DESIGN §1): the push
// replaces exactly what that source declared before — its components and their
// dependencies — and leaves every other source's alone. Pure; the data layer runs it
// inside its transaction and stores `content` when the hash changed.
//
// Aliases (DESIGN §10): a component may be known by other names (its service name in traces, a
// Compose or Kubernetes name). Keys and aliases form one namespace; a need naming an alias is a
// need on the component. Needs keep the name their source wrote (`written`), so that when an
// alias comes or goes every source's needs are resolved again, not only the pushing source's.
import { distance } from "fastest-levenshtein";
import {
  canonicaliseSnapshot,
  inventoryToSnapshotParts,
  type SnapshotComponent,
  type SnapshotContent,
  type SnapshotDependency,
} from "./snapshot";
import type { InventoryIssue, NormalisedInventory } from "./types";

interface MergeConflict {
  /** The key or alias two components claim. */
  key: string;
  /** [the source that holds it now, the pushing source]; the same source twice for a clash within one push */
  sources: [string, string];
  message: string;
}

export interface MergeResult {
  /**
   * The merged graph, canonical. When there are conflicts nothing is merged and this is
   * `existing` unchanged (canonicalised): the caller answers 409 and writes nothing.
   */
  content: SnapshotContent;
  conflicts: MergeConflict[];
  placeholdersCreated: string[];
  placeholdersRemoved: string[];
  /** The importer's warnings first, then one per need that ended on a placeholder or on its own component. */
  warnings: InventoryIssue[];
  /** Whether some alias came or went: every source's needs were resolved again (the data layer rewrites them all). */
  aliasesChanged: boolean;
}

/**
 * What a need on a key no source declares turns into. Tier 3 and one replica are the format's
 * own defaults: nothing is known about it, so it is neither promoted nor discounted in the
 * rankings, and one replica flags it as a possible single point of failure until declared.
 */
export function placeholderComponent(key: string): SnapshotComponent {
  return { key, name: key, kind: "undeclared", team: null, tier: 3, replicas: 1, zones: [], tags: [], links: {}, source: null };
}

/** alias → key over declared components; the order of entries does not matter. */
export function aliasMap(components: readonly SnapshotComponent[]): Map<string, string> {
  const map = new Map<string, string>();
  for (const c of components) for (const a of c.aliases ?? []) map.set(a, c.key);
  return map;
}

function sameMap(a: ReadonlyMap<string, string>, b: ReadonlyMap<string, string>): boolean {
  if (a.size !== b.size) return false;
  for (const [k, v] of a) if (b.get(k) !== v) return false;
  return true;
}

/** Every key and alias claimed twice, each clash once. */
function namespaceConflicts(components: readonly SnapshotComponent[], pushing: string): MergeConflict[] {
  const claimed = new Map<string, { component: string; source: string; alias: boolean }>();
  const conflicts: MergeConflict[] = [];
  const claim = (name: string, c: SnapshotComponent, alias: boolean): void => {
    const prior = claimed.get(name);
    if (!prior) {
      claimed.set(name, { component: c.key, source: c.source ?? pushing, alias });
      return;
    }
    if (prior.component === c.key && (prior.alias || alias)) return; // an alias repeating its own key: harmless
    const what = (x: { component: string; alias: boolean }) => (x.alias ? `an alias of "${x.component}"` : "a component key");
    const source = c.source ?? pushing;
    conflicts.push({
      key: name,
      sources: [prior.source, source],
      message:
        !prior.alias && !alias
          ? `"${name}" is already declared by source "${prior.source}"; a key belongs to one source`
          : `"${name}" is ${what(prior)} (source "${prior.source}") and ${what({ component: c.key, alias })} (source "${source}"); keys and aliases must be unique in an environment`,
    });
  };
  for (const c of components) claim(c.key, c, false);
  for (const c of components) for (const a of c.aliases ?? []) claim(a, c, true);
  return conflicts;
}

/**
 * Resolve every need through the alias map. A need that resolves onto its own component is
 * dropped (a component cannot need itself). Needs that now point at one component stay apart
 * (their identity includes the name written); the analysis counts a pair once, hard winning.
 */
function resolveNeeds(
  dependencies: readonly SnapshotDependency[],
  aliases: ReadonlyMap<string, string>,
): { dependencies: SnapshotDependency[]; selfNeeds: SnapshotDependency[] } {
  const out: SnapshotDependency[] = [];
  const selfNeeds: SnapshotDependency[] = [];
  for (const d of dependencies) {
    const written = d.written ?? d.to;
    const to = aliases.get(written) ?? written;
    const { written: _was, ...rest } = d;
    const resolved: SnapshotDependency = to === written ? { ...rest, to } : { ...rest, to, written };
    if (to === d.from) selfNeeds.push(resolved);
    else out.push(resolved);
  }
  return { dependencies: out, selfNeeds };
}

export function mergeSources({
  existing,
  source,
  incoming,
}: {
  existing: SnapshotContent;
  source: string;
  incoming: NormalisedInventory;
}): MergeResult {
  const placeholdersBefore = new Set<string>();
  for (const c of existing.components) if (c.source === null) placeholdersBefore.add(c.key);

  const parts = inventoryToSnapshotParts({ components: incoming.components, source });
  const components = [...existing.components.filter((c) => c.source !== null && c.source !== source), ...parts.components];
  const conflicts = namespaceConflicts(components, source);
  if (conflicts.length > 0) {
    return {
      content: canonicaliseSnapshot(existing),
      conflicts,
      placeholdersCreated: [],
      placeholdersRemoved: [],
      warnings: [...incoming.warnings],
      aliasesChanged: false,
    };
  }

  const aliases = aliasMap(components);
  const aliasesChanged = !sameMap(aliases, aliasMap(existing.components));
  const { dependencies, selfNeeds } = resolveNeeds(
    [...existing.dependencies.filter((d) => d.source !== source), ...parts.dependencies],
    aliases,
  );

  // Placeholders are derived, not kept: exactly the needed keys nobody declares.
  const declared = new Set(components.map((c) => c.key));
  const placeholders = new Set<string>();
  for (const d of dependencies) if (!declared.has(d.to)) placeholders.add(d.to);

  const warnings: InventoryIssue[] = [...incoming.warnings];
  const known = [...declared, ...aliases.keys()];
  incoming.components.forEach((c, i) => {
    const named = new Set<string>();
    for (const need of c.needs) for (const k of need.type === "single" ? [need.key] : need.keys) named.add(aliases.get(k) ?? k);
    for (const k of named) {
      if (!placeholders.has(k)) continue;
      warnings.push({
        path: `components[${i}].needs`,
        message: `${JSON.stringify(c.key)} needs ${JSON.stringify(k)}, which no source declares: it is shown as an undeclared placeholder${didYouMean(k, known)}`,
      });
    }
  });
  for (const d of selfNeeds) {
    if (d.source !== source) continue;
    warnings.push({
      path: `components[key=${d.from}].needs`,
      message: `${JSON.stringify(d.from)} needs ${JSON.stringify(d.written ?? d.to)}, which is one of its own aliases; the need is left out`,
    });
  }

  const sorted = (s: Iterable<string>): string[] => [...s].sort((a, b) => (a < b ? -1 : a > b ? 1 : 0));
  return {
    content: canonicaliseSnapshot({ components: [...components, ...[...placeholders].map(placeholderComponent)], dependencies }),
    conflicts,
    placeholdersCreated: sorted([...placeholders].filter((k) => !placeholdersBefore.has(k))),
    placeholdersRemoved: sorted([...placeholdersBefore].filter((k) => !placeholders.has(k))),
    warnings,
    aliasesChanged,
  };
}

/**
 * A typo in a need's key makes a placeholder where a declared component was meant: name the known
 * key or alias one edit away (Levenshtein distance 1, fastest-levenshtein), when there is exactly one.
 */
export function didYouMean(key: string, known: Iterable<string>): string {
  const near = [...new Set(known)].filter((k) => k !== key && Math.abs(k.length - key.length) <= 1 && distance(k, key) === 1);
  return near.length === 1 ? ` (did you mean ${JSON.stringify(near[0])}?)` : "";
}
