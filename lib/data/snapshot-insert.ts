// A new snapshot of an environment and its analysis job, in the caller's transaction. Shared by
// pushes and by the observed-graph step (lib/data/observed-graph.ts), which both change the graph.
import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { db } from "@/models";
import type { SnapshotContent } from "@/lib/inventory/snapshot";
import { queueAnalysis } from "./analysis-runs";

export interface SnapshotInsert {
  environmentId: string;
  number: number;
  hash: string;
  content: SnapshotContent;
  sourceName: string;
  format: string;
  actorLabel: string;
}

export async function insertSnapshot(s: SnapshotInsert, transaction: Transaction): Promise<{ id: string; number: number; createdAt: string }> {
  // A bound parameter, not Sequelize's escaped literal: the content of a large estate is megabytes.
  const [row] = await db().sequelize.query<{ id: string; number: number; created_at: Date }>(
    `INSERT INTO snapshots (id, environment_id, number, hash, content, component_count, dependency_count, undeclared_count, source_name, format, actor_label)
     VALUES (gen_random_uuid(), $1, $2, $3, $4::jsonb, $5, $6, $7, $8, $9, $10) RETURNING id, number, created_at`,
    {
      type: QueryTypes.SELECT,
      bind: [
        s.environmentId,
        s.number,
        s.hash,
        JSON.stringify(s.content),
        s.content.components.length,
        s.content.dependencies.length,
        s.content.components.filter((c) => c.kind === "undeclared").length,
        s.sourceName,
        s.format,
        s.actorLabel,
      ],
      transaction,
    },
  );
  if (!row) throw new Error("snapshot insert returned nothing");
  await queueAnalysis({ environmentId: s.environmentId, snapshotId: row.id }, transaction);
  return { id: row.id, number: row.number, createdAt: row.created_at.toISOString() };
}

export async function latestSnapshot({ environmentId }: { environmentId: string }, transaction?: Transaction): Promise<{ number: number; hash: string } | null> {
  const [latest] = await db().sequelize.query<{ number: number; hash: string }>(
    "SELECT number, hash FROM snapshots WHERE environment_id = :id ORDER BY number DESC LIMIT 1",
    { type: QueryTypes.SELECT, replacements: { id: environmentId }, transaction },
  );
  return latest ?? null;
}
