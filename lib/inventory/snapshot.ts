// Canonical snapshot content: the whole graph of one environment as plain, ordered data, so
// that equal graphs serialise to equal bytes (hash → "nothing changed, no snapshot") and two
// snapshots can be diffed field by field.
import { createHash } from "node:crypto";
import type { ComponentKind, InventoryComponent, Provenance, Strength, Tier } from "./types";

export interface SnapshotComponent {
  key: string;
  name: string;
  kind: ComponentKind;
  team: string | null;
  tier: Tier;
  replicas: number;
  zones: string[];
  tags: string[];
  links: Record<string, string>;
  /** Who declared it; null for an `undeclared` placeholder. */
  source: string | null;
  /**
   * Other names it is known by. Omitted when there are none, so that content written before
   * aliases existed keeps its hash (and an unchanged push still makes no snapshot).
   */
  aliases?: string[];
}

export interface SnapshotDependency {
  from: string;
  to: string;
  strength: Strength;
  /** Members of one any_of group share this id (see `anyOfGroupId`); null for a single need. */
  group: string | null;
  via: string | null;
  source: string | null;
  /** How it is known; omitted when only declared (the hash of older content stays the same). */
  provenance?: Provenance[];
  /**
   * The name the source wrote when it was an alias of `to` (omitted otherwise), so that the need
   * can be resolved again when aliases change.
   */
  written?: string;
}

export interface SnapshotContent {
  components: SnapshotComponent[];
  dependencies: SnapshotDependency[];
}

type ComponentField = Exclude<keyof SnapshotComponent, "key">;
type DependencyField = "strength" | "via" | "source" | "provenance";

interface FieldChange<T> {
  before: T;
  after: T;
}

interface ComponentChange {
  key: string;
  changes: Partial<{ [F in ComponentField]: FieldChange<SnapshotComponent[F]> }>;
}

interface DependencyChange {
  from: string;
  to: string;
  group: string | null;
  changes: Partial<{ [F in DependencyField]: FieldChange<SnapshotDependency[F]> }>;
}

export interface SnapshotDiff {
  componentsAdded: SnapshotComponent[];
  componentsRemoved: SnapshotComponent[];
  componentsChanged: ComponentChange[];
  dependenciesAdded: SnapshotDependency[];
  dependenciesRemoved: SnapshotDependency[];
  /**
   * Same identity (from, to, group), different strength, via or source. Kept apart from
   * added/removed so a soft → hard change reads as one change, not a removal and an addition.
   */
  dependenciesChanged: DependencyChange[];
}

// Code-unit order, not localeCompare: the order must not depend on the machine's locale.
const cmp = (a: string, b: string): number => (a < b ? -1 : a > b ? 1 : 0);
const cmpNullable = (a: string | null, b: string | null): number =>
  a === b ? 0 : a === null ? -1 : b === null ? 1 : cmp(a, b);

/** `<from>#any:<members sorted, comma-joined>`: stable whatever order the file listed them in. */
export function anyOfGroupId(from: string, members: readonly string[]): string {
  return `${from}#any:${[...members].sort(cmp).join(",")}`;
}

/**
 * Identity of a dependency: a need written as an alias stays apart from one written as the key
 * (both resolve to the same component, and each must survive the alias going away).
 */
function dependencyId(d: Pick<SnapshotDependency, "from" | "to" | "group" | "written">): string {
  return `${d.from}\u0000${d.to}\u0000${d.group ?? ""}${d.written === undefined ? "" : `\u0000${d.written}`}`;
}

function sortedRecord(r: Record<string, string>): Record<string, string> {
  const out: Record<string, string> = {};
  for (const k of Object.keys(r).sort(cmp)) out[k] = r[k] ?? "";
  return out;
}

const sortedSet = (values: readonly string[]): string[] => [...new Set(values)].sort(cmp);

function canonicaliseComponent(c: SnapshotComponent): SnapshotComponent {
  const aliases = sortedSet(c.aliases ?? []);
  return {
    key: c.key,
    name: c.name,
    kind: c.kind,
    team: c.team,
    tier: c.tier,
    replicas: c.replicas,
    zones: sortedSet(c.zones),
    tags: sortedSet(c.tags),
    links: sortedRecord(c.links),
    source: c.source,
    ...(aliases.length > 0 ? { aliases } : {}),
  };
}

/** `["declared"]` is the default and is left out; anything else is kept sorted. */
export function canonicalProvenance(p: readonly Provenance[] | undefined): Provenance[] | undefined {
  if (p === undefined || p.length === 0) return undefined;
  const sorted = sortedSet(p) as Provenance[];
  return sorted.length === 1 && sorted[0] === "declared" ? undefined : sorted;
}

/** The provenance of a dependency with the default filled in. */
export const provenanceOf = (d: Pick<SnapshotDependency, "provenance">): Provenance[] => d.provenance ?? ["declared"];

function canonicaliseDependency(d: SnapshotDependency): SnapshotDependency {
  const provenance = canonicalProvenance(d.provenance);
  return {
    from: d.from,
    to: d.to,
    strength: d.strength,
    group: d.group,
    via: d.via,
    source: d.source,
    ...(provenance ? { provenance } : {}),
    ...(d.written !== undefined && d.written !== d.to ? { written: d.written } : {}),
  };
}

