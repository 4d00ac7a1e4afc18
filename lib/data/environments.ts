// Environments: lookup, and summaries with their latest snapshot, analysis status and counts.
import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { db } from "@/models";
import { notFound } from "@/lib/errors";
import { defaultEnvironment } from "@/lib/config";
import { DEFAULT_PINCH_WEIGHTS, type PinchWeights } from "@/lib/analysis/types";

export interface EnvironmentRef {
  id: string;
  slug: string;
  name: string;
  pinchWeights: PinchWeights;
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



export interface EnvironmentSummary {
  id: string;
  slug: string;
  name: string;
  createdAt: string;
  updatedAt: string;
  /** the environment `/` shows (PINCHPOINT_DEFAULT_ENV); it cannot be deleted */
  isDefault: boolean;
  componentCount: number;
  snapshotCount: number;
  sourceCount: number;
  /** tokens bound to this environment and not revoked: deleting the environment deletes them */
  liveTokenCount: number;
  latestSnapshot: { number: number; createdAt: string } | null;
  analysis: { status: string; progress: number } | null;
}

interface SummaryRow {
  id: string;
  slug: string;
  name: string;
  created_at: Date;
  updated_at: Date;
  number: number | null;
  snapshot_at: Date | null;
  status: string | null;
  progress: number | null;
  component_count: string;
  snapshot_count: string;
  source_count: string;
  live_token_count: string;
}

// Counts as subqueries rather than joins: joining four one-to-many tables multiplies the rows.
const SUMMARY_SQL = `
  SELECT e.id, e.slug, e.name, e.created_at, e.updated_at, s.number, s.created_at AS snapshot_at, a.status, a.progress,
         (SELECT count(*) FROM components c WHERE c.environment_id = e.id) AS component_count,
         (SELECT count(*) FROM snapshots x WHERE x.environment_id = e.id) AS snapshot_count,
         (SELECT count(*) FROM sources o WHERE o.environment_id = e.id) AS source_count,
         (SELECT count(*) FROM api_tokens t WHERE t.environment_id = e.id AND t.revoked_at IS NULL) AS live_token_count
    FROM environments e
    LEFT JOIN LATERAL (SELECT id, number, created_at FROM snapshots WHERE environment_id = e.id
                       ORDER BY number DESC LIMIT 1) s ON true
    LEFT JOIN analysis_runs a ON a.snapshot_id = s.id`;

function toSummary(r: SummaryRow): EnvironmentSummary {
  return {
    id: r.id,
    slug: r.slug,
    name: r.name,
    createdAt: r.created_at.toISOString(),
    updatedAt: r.updated_at.toISOString(),
    isDefault: r.slug === defaultEnvironment(),
    componentCount: Number(r.component_count),
    snapshotCount: Number(r.snapshot_count),
    sourceCount: Number(r.source_count),
    liveTokenCount: Number(r.live_token_count),
    latestSnapshot: r.number !== null && r.snapshot_at ? { number: r.number, createdAt: r.snapshot_at.toISOString() } : null,
    analysis: r.status ? { status: r.status, progress: r.progress ?? 0 } : null,
  };
}

export async function listEnvironments(): Promise<EnvironmentSummary[]> {
  const rows = await db().sequelize.query<SummaryRow>(`${SUMMARY_SQL} ORDER BY e.slug`, { type: QueryTypes.SELECT });
  return rows.map(toSummary);
}

export async function getEnvironmentSummaryOrThrow({ slug }: { slug: string }, transaction?: Transaction): Promise<EnvironmentSummary> {
  const [row] = await db().sequelize.query<SummaryRow>(`${SUMMARY_SQL} WHERE e.slug = :slug`, {
    type: QueryTypes.SELECT,
    replacements: { slug },
    transaction,
  });
  if (!row) throw notFound(`Environment "${slug}"`);
  return toSummary(row);
}
