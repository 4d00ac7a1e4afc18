// Which needs an analysis runs on (DESIGN §10): the environment's analysisView setting, or when it
// is unset `both` where the graph has declared and observed parts, else the one it has. Snapshots
// never change, so what a snapshot holds is read once and kept.
import "server-only";
import { QueryTypes } from "sequelize";
import { db } from "@/models";
import { OBSERVED_SOURCE } from "@/lib/inventory/observed";
import { readSettings, type AnalysisView } from "@/lib/inventory/settings";

export interface GraphView {
  view: AnalysisView;
  /** the setting; null when the view follows what the graph holds */
  setting: AnalysisView | null;
  /** components only traces know of (the pseudo-source's), in the snapshot */
  observedOnlyComponents: number;
  /** needs traces confirm or show, in the snapshot */
  observedNeeds: number;
}

const holder = globalThis as unknown as { __pinchpointSnapshotParts?: Map<string, { declared: boolean; observedOnlyComponents: number; observedNeeds: number }> };
const parts = (holder.__pinchpointSnapshotParts ??= new Map());

/** `settings`: the environment's, when the caller has read them already (the served-state query has). */
export async function graphViewOf({ environmentId, snapshotId, settings }: { environmentId: string; snapshotId: string; settings?: unknown }): Promise<GraphView> {
  const raw = settings !== undefined ? settings : (await db().models.Environment.findByPk(environmentId, { attributes: ["settings"] }))?.settings;
  const setting = readSettings(raw).analysisView;
  let p = parts.get(snapshotId);
  if (!p) {
    const [row] = await db().sequelize.query<{ declared: boolean; observed_only: number; observed_needs: number }>(
      `SELECT EXISTS (SELECT 1 FROM jsonb_array_elements(content->'components') c WHERE c->>'source' IS NOT NULL AND c->>'source' <> $2) AS declared,
              (SELECT count(*)::int FROM jsonb_array_elements(content->'components') c WHERE c->>'source' = $2) AS observed_only,
              (SELECT count(*)::int FROM jsonb_array_elements(content->'dependencies') d WHERE d->'provenance' ? 'observed') AS observed_needs
         FROM snapshots WHERE id = $1`,
      { type: QueryTypes.SELECT, bind: [snapshotId, OBSERVED_SOURCE] },
    );
    p = { declared: row?.declared ?? false, observedOnlyComponents: row?.observed_only ?? 0, observedNeeds: row?.observed_needs ?? 0 };
    parts.set(snapshotId, p);
    if (parts.size > 256) parts.delete(parts.keys().next().value!);
  }
  const view: AnalysisView = setting ?? (p.declared && p.observedNeeds > 0 ? "both" : p.observedNeeds > 0 ? "observed" : "declared");
  return { view, setting, observedOnlyComponents: p.observedOnlyComponents, observedNeeds: p.observedNeeds };
}
