// Map layouts per snapshot and view, computed by the worker after each analysis (lib/jobs/map-layout.ts)
// and read by the map, which then draws without laying anything out (lib/map/estate.ts composes them).
import "server-only";
import { QueryTypes } from "sequelize";
import ELK from "elkjs/lib/elk.bundled.js";
import { db } from "@/models";
import type { MapGraph } from "@/lib/api/schemas/map";
import type { MapLayoutsResponse } from "@/lib/api/schemas/map";
import { layoutEstate, type StoredViews } from "@/lib/map/estate";
import { getAnalysisView } from "./analysis-results";
import { mapNodeOf } from "./map-graph";
import { effectiveOwners, getSnapshotGraph } from "./snapshot-graph";
import { listTeams } from "./teams";

export type MapLayoutJobData = { snapshotId: string; environmentId: string };

/** Lay out every stored view of a snapshot and replace its rows (owners as they are now). */
export async function computeMapLayouts({ snapshotId, environmentId }: MapLayoutJobData): Promise<{ views: number; ms: number } | null> {
  const [exists] = await db().sequelize.query<{ id: string }>("SELECT id FROM snapshots WHERE id = :snapshotId", { type: QueryTypes.SELECT, replacements: { snapshotId } });
  if (!exists) return null;
  const [{ content }, owners, teams] = await Promise.all([getSnapshotGraph({ snapshotId }), effectiveOwners({ environmentId }), listTeams()]);
  const graph: Pick<MapGraph, "nodes" | "edges" | "teams"> = {
    teams: teams.map((t) => ({ slug: t.slug, name: t.name })),
    nodes: content.components.map((c) => ({ ...mapNodeOf(c, owners), metrics: null })),
    edges: content.dependencies.map((d) => ({ from: d.from, to: d.to, strength: d.strength, group: d.group, inCycle: false, ...(d.provenance ? { provenance: d.provenance } : {}) })),
  };
  const started = performance.now();
  // elk.bundled.js runs ELK on this thread; yielding between teams keeps the worker's heartbeats going.
  const views = await layoutEstate({ graph, elk: new ELK(), pause: () => new Promise((resolve) => setImmediate(resolve)) });
  const ms = Math.round(performance.now() - started);
  const { sequelize } = db();
  await sequelize.transaction(async (transaction) => {
    await sequelize.query("DELETE FROM map_layouts WHERE snapshot_id = :snapshotId", { replacements: { snapshotId }, transaction });
    for (const [view, layout] of Object.entries(views)) {
      await sequelize.query("INSERT INTO map_layouts (snapshot_id, view, layout, computed_ms) VALUES (:snapshotId, :view, CAST(:layout AS jsonb), :ms)", {
        replacements: { snapshotId, view, layout: JSON.stringify(layout), ms },
        transaction,
      });
    }
  });
  return { views: Object.keys(views).length, ms };
}

/** The stored views of the snapshot the map shows (the served one, else the newest), empty while the worker has not laid it out. */
export async function getMapLayouts({ environmentId }: { environmentId: string }): Promise<MapLayoutsResponse> {
  const view = await getAnalysisView({ environmentId });
  const snapshot = view.served ?? view.latest;
  if (!snapshot) return { snapshot: null, computedMs: null, views: {} };
  const rows = await db().sequelize.query<{ view: string; layout: StoredViews[string]; computed_ms: number }>(
    "SELECT view, layout, computed_ms FROM map_layouts WHERE snapshot_id = :id",
    { type: QueryTypes.SELECT, replacements: { id: snapshot.id } },
  );
  return {
    snapshot: { number: snapshot.number },
    computedMs: rows[0]?.computed_ms ?? null,
    views: Object.fromEntries(rows.map((r) => [r.view, r.layout])),
  };
}
