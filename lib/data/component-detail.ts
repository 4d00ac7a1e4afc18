// One component with everything known about it: declared fields, owner and notes, its needs and
// dependents, and its measures in the served analysis.
import { QueryTypes } from "sequelize";
import { db } from "@/models";
import type { ComponentKind, Strength, Tier } from "@/lib/inventory/types";
import type { ComponentListItem } from "./components";
import { isSinglePoint } from "@/lib/analysis/pinch-score";
import { notFound } from "@/lib/errors";

export interface ComponentEdge {
  key: string;
  name: string;
  kind: ComponentKind;
  strength: Strength;
  group: string | null;
  via: string | null;
}

/** A list item (effective owner, declared team, source, notes) plus everything else known. */
export interface ComponentDetail extends ComponentListItem {
  links: Record<string, string>;
  annotationUpdatedAt: string | null;
  needs: ComponentEdge[];
  dependents: ComponentEdge[];
  observed: { needs: string[]; dependents: string[] };
}

export async function getComponentDetail({ environmentId, key }: { environmentId: string; key: string }): Promise<ComponentDetail> {
  const { sequelize } = db();
  const [row] = await sequelize.query<{
    key: string;
    name: string;
    kind: ComponentKind;
    team: string | null;
    declared_team: string | null;
    tier: number;
    replicas: number;
    zones: string[];
    tags: string[];
    links: Record<string, string>;
    source: string | null;
    notes: string | null;
    updated_at: Date | null;
  }>(
    `SELECT c.key, c.name, c.kind, COALESCE(a.owner_team, c.team) AS team, c.team AS declared_team, c.tier, c.replicas,
            c.zones, c.tags, c.links, s.name AS source, a.notes, a.updated_at
       FROM components c
       LEFT JOIN component_annotations a ON a.environment_id = c.environment_id AND a.key = c.key
       LEFT JOIN sources s ON s.id = c.source_id
      WHERE c.environment_id = :environmentId AND c.key = :key`,
    { type: QueryTypes.SELECT, replacements: { environmentId, key } },
  );
  if (!row) throw notFound(`Component "${key}"`);
  const edges = (direction: "needs" | "dependents") =>
    sequelize.query<ComponentEdge>(
      `SELECT c.key, c.name, c.kind, d.strength, d.group_id AS "group", d.via
         FROM dependencies d JOIN components c ON c.environment_id = d.environment_id AND c.key = ${direction === "needs" ? "d.to_key" : "d.from_key"}
        WHERE d.environment_id = :environmentId AND ${direction === "needs" ? "d.from_key" : "d.to_key"} = :key
        ORDER BY c.key`,
      { type: QueryTypes.SELECT, replacements: { environmentId, key } },
    );
  const [needs, dependents, observed] = await Promise.all([
    edges("needs"),
    edges("dependents"),
    sequelize.query<{ from_key: string; to_key: string }>(
      "SELECT DISTINCT from_key, to_key FROM observed_dependencies WHERE environment_id = :environmentId AND (from_key = :key OR to_key = :key)",
      { type: QueryTypes.SELECT, replacements: { environmentId, key } },
    ),
  ]);
  return {
    key: row.key,
    name: row.name,
    kind: row.kind,
    team: row.team,
    declaredTeam: row.declared_team,
    tier: row.tier as Tier,
    replicas: row.replicas,
    zones: row.zones,
    tags: row.tags,
    links: row.links,
    source: row.source,
    notes: row.notes,
    singlePoint: isSinglePoint(row.replicas, row.zones),
    annotationUpdatedAt: row.updated_at?.toISOString() ?? null,
    needs,
    dependents,
    observed: {
      needs: observed.filter((o) => o.from_key === key).map((o) => o.to_key),
      dependents: observed.filter((o) => o.to_key === key).map((o) => o.from_key),
    },
  };
}

export async function getComponentMetrics({ snapshotId, key }: { snapshotId: string; key: string }) {
  const row = await db().models.ComponentMetric.findOne({ where: { snapshotId, key } });
  if (!row) return null;
  return {
    rank: row.rank,
    betweenness: row.betweenness,
    pagerank: row.pagerank,
    eigenvector: row.eigenvector,
    clustering: row.clustering,
    articulation: row.articulation,
    inCycle: row.inCycle,
    blastRadius: { down: row.blastDown, degraded: row.blastDegraded },
    pinchScore: row.pinchScore,
  };
}
