// Components of an environment as the app shows them: declared fields plus the owner annotation.
import "server-only";
import { QueryTypes } from "sequelize";
import { db } from "@/models";
import { isSinglePoint } from "@/lib/analysis/pinch-score";
import type { ComponentKind, Tier } from "@/lib/inventory/types";

export interface ComponentListItem {
  key: string;
  name: string;
  kind: ComponentKind;
  /** effective owner: the team assigned in Pinchpoint, else the team the source declared */
  team: string | null;
  declaredTeam: string | null;
  tier: Tier;
  replicas: number;
  zones: string[];
  tags: string[];
  source: string | null;
  notes: string | null;
  /** one replica or fewer than two zones: the analysis' own rule (lib/analysis/pinch-score.ts) */
  singlePoint: boolean;
}

export interface ComponentFilter {
  team?: string;
  kind?: ComponentKind;
  q?: string;
  unowned?: boolean;
}

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

export async function listComponents({
  environmentId,
  filter = {},
}: {
  environmentId: string;
  filter?: ComponentFilter;
}): Promise<ComponentListItem[]> {
  const where = ["c.environment_id = :environmentId"];
  const replacements: Record<string, unknown> = { environmentId };
  if (filter.team) {
    where.push("COALESCE(a.owner_team, c.team) = :team");
    replacements.team = filter.team;
  }
  if (filter.kind) {
    where.push("c.kind = :kind");
    replacements.kind = filter.kind;
  }
  if (filter.q) {
    where.push("(c.key ILIKE :q OR c.name ILIKE :q)");
    replacements.q = `%${filter.q.replace(/[\\%_]/g, (m) => `\\${m}`)}%`;
  }
  if (filter.unowned) where.push("COALESCE(a.owner_team, c.team) IS NULL AND c.kind <> 'undeclared'");
  const rows = await db().sequelize.query<ComponentRow>(`${COMPONENT_SELECT} WHERE ${where.join(" AND ")} ORDER BY c.key`, {
    type: QueryTypes.SELECT,
    replacements,
  });
  return rows.map(toComponentListItem);
}

export interface EnvironmentCounts {
  components: number;
  teams: number;
  unowned: number;
  undeclared: number;
  dependencies: number;
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
