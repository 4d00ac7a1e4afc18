// One source's push merged into an environment's current graph (DESIGN §1): the push
// replaces exactly what that source declared before — its components and their
// dependencies — and leaves every other source's alone. Pure; the data layer runs it
// inside its transaction and stores `content` when the hash changed.
import {
  canonicaliseSnapshot,
  inventoryToSnapshotParts,
  type SnapshotComponent,
  type SnapshotContent,
} from "./snapshot";
import type { InventoryIssue, NormalisedInventory } from "./types";

export interface MergeConflict {
  key: string;
  /** [the source that declares it now, the pushing source] */
  sources: [string, string];
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
  /** The importer's warnings first, then one per need that ended on a placeholder. */
  warnings: InventoryIssue[];
}

/**
 * What a need on a key no source declares turns into. Tier 3 and one replica are the format's
 * own defaults: nothing is known about it, so it is neither promoted nor discounted in the
 * rankings, and one replica flags it as a possible single point of failure until declared.
 */
export function placeholderComponent(key: string): SnapshotComponent {
  return { key, name: key, kind: "undeclared", team: null, tier: 3, replicas: 1, zones: [], tags: [], links: {}, source: null };
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
  const declaredBefore = new Map<string, SnapshotComponent>();
  const placeholdersBefore = new Set<string>();
  for (const c of existing.components) {
    if (c.source === null) placeholdersBefore.add(c.key);
    else declaredBefore.set(c.key, c);
  }

  const conflicts: MergeConflict[] = [];
  for (const c of incoming.components) {
    const owner = declaredBefore.get(c.key)?.source;
    if (owner !== undefined && owner !== null && owner !== source) conflicts.push({ key: c.key, sources: [owner, source] });
  }
  if (conflicts.length > 0) {
    return { content: canonicaliseSnapshot(existing), conflicts, placeholdersCreated: [], placeholdersRemoved: [], warnings: [...incoming.warnings] };
  }

  const parts = inventoryToSnapshotParts({ components: incoming.components, source });
  const components = [...existing.components.filter((c) => c.source !== null && c.source !== source), ...parts.components];
  const dependencies = [...existing.dependencies.filter((d) => d.source !== source), ...parts.dependencies];

  // Placeholders are derived, not kept: exactly the needed keys nobody declares.
  const declared = new Set(components.map((c) => c.key));
  const placeholders = new Set<string>();
  for (const d of dependencies) if (!declared.has(d.to)) placeholders.add(d.to);

  const warnings: InventoryIssue[] = [...incoming.warnings];
  incoming.components.forEach((c, i) => {
    const named = new Set<string>();
    for (const need of c.needs) for (const k of need.type === "single" ? [need.key] : need.keys) named.add(k);
    for (const k of named) {
      if (!placeholders.has(k)) continue;
      warnings.push({
        path: `components[${i}].needs`,
        message: `${JSON.stringify(c.key)} needs ${JSON.stringify(k)}, which no source declares: it is shown as an undeclared placeholder`,
      });
    }
  });

  const sorted = (s: Iterable<string>): string[] => [...s].sort((a, b) => (a < b ? -1 : a > b ? 1 : 0));
  return {
    content: canonicaliseSnapshot({ components: [...components, ...[...placeholders].map(placeholderComponent)], dependencies }),
    conflicts,
    placeholdersCreated: sorted([...placeholders].filter((k) => !placeholdersBefore.has(k))),
    placeholdersRemoved: sorted([...placeholdersBefore].filter((k) => !placeholders.has(k))),
    warnings,
  };
}
