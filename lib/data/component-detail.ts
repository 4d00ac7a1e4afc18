// One component with everything known about it: declared fields, owner and notes, its needs and
// dependents, and its measures in the served analysis.
import "server-only";
import { QueryTypes } from "sequelize";
import { db } from "@/models";
import type { ComponentKind, FilePosition, Provenance, Strength } from "@/lib/inventory/types";
import { COMPONENT_SELECT, toComponentListItem, type ComponentListItem, type ComponentRow } from "./components";
import { notFound } from "@/lib/errors";
import { trafficByPair, type Traffic } from "./trace-traffic";

interface ComponentEdge {
  key: string;
  name: string;
  kind: ComponentKind;
  strength: Strength;
  group: string | null;
  via: string | null;
  /** How the need is known (declared, inferred from configuration, observed). */
  provenance: Provenance[];
  /** Where an inferred need was named (file, line, column), when known. */
  origin: FilePosition | null;
  /** traffic over the trace window, for needs traces saw */
  traffic?: Traffic;
}

/** A list item (effective owner, declared team, source, notes) plus everything else known. */
export interface ComponentDetail extends ComponentListItem {
  links: Record<string, string>;
  annotationUpdatedAt: string | null;
  needs: ComponentEdge[];
  dependents: ComponentEdge[];
}

export async function getComponentDetail({ environmentId, key }: { environmentId: string; key: string }): Promise<ComponentDetail> {
  const { sequelize } = db();
  const [row] = await sequelize.query<ComponentRow>(`${COMPONENT_SELECT} WHERE c.environment_id = :environmentId AND c.key = :key`, {
    type: QueryTypes.SELECT,
    replacements: { environmentId, key },
  });
  if (!row) throw notFound(`Component "${key}"`);
  const edges = (direction: "needs" | "dependents") =>
    sequelize.query<ComponentEdge>(
      `SELECT c.key, c.name, c.kind, d.strength, d.group_id AS "group", d.via, d.provenance, d.origin
         FROM dependencies d JOIN components c ON c.environment_id = d.environment_id AND c.key = ${direction === "needs" ? "d.to_key" : "d.from_key"}
        WHERE d.environment_id = :environmentId AND ${direction === "needs" ? "d.from_key" : "d.to_key"} = :key
        ORDER BY c.key`,
      { type: QueryTypes.SELECT, replacements: { environmentId, key } },
    );
  const [needs, dependents, traffic] = await Promise.all([edges("needs"), edges("dependents"), trafficByPair({ environmentId, key })]);
  const decorate = (list: ComponentEdge[], pair: (e: ComponentEdge) => string): ComponentEdge[] =>
    list.map((e) => {
      const t = traffic.get(pair(e));
      return t ? { ...e, traffic: t } : e;
    });
  return {
    ...toComponentListItem(row),
    links: row.links,
    annotationUpdatedAt: row.updated_at?.toISOString() ?? null,
    needs: decorate(needs, (e) => `${key}\u0000${e.key}`),
    dependents: decorate(dependents, (e) => `${e.key}\u0000${key}`),
  };
}

export async function getComponentMetrics({ snapshotId, key }: { snapshotId: string; key: string }) {
  const { models } = db();
  const [row, dominance] = await Promise.all([
    models.ComponentMetric.findOne({ where: { snapshotId, key } }),
    models.ComponentDominance.findAll({ where: { snapshotId, key }, order: [["dominated", "DESC"], ["entry", "ASC"]], limit: 20 }),
  ]);
  if (!row) return null;
  const rankOf = (rank: number | null, tied: number) => ({ rank, tied });
  return {
    rank: row.rank,
    tied: row.tied,
    ranks: {
      betweenness: rankOf(row.rank, row.tied),
      pagerank: rankOf(row.rankPagerank, row.tiedPagerank),
      eigenvector: rankOf(row.rankEigenvector, row.tiedEigenvector),
      pinchScore: rankOf(row.rankPinch, row.tiedPinch),
      blastDown: rankOf(row.rankBlast, row.tiedBlast),
    },
    betweenness: row.betweenness,
    pagerank: row.pagerank,
    eigenvector: row.eigenvector,
    clustering: row.clustering,
    articulation: row.articulation,
    inCycle: row.inCycle,
    blastRadius: { down: row.blastDown, degraded: row.blastDegraded },
    pinchScore: row.pinchScore,
    bootStage: row.bootStage,
    waitsOnCycle: row.waitsOnCycle,
    entry: row.entry,
    /** null fields: an analysis from before dominators were stored */
    dominators: {
      entriesReaching: row.entriesReaching,
      entriesDominated: row.entriesDominated,
      maxDominated: row.maxDominated,
      dominatedAll: row.dominatedAll,
      idomAll: row.idomAll,
      /** the entries it dominates the most from (stored for at most 20, fewer on estates with very many entries) */
      fromEntries: dominance.map((d) => ({ entry: d.entry, dominated: d.dominated })),
    },
  };
}
