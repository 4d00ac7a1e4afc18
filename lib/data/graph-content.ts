// Read and write an environment's current declared graph (components + dependencies tables)
// as SnapshotContent. Bulk writes use unnest() over arrays: one statement per table, fast at 50k rows.
import { QueryTypes, type Transaction } from "sequelize";
import { db } from "@/models";
import type { SnapshotComponent, SnapshotContent, SnapshotDependency } from "@/lib/inventory/snapshot";
import type { ComponentKind, Strength, Tier } from "@/lib/inventory/types";

export async function loadCurrentContent({ environmentId }: { environmentId: string }, transaction?: Transaction): Promise<SnapshotContent> {
  const { sequelize } = db();
  const [components, dependencies] = await Promise.all([
    sequelize.query<{
      key: string;
      name: string;
      kind: ComponentKind;
      team: string | null;
      tier: number;
      replicas: number;
      zones: string[];
      tags: string[];
      links: Record<string, string>;
      source: string | null;
    }>(
      `SELECT c.key, c.name, c.kind, c.team, c.tier, c.replicas, c.zones, c.tags, c.links, s.name AS source
         FROM components c LEFT JOIN sources s ON s.id = c.source_id
        WHERE c.environment_id = :environmentId ORDER BY c.key`,
      { type: QueryTypes.SELECT, replacements: { environmentId }, transaction },
    ),
    sequelize.query<{ from: string; to: string; strength: Strength; group: string | null; via: string | null; source: string | null }>(
      `SELECT d.from_key AS "from", d.to_key AS "to", d.strength, d.group_id AS "group", d.via, s.name AS source
         FROM dependencies d JOIN sources s ON s.id = d.source_id
        WHERE d.environment_id = :environmentId ORDER BY d.from_key, d.to_key`,
      { type: QueryTypes.SELECT, replacements: { environmentId }, transaction },
    ),
  ]);
  return {
    components: components.map((c): SnapshotComponent => ({ ...c, tier: c.tier as Tier })),
    dependencies: dependencies.map((d): SnapshotDependency => d),
  };
}

/** Replace what one source declared (and every placeholder) with the rows of `content`. */
export async function writeSourceRows(
  {
    environmentId,
    sourceId,
    sourceName,
    content,
  }: { environmentId: string; sourceId: string; sourceName: string; content: SnapshotContent },
  transaction: Transaction,
): Promise<void> {
  const { sequelize } = db();
  const q = (sql: string, bind: unknown[]) => sequelize.query(sql, { bind, transaction });
  await q(`DELETE FROM dependencies WHERE source_id = $1`, [sourceId]);
  await q(`DELETE FROM components WHERE source_id = $1 OR (environment_id = $2 AND kind = 'undeclared')`, [sourceId, environmentId]);

  const mine = content.components.filter((c) => c.source === sourceName || c.kind === "undeclared");
  if (mine.length) {
    await q(
      `INSERT INTO components (id, environment_id, key, name, kind, team, tier, replicas, zones, tags, links, source_id)
       SELECT gen_random_uuid(), $1, t.key, t.name, t.kind::component_kind, t.team, t.tier, t.replicas,
              ARRAY(SELECT jsonb_array_elements_text(t.zones)), ARRAY(SELECT jsonb_array_elements_text(t.tags)),
              t.links, CASE WHEN t.kind = 'undeclared' THEN NULL ELSE $2::uuid END
         FROM jsonb_to_recordset($3::jsonb) AS t(key text, name text, kind text, team text, tier smallint,
              replicas integer, zones jsonb, tags jsonb, links jsonb)`,
      [
        environmentId,
        sourceId,
        JSON.stringify(
          mine.map((c) => ({ key: c.key, name: c.name, kind: c.kind, team: c.team, tier: c.tier, replicas: c.replicas, zones: c.zones, tags: c.tags, links: c.links })),
        ),
      ],
    );
  }
  const deps = content.dependencies.filter((d) => d.source === sourceName);
  if (deps.length) {
    await q(
      `INSERT INTO dependencies (id, environment_id, from_key, to_key, strength, group_id, via, source_id)
       SELECT gen_random_uuid(), $1, u.f, u.to_key, u.s::dependency_strength, u.g, u.v, $2
         FROM unnest($3::text[], $4::text[], $5::text[], $6::text[], $7::text[]) AS u(f, to_key, s, g, v)`,
      [
        environmentId,
        sourceId,
        deps.map((d) => d.from),
        deps.map((d) => d.to),
        deps.map((d) => d.strength),
        deps.map((d) => d.group),
        deps.map((d) => d.via),
      ],
    );
  }
}
