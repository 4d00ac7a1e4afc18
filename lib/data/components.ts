// Components of an environment as the app shows them: declared fields plus the owner annotation.
// The list is paged, sorted and filtered here, so a screen never loads an estate's every row.
import "server-only";
import { QueryTypes } from "sequelize";
import { db } from "@/models";
import { isSinglePoint } from "@/lib/analysis/pinch-score";
import { orderOf } from "@/lib/api/schemas/common";
import { COMPONENT_LIST, type ComponentListItem, type ComponentsQuery, type EnvironmentCounts } from "@/lib/api/schemas/components";
import type { ComponentKind, Tier } from "@/lib/inventory/types";
import { containsPattern, orderSql } from "./list-sql";

export type { ComponentListItem, EnvironmentCounts };

/** A component row with its owner annotation and source, as COMPONENT_SELECT returns it. */
export interface ComponentRow {
  key: string;
  name: string;
  kind: ComponentKind;
  team: string | null;
  declared_team: string | null;
  tier: number;
  replicas: number;
  zones: string[];
  tags: string[];
  source: string | null;
  notes: string | null;
  links: Record<string, string>;
  updated_at: Date | null;
}

/** Components with their effective owner (assigned, else declared), notes and source; add a WHERE. */
export const COMPONENT_SELECT = `
  SELECT c.key, c.name, c.kind, COALESCE(a.owner_team, c.team) AS team, c.team AS declared_team, c.tier,
         c.replicas, c.zones, c.tags, c.links, s.name AS source, a.notes, a.updated_at
    FROM components c
    LEFT JOIN component_annotations a ON a.environment_id = c.environment_id AND a.key = c.key
    LEFT JOIN sources s ON s.id = c.source_id`;

export const toComponentListItem = (r: ComponentRow): ComponentListItem => ({
  key: r.key,
  name: r.name,
  kind: r.kind,
  team: r.team,
  declaredTeam: r.declared_team,
  tier: r.tier as Tier,
  replicas: r.replicas,
  zones: r.zones,
  tags: r.tags,
  source: r.source,
  notes: r.notes,
  singlePoint: isSinglePoint(r.replicas, r.zones),
});

const SORT_COLUMNS: Record<ComponentsQuery["sort"], string> = {
  key: "c.key",
  name: "c.name",
  kind: "c.kind::text",
  team: "COALESCE(a.owner_team, c.team)",
  tier: "c.tier",
  replicas: "c.replicas",
  source: "s.name",
};

/** One page of an environment's components, filtered and sorted, with how many match in all. */
export async function listComponents({
  environmentId,
  query,
}: {
  environmentId: string;
  query: ComponentsQuery;
}): Promise<{ total: number; limit: number; offset: number; items: ComponentListItem[] }> {
  const where = ["c.environment_id = :environmentId"];
  const replacements: Record<string, unknown> = { environmentId, limit: query.limit, offset: query.offset };
  if (query.team) {
    where.push("COALESCE(a.owner_team, c.team) = :team");
    replacements.team = query.team;
  }
  if (query.kind) {
    where.push("c.kind = :kind");
    replacements.kind = query.kind;
  }
  if (query.tier) {
    where.push("c.tier = :tier");
    replacements.tier = query.tier;
  }
  if (query.q) {
    where.push("(c.key ILIKE :q OR c.name ILIKE :q)");
    replacements.q = containsPattern(query.q);
  }
  if (query.unowned) where.push("COALESCE(a.owner_team, c.team) IS NULL AND c.kind <> 'undeclared'");
  const order = orderSql(SORT_COLUMNS[query.sort], orderOf(COMPONENT_LIST, query), "c.key ASC");
  const rows = await db().sequelize.query<ComponentRow & { total: string }>(
    `${COMPONENT_SELECT.replace("SELECT ", "SELECT count(*) OVER () AS total, ")} WHERE ${where.join(" AND ")} ORDER BY ${order} LIMIT :limit OFFSET :offset`,
    { type: QueryTypes.SELECT, replacements },
  );
  let total = Number(rows[0]?.total ?? 0);
  if (!rows.length && query.offset > 0) {
    // Past the end the window count is empty: count apart so the pager still says how many there are.
    const [c] = await db().sequelize.query<{ n: string }>(
      `SELECT count(*) AS n FROM components c LEFT JOIN component_annotations a ON a.environment_id = c.environment_id AND a.key = c.key WHERE ${where.join(" AND ")}`,
      { type: QueryTypes.SELECT, replacements },
    );
    total = Number(c?.n ?? 0);
  }
  return { total, limit: query.limit, offset: query.offset, items: rows.map(toComponentListItem) };
}

/** The zones any component of the environment runs in, for the drill screen's choices. */
export async function listZones({ environmentId }: { environmentId: string }): Promise<string[]> {
  const rows = await db().sequelize.query<{ zone: string }>("SELECT DISTINCT unnest(zones) AS zone FROM components WHERE environment_id = :environmentId ORDER BY 1", {
    type: QueryTypes.SELECT,
    replacements: { environmentId },
  });
  return rows.map((r) => r.zone);
}

export async function countComponents({ environmentId }: { environmentId: string }): Promise<EnvironmentCounts> {
  const [row] = await db().sequelize.query<{
    components: string;
    teams: string;
    unowned: string;
    undeclared: string;
    dependencies: string;
  }>(
    `SELECT count(*) AS components,
            count(DISTINCT COALESCE(a.owner_team, c.team)) AS teams,
            count(*) FILTER (WHERE COALESCE(a.owner_team, c.team) IS NULL AND c.kind <> 'undeclared') AS unowned,
            count(*) FILTER (WHERE c.kind = 'undeclared') AS undeclared,
            (SELECT count(*) FROM dependencies d WHERE d.environment_id = :environmentId) AS dependencies
       FROM components c
       LEFT JOIN component_annotations a ON a.environment_id = c.environment_id AND a.key = c.key
      WHERE c.environment_id = :environmentId`,
    { type: QueryTypes.SELECT, replacements: { environmentId } },
  );
  return {
    components: Number(row?.components ?? 0),
    teams: Number(row?.teams ?? 0),
    unowned: Number(row?.unowned ?? 0),
    undeclared: Number(row?.undeclared ?? 0),
    dependencies: Number(row?.dependencies ?? 0),
  };
}
