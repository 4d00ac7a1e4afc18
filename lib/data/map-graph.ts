// The map's data: the served snapshot's components and dependencies with their measures and
// effective owners, in the shape components/map/types.ts parses.
import "server-only";
import { QueryTypes } from "sequelize";
import { db } from "@/models";
import type { MapGraph, MapNode } from "@/lib/api/schemas/map";
import type { SnapshotContent } from "@/lib/inventory/snapshot";
import { METRIC_COLUMNS, getAnalysisView, getCycles, type MetricColumns } from "./analysis-results";
import { listTeams } from "./teams";
import { effectiveOwners, getSnapshotGraph } from "./snapshot-graph";
import { graphViewOf } from "./graph-view";
import { trafficByPair } from "./trace-traffic";

export async function getMapGraph({ environmentId, slug }: { environmentId: string; slug: string }): Promise<MapGraph> {
  const view = await getAnalysisView({ environmentId });
  const snapshot = view.served ?? view.latest;
  const teams = (await listTeams()).map((t) => ({ slug: t.slug, name: t.name }));
  if (!snapshot) return { environment: slug, snapshot: null, nodes: [], edges: [], teams };
  const [{ content }, owners, metrics, traffic, graphView, cycles] = await Promise.all([
    getSnapshotGraph({ snapshotId: snapshot.id }),
    effectiveOwners({ environmentId }),
    view.served
      ? db().sequelize.query<MetricColumns & { key: string }>(`SELECT key, ${METRIC_COLUMNS} FROM component_metrics WHERE snapshot_id = :id`, {
          type: QueryTypes.SELECT,
          replacements: { id: view.served.id },
        })
      : Promise.resolve([]),
    trafficByPair({ environmentId }),
    view.served ? graphViewOf({ environmentId, snapshotId: view.served.id }) : Promise.resolve(null),
    view.served ? getCycles({ snapshotId: view.served.id, kind: "runtime" }) : Promise.resolve([]),
  ]);
  const byKey = new Map(metrics.map((m) => [m.key, m]));
  const cycleOf = new Map<string, number>();
  cycles.forEach((cycle, i) => cycle.members.forEach((k) => cycleOf.set(k, i)));
  return {
    environment: slug,
    snapshot: { number: snapshot.number, createdAt: snapshot.createdAt },
    teams,
    graphView,
    nodes: content.components.map((c) => {
      const m = byKey.get(c.key);
      return {
        ...mapNodeOf(c, owners),
        metrics: m
          ? {
              betweenness: m.betweenness,
              pagerank: m.pagerank,
              eigenvector: m.eigenvector,
              clustering: m.clustering,
              blastDown: m.blast_down,
              blastDegraded: m.blast_degraded,
              pinchScore: m.pinch_score,
              articulation: m.articulation,
              inCycle: m.in_cycle,
              entriesDominated: m.entries_dominated,
              dominatedAll: m.dominated_all,
            }
          : null,
      };
    }),
    edges: content.dependencies.map((d) => {
      const a = cycleOf.get(d.from);
      const t = traffic.get(`${d.from}\u0000${d.to}`);
      return {
        from: d.from,
        to: d.to,
        strength: d.strength,
        group: d.group,
        inCycle: a !== undefined && a === cycleOf.get(d.to),
        ...(d.provenance ? { provenance: d.provenance } : {}),
        ...(t ? { traffic: { callsPerMinute: t.callsPerMinute, errorRate: t.errorRate, p95Ms: t.p95Ms } } : {}),
      };
    }),
  };
}

/** A component as the map draws it, owner annotations applied; the measures are the caller's (null before an analysis). */
export function mapNodeOf(c: SnapshotContent["components"][number], owners: Map<string, string | null>): Omit<MapNode, "metrics"> {
  return {
    key: c.key,
    name: c.name,
    kind: c.kind,
    team: owners.has(c.key) ? (owners.get(c.key) ?? null) : c.team,
    tier: c.tier,
    replicas: c.replicas,
    zones: c.zones,
    undeclared: c.kind === "undeclared",
  };
}
