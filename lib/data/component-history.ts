// Which snapshots added, changed or removed one component (and its dependencies). Reads only the
// slice of each snapshot's content that mentions the key, so a 20k-component snapshot is not
// shipped to Node 30 times over.
import "server-only";
import { QueryTypes } from "sequelize";
import { db } from "@/models";
import { notFound } from "@/lib/errors";
import { diffSnapshots, isEmptyDiff, type SnapshotComponent, type SnapshotDependency, type SnapshotDiff } from "@/lib/inventory/snapshot";

export interface ComponentHistoryEntry {
  number: number;
  createdAt: string;
  source: string | null;
  actor: string | null;
  /** what this snapshot did to the component compared with the one before it */
  change: "added" | "removed" | "changed";
  diff: SnapshotDiff;
}

interface SliceRow {
  number: number;
  created_at: Date;
  source_name: string | null;
  actor_label: string | null;
  component: SnapshotComponent | null;
  dependencies: SnapshotDependency[] | null;
}

const COMPONENT_HISTORY_DEPTH = 30;

export async function getComponentHistory({ environmentId, key, depth = COMPONENT_HISTORY_DEPTH }: { environmentId: string; key: string; depth?: number }): Promise<{ scanned: number; items: ComponentHistoryEntry[] }> {
  // depth + 1 rows: the oldest one only serves as the "before" of the next.
  const rows = await db().sequelize.query<SliceRow>(
    `SELECT s.number, s.created_at, s.source_name, s.actor_label,
            (SELECT c FROM jsonb_array_elements(s.content->'components') c WHERE c->>'key' = :key LIMIT 1) AS component,
            (SELECT jsonb_agg(d) FROM jsonb_array_elements(s.content->'dependencies') d WHERE d->>'from' = :key OR d->>'to' = :key) AS dependencies
       FROM snapshots s
      WHERE s.environment_id = :environmentId
      ORDER BY s.number DESC
      LIMIT :limit`,
    { type: QueryTypes.SELECT, replacements: { environmentId, key, limit: depth + 1 } },
  );
  if (!rows.some((r) => r.component)) throw notFound(`Component "${key}" in the last ${depth} snapshots`);
  const ordered = rows.reverse();
  const slice = (r: SliceRow | undefined) => ({ components: r?.component ? [r.component] : [], dependencies: r?.dependencies ?? [] });
  const items: ComponentHistoryEntry[] = [];
  // The oldest row is a snapshot of its own only when the environment has no older one.
  const startsAtFirst = rows.length <= depth;
  for (let i = startsAtFirst ? 0 : 1; i < ordered.length; i++) {
    const row = ordered[i]!;
    const before = i > 0 ? slice(ordered[i - 1]) : { components: [], dependencies: [] };
    const diff = diffSnapshots(before, slice(row));
    if (isEmptyDiff(diff)) continue;
    const change = diff.componentsAdded.length ? "added" : diff.componentsRemoved.length ? "removed" : "changed";
    items.push({ number: row.number, createdAt: row.created_at.toISOString(), source: row.source_name, actor: row.actor_label, change, diff });
  }
  return { scanned: Math.min(rows.length, depth), items: items.reverse() };
}