/** Components by key; dependencies by from, to, group; arrays sorted; fields in a fixed order. */
export function canonicaliseSnapshot(content: SnapshotContent): SnapshotContent {
  return {
    components: content.components.map(canonicaliseComponent).sort((a, b) => cmp(a.key, b.key)),
    dependencies: content.dependencies
      .map(canonicaliseDependency)
      .sort(
        (a, b) =>
          cmp(a.from, b.from) ||
          cmp(a.to, b.to) ||
          cmpNullable(a.group, b.group) ||
          cmpNullable(a.written ?? null, b.written ?? null) ||
          cmp(a.strength, b.strength) ||
          cmpNullable(a.via, b.via) ||
          cmpNullable(a.source, b.source),
      ),
  };
}

/** sha256 (hex) of the canonical JSON; equal graphs give equal hashes whatever their input order. */
export function snapshotHash(content: SnapshotContent): string {
  return createHash("sha256").update(JSON.stringify(canonicaliseSnapshot(content))).digest("hex");
}

const COMPONENT_FIELDS: readonly ComponentField[] = ["name", "kind", "team", "tier", "replicas", "zones", "tags", "links", "source", "aliases"];
const DEPENDENCY_FIELDS: readonly DependencyField[] = ["strength", "via", "source", "provenance"];

// Values are canonical (sorted arrays, sorted link names), so JSON text equality is value equality.
const same = (a: unknown, b: unknown): boolean => JSON.stringify(a) === JSON.stringify(b);

/** What changed from `a` (before) to `b` (after). Every list is sorted like canonical content. */
export function diffSnapshots(a: SnapshotContent, b: SnapshotContent): SnapshotDiff {
  const before = canonicaliseSnapshot(a);
  const after = canonicaliseSnapshot(b);
  const oldComponents = new Map(before.components.map((c) => [c.key, c]));
  const newComponents = new Map(after.components.map((c) => [c.key, c]));

  const componentsChanged: ComponentChange[] = [];
  for (const c of after.components) {
    const old = oldComponents.get(c.key);
    if (!old) continue;
    const changes: Record<string, FieldChange<unknown>> = {};
    for (const f of COMPONENT_FIELDS) if (!same(old[f] ?? null, c[f] ?? null)) changes[f] = { before: old[f], after: c[f] };
    if (Object.keys(changes).length > 0) componentsChanged.push({ key: c.key, changes: changes as ComponentChange["changes"] });
  }

  const oldDeps = new Map(before.dependencies.map((d) => [dependencyId(d), d]));
  const newDeps = new Map(after.dependencies.map((d) => [dependencyId(d), d]));
  const dependenciesChanged: DependencyChange[] = [];
  for (const d of after.dependencies) {
    const old = oldDeps.get(dependencyId(d));
    if (!old) continue;
    const changes: Record<string, FieldChange<unknown>> = {};
    for (const f of DEPENDENCY_FIELDS) if (!same(old[f] ?? null, d[f] ?? null)) changes[f] = { before: old[f], after: d[f] };
    if (Object.keys(changes).length > 0) {
      dependenciesChanged.push({ from: d.from, to: d.to, group: d.group, changes: changes as DependencyChange["changes"] });
    }
  }

  return {
    componentsAdded: after.components.filter((c) => !oldComponents.has(c.key)),
    componentsRemoved: before.components.filter((c) => !newComponents.has(c.key)),
    componentsChanged,
    dependenciesAdded: after.dependencies.filter((d) => !oldDeps.has(dependencyId(d))),
    dependenciesRemoved: before.dependencies.filter((d) => !newDeps.has(dependencyId(d))),
    dependenciesChanged,
  };
}

export function isEmptyDiff(d: SnapshotDiff): boolean {
  return (
    d.componentsAdded.length === 0 &&
    d.componentsRemoved.length === 0 &&
    d.componentsChanged.length === 0 &&
    d.dependenciesAdded.length === 0 &&
    d.dependenciesRemoved.length === 0 &&
    d.dependenciesChanged.length === 0
  );
}

/**
 * Declared components → snapshot rows. Each single need is one dependency; an any_of group
 * gives one dependency per member, all carrying the group id, the group's strength and via.
 */
export function inventoryToSnapshotParts({
  components,
  source,
}: {
  components: readonly InventoryComponent[];
  source: string;
}): SnapshotContent {
  const outComponents: SnapshotComponent[] = [];
  const dependencies: SnapshotDependency[] = [];
  const seen = new Set<string>();
  for (const c of components) {
    outComponents.push(
      canonicaliseComponent({
        key: c.key,
        name: c.name,
        kind: c.kind,
        team: c.team,
        tier: c.tier,
        replicas: c.replicas,
        zones: c.zones,
        tags: c.tags,
        links: c.links,
        source,
        aliases: c.aliases,
      }),
    );
    const push = (d: SnapshotDependency): void => {
      // Importers already merge repeated needs; this keeps a hand-built inventory from producing two rows with one identity.
      const id = dependencyId(d);
      if (seen.has(id)) return;
      seen.add(id);
      dependencies.push(d);
    };
    for (const need of c.needs) {
      const provenance = canonicalProvenance(need.provenance);
      const extra = provenance ? { provenance } : {};
      if (need.type === "single") {
        push({ from: c.key, to: need.key, strength: need.strength, group: null, via: need.via, source, ...extra });
      } else {
        const group = anyOfGroupId(c.key, need.keys);
        for (const member of new Set(need.keys)) {
          push({ from: c.key, to: member, strength: need.strength, group, via: need.via, source, ...extra });
        }
      }
    }
  }
  return { components: outComponents, dependencies };
}
