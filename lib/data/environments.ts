// Environments: lookup and listing with their latest snapshot and analysis status.
import { QueryTypes } from "sequelize";
import { db } from "@/models";
import { notFound } from "@/lib/errors";
import { DEFAULT_PINCH_WEIGHTS, type PinchWeights } from "@/lib/analysis/types";

export interface EnvironmentRef {
  id: string;
  slug: string;
  name: string;
  pinchWeights: PinchWeights;
}

export interface EnvironmentSummary {
  id: string;
  slug: string;
  name: string;
  latestSnapshot: { number: number; createdAt: string } | null;
  analysis: { status: string; progress: number } | null;
  componentCount: number;
}

export async function findEnvironment({ slug }: { slug: string }): Promise<EnvironmentRef | null> {
  const row = await db().models.Environment.findOne({ where: { slug } });
  return row ? { id: row.id, slug: row.slug, name: row.name, pinchWeights: row.pinchWeights ?? DEFAULT_PINCH_WEIGHTS } : null;
}

export async function getEnvironmentOrThrow({ slug }: { slug: string }): Promise<EnvironmentRef> {
  const env = await findEnvironment({ slug });
  if (!env) throw notFound(`Environment "${slug}"`);
  return env;
}

export async function listEnvironments(): Promise<EnvironmentSummary[]> {
  const rows = await db().sequelize.query<{
    id: string;
    slug: string;
    name: string;
    number: number | null;
    created_at: Date | null;
    status: string | null;
    progress: number | null;
    component_count: string;
  }>(
    `SELECT e.id, e.slug, e.name, s.number, s.created_at, a.status, a.progress,
            (SELECT count(*) FROM components c WHERE c.environment_id = e.id) AS component_count
       FROM environments e
       LEFT JOIN LATERAL (SELECT id, number, created_at FROM snapshots WHERE environment_id = e.id
                          ORDER BY number DESC LIMIT 1) s ON true
       LEFT JOIN analysis_runs a ON a.snapshot_id = s.id
      ORDER BY e.slug`,
    { type: QueryTypes.SELECT },
  );
  return rows.map((r) => ({
    id: r.id,
    slug: r.slug,
    name: r.name,
    latestSnapshot: r.number !== null && r.created_at ? { number: r.number, createdAt: r.created_at.toISOString() } : null,
    analysis: r.status ? { status: r.status, progress: r.progress ?? 0 } : null,
    componentCount: Number(r.component_count),
  }));
}

export async function createEnvironment({ slug, name }: { slug: string; name?: string }): Promise<EnvironmentRef> {
  const row = await db().models.Environment.create({ slug, name: name ?? slug, pinchWeights: null });
  return { id: row.id, slug: row.slug, name: row.name, pinchWeights: DEFAULT_PINCH_WEIGHTS };
}
