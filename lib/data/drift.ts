// Drift: what traces saw against what teams declared, for one environment.
// Two queries whatever the size of the estate: the observed rows with what we know of their ends,
// and the declared edges that no trace confirms. The declared graph stays the source of truth for
// rankings; this only points at where the inventory and the running system disagree.
import { QueryTypes } from "sequelize";
import { db } from "@/models";
import type { Strength } from "@/lib/inventory/types";

export interface ObservedSource {
  source: string;
  lastSeenAt: string;
  /** distinct from→to pairs this source's traces showed */
  edges: number;
}

export interface SeenNotDeclared {
  from: string;
  to: string;
  /**
   * Calls seen, as a lower bound: one client call often yields both a peer.service and a
   * span-parent edge, so the evidences are not added up; the largest one is taken.
   */
  count: number;
  evidence: string[];
  lastSeenAt: string;
  /** a component row exists (declared, or an undeclared placeholder), so it has a page */
  fromKnown: boolean;
  toKnown: boolean;
  /** whose file should declare the need: the source and team that declare `from`; null when no source declares it */
  declareIn: { source: string; team: string | null } | null;
}

export interface DeclaredNotSeen {
  from: string;
  to: string;
  strength: Strength;
  /** the source whose file declares the need */
  source: string;
  team: string | null;
  /** one of several alternatives (any_of): an unused alternative is expected to be absent from traces */
  anyOf: boolean;
}

export interface Drift {
  observedSources: ObservedSource[];
  seenNotDeclared: SeenNotDeclared[];
  declaredNotSeen: DeclaredNotSeen[];
  /** declared from→to pairs that some trace confirmed */
  agreeing: number;
}

interface ObservedRow {
  source: string;
  from_key: string;
  to_key: string;
  evidence: string;
  count: number;
  last_seen_at: Date;
  from_kind: string | null;
  from_team: string | null;
  from_source: string | null;
  to_kind: string | null;
  declared: boolean;
}

interface DeclaredRow {
  from_key: string;
  to_key: string;
  strength: Strength;
  source: string;
  team: string | null;
  any_of: boolean;
}

const OBSERVED_SQL = `
  SELECT s.name AS source, o.from_key, o.to_key, o.evidence, o.count, o.last_seen_at,
         fc.kind AS from_kind, fc.team AS from_team, fs.name AS from_source, tc.kind AS to_kind,
         EXISTS (SELECT 1 FROM dependencies d
                  WHERE d.environment_id = o.environment_id AND d.from_key = o.from_key AND d.to_key = o.to_key) AS declared
    FROM observed_dependencies o
    JOIN sources s ON s.id = o.source_id
    LEFT JOIN components fc ON fc.environment_id = o.environment_id AND fc.key = o.from_key
    LEFT JOIN sources fs ON fs.id = fc.source_id
    LEFT JOIN components tc ON tc.environment_id = o.environment_id AND tc.key = o.to_key
   WHERE o.environment_id = $1`;

// Only components that traces show calling something: a component no trace starts from says
// nothing about its own needs, so its declared edges are left out rather than reported as unseen.
const DECLARED_NOT_SEEN_SQL = `
  SELECT d.from_key, d.to_key, d.strength, s.name AS source, fc.team, d.group_id IS NOT NULL AS any_of
    FROM dependencies d
    JOIN sources s ON s.id = d.source_id
    LEFT JOIN components fc ON fc.environment_id = d.environment_id AND fc.key = d.from_key
   WHERE d.environment_id = $1
     AND EXISTS (SELECT 1 FROM observed_dependencies o WHERE o.environment_id = d.environment_id AND o.from_key = d.from_key)
     AND NOT EXISTS (SELECT 1 FROM observed_dependencies o
                      WHERE o.environment_id = d.environment_id AND o.from_key = d.from_key AND o.to_key = d.to_key)
   ORDER BY d.from_key, d.to_key`;

const cmp = (a: string, b: string): number => (a < b ? -1 : a > b ? 1 : 0);
const later = (a: Date, b: Date): Date => (b.getTime() > a.getTime() ? b : a);

export async function getDrift({ environmentId }: { environmentId: string }): Promise<Drift> {
  const { sequelize } = db();
  const [observed, unseen] = await Promise.all([
    sequelize.query<ObservedRow>(OBSERVED_SQL, { type: QueryTypes.SELECT, bind: [environmentId] }),
    sequelize.query<DeclaredRow>(DECLARED_NOT_SEEN_SQL, { type: QueryTypes.SELECT, bind: [environmentId] }),
  ]);

  const sources = new Map<string, { lastSeenAt: Date; pairs: Set<string> }>();
  // pair → evidence → calls summed over sources
  const pairs = new Map<string, { row: ObservedRow; lastSeenAt: Date; byEvidence: Map<string, number> }>();
  let agreeing = 0;
  for (const r of observed) {
    const pair = `${r.from_key}\u0000${r.to_key}`;
    const src = sources.get(r.source);
    if (src) {
      src.lastSeenAt = later(src.lastSeenAt, r.last_seen_at);
      src.pairs.add(pair);
    } else sources.set(r.source, { lastSeenAt: r.last_seen_at, pairs: new Set([pair]) });

    const p = pairs.get(pair);
    if (!p) {
      pairs.set(pair, { row: r, lastSeenAt: r.last_seen_at, byEvidence: new Map([[r.evidence, r.count]]) });
      if (r.declared) agreeing += 1;
    } else {
      p.lastSeenAt = later(p.lastSeenAt, r.last_seen_at);
      p.byEvidence.set(r.evidence, (p.byEvidence.get(r.evidence) ?? 0) + r.count);
    }
  }

  const seenNotDeclared: SeenNotDeclared[] = [...pairs.values()]
    .filter((p) => !p.row.declared)
    .map(({ row, lastSeenAt, byEvidence }) => ({
      from: row.from_key,
      to: row.to_key,
      count: Math.max(...byEvidence.values()),
      evidence: [...byEvidence.keys()].sort(cmp),
      lastSeenAt: lastSeenAt.toISOString(),
      fromKnown: row.from_kind !== null,
      toKnown: row.to_kind !== null,
      declareIn: row.from_source !== null ? { source: row.from_source, team: row.from_team } : null,
    }))
    .sort((a, b) => b.count - a.count || cmp(a.from, b.from) || cmp(a.to, b.to));

  return {
    observedSources: [...sources.entries()]
      .map(([source, s]) => ({ source, lastSeenAt: s.lastSeenAt.toISOString(), edges: s.pairs.size }))
      .sort((a, b) => cmp(a.source, b.source)),
    seenNotDeclared,
    declaredNotSeen: unseen.map((r) => ({ from: r.from_key, to: r.to_key, strength: r.strength, source: r.source, team: r.team, anyOf: r.any_of })),
    agreeing,
  };
}
