// Read and write an environment's current declared graph (components + dependencies tables)
// as SnapshotContent. Bulk writes use unnest() / jsonb_to_recordset(): one statement per table,
// fast at 50k rows.
import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { db } from "@/models";
import { canonicalProvenance, type SnapshotComponent, type SnapshotContent, type SnapshotDependency } from "@/lib/inventory/snapshot";
import type { ComponentKind, FilePosition, Provenance, Strength, Tier } from "@/lib/inventory/types";

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
      aliases: string[];
      source: string | null;
    }>(
      `SELECT c.key, c.name, c.kind, c.team, c.tier, c.replicas, c.zones, c.tags, c.links, c.aliases, s.name AS source
         FROM components c LEFT JOIN sources s ON s.id = c.source_id
        WHERE c.environment_id = :environmentId ORDER BY c.key`,
      { type: QueryTypes.SELECT, replacements: { environmentId }, transaction },
    ),
    sequelize.query<{
      from: string;
      to: string;
      strength: Strength;
      group: string | null;
      via: string | null;
      source: string | null;
      provenance: Provenance[];
      written: string | null;
    }>(
      `SELECT d.from_key AS "from", d.to_key AS "to", d.strength, d.group_id AS "group", d.via, s.name AS source,
              d.provenance, d.written_to AS written
         FROM dependencies d JOIN sources s ON s.id = d.source_id
        WHERE d.environment_id = :environmentId ORDER BY d.from_key, d.to_key`,
      { type: QueryTypes.SELECT, replacements: { environmentId }, transaction },
    ),
  ]);
  return {
    components: components.map(({ aliases, ...c }): SnapshotComponent => ({
      ...c,
      tier: c.tier as Tier,
      ...(aliases.length > 0 ? { aliases } : {}),
    })),
    dependencies: dependencies.map(({ provenance, written, ...d }): SnapshotDependency => {
      const p = canonicalProvenance(provenance);
      return { ...d, ...(p ? { provenance: p } : {}), ...(written !== null ? { written } : {}) };
    }),
  };
}

/** Where an inferred need was written, by `from → to (as written)`; only needs that carry a position. */
export type NeedOrigins = ReadonlyMap<string, FilePosition>;
export const needOriginKey = (from: string, written: string): string => `${from}\u0000${written}`;

/**
 * Replace what one source declared (and every placeholder) with the rows of `content`. With
 * `allDependencies` every source's needs are rewritten (an alias came or went, so needs written by
 * other sources resolve differently now).
 */
export async function writeSourceRows(
  {
    environmentId,
    sourceId,
    sourceName,
    content,
    origins = new Map(),
    allDependencies = false,
  }: {
    environmentId: string;
    sourceId: string;
    sourceName: string;
    content: SnapshotContent;
    origins?: NeedOrigins;
    allDependencies?: boolean;
  },
  transaction: Transaction,
): Promise<void> {
  const { sequelize } = db();
  const q = (sql: string, bind: unknown[]) => sequelize.query(sql, { bind, transaction });
  // Other sources' positions survive a rewrite of their rows.
  const kept = new Map<string, FilePosition>();
  if (allDependencies) {
    const rows = await sequelize.query<{ source: string; from: string; written: string; origin: FilePosition }>(
      `SELECT s.name AS source, d.from_key AS "from", COALESCE(d.written_to, d.to_key) AS written, d.origin
         FROM dependencies d JOIN sources s ON s.id = d.source_id
        WHERE d.environment_id = $1 AND d.source_id <> $2 AND d.origin IS NOT NULL`,
      { type: QueryTypes.SELECT, bind: [environmentId, sourceId], transaction },
    );
    for (const r of rows) kept.set(`${r.source}\u0000${needOriginKey(r.from, r.written)}`, r.origin);
  }
  if (allDependencies) await q(`DELETE FROM dependencies WHERE environment_id = $1`, [environmentId]);
  else await q(`DELETE FROM dependencies WHERE source_id = $1`, [sourceId]);
  await q(`DELETE FROM components WHERE source_id = $1 OR (environment_id = $2 AND kind = 'undeclared')`, [sourceId, environmentId]);

  const mine = content.components.filter((c) => c.source === sourceName || c.kind === "undeclared");
  if (mine.length) {
    await q(
      `INSERT INTO components (id, environment_id, key, name, kind, team, tier, replicas, zones, tags, links, aliases, source_id)
       SELECT gen_random_uuid(), $1, t.key, t.name, t.kind::component_kind, t.team, t.tier, t.replicas,
              ARRAY(SELECT jsonb_array_elements_text(t.zones)), ARRAY(SELECT jsonb_array_elements_text(t.tags)),
              t.links, ARRAY(SELECT jsonb_array_elements_text(t.aliases)), CASE WHEN t.kind = 'undeclared' THEN NULL ELSE $2::uuid END
         FROM jsonb_to_recordset($3::jsonb) AS t(key text, name text, kind text, team text, tier smallint,
              replicas integer, zones jsonb, tags jsonb, links jsonb, aliases jsonb)`,
      [
        environmentId,
        sourceId,
        JSON.stringify(
          mine.map((c) => ({ key: c.key, name: c.name, kind: c.kind, team: c.team, tier: c.tier, replicas: c.replicas, zones: c.zones, tags: c.tags, links: c.links, aliases: c.aliases ?? [] })),
        ),
      ],
    );
  }
  const deps = allDependencies ? content.dependencies : content.dependencies.filter((d) => d.source === sourceName);
  if (deps.length) {
    // Source ids by name: with allDependencies the rows belong to many sources.
    await q(
      `INSERT INTO dependencies (id, environment_id, from_key, to_key, strength, group_id, via, source_id, provenance, written_to, origin)
       SELECT gen_random_uuid(), $1, t.f, t.t, t.s::dependency_strength, t.g, t.v, s.id,
              ARRAY(SELECT jsonb_array_elements_text(t.p)), t.w, t.o
         FROM jsonb_to_recordset($2::jsonb) AS t(f text, t text, s text, g text, v text, src text, p jsonb, w text, o jsonb)
         JOIN sources s ON s.environment_id = $1 AND s.name = t.src`,
      [
        environmentId,
        JSON.stringify(
          deps.map((d) => ({
            f: d.from,
            t: d.to,
            s: d.strength,
            g: d.group,
            v: d.via,
            src: d.source,
            p: d.provenance ?? ["declared"],
            w: d.written ?? null,
            o:
              (d.source === sourceName
                ? origins.get(needOriginKey(d.from, d.written ?? d.to))
                : kept.get(`${d.source}\u0000${needOriginKey(d.from, d.written ?? d.to)}`)) ?? null,
          })),
        ),
      ],
    );
  }
}

/**
 * Content unchanged but inferred needs moved in the file (lines added above them): refresh their
 * positions without rewriting the graph.
 */
export async function refreshNeedOrigins(
  { sourceId, origins }: { sourceId: string; origins: NeedOrigins },
  transaction: Transaction,
): Promise<void> {
  const rows = [...origins].map(([k, o]) => {
    const [from, written] = k.split("\u0000");
    return { f: from, w: written, o };
  });
  await db().sequelize.query(
    `UPDATE dependencies d SET origin = t.o
       FROM jsonb_to_recordset($2::jsonb) AS t(f text, w text, o jsonb)
      WHERE d.source_id = $1 AND d.from_key = t.f AND COALESCE(d.written_to, d.to_key) = t.w
        AND d.origin IS DISTINCT FROM t.o`,
    { bind: [sourceId, JSON.stringify(rows)], transaction },
  );
}
