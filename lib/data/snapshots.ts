// Snapshot history and diffs between any two snapshots of an environment.
import "server-only";
import { db } from "@/models";
import { diffSnapshots, type SnapshotDiff } from "@/lib/inventory/snapshot";
import { notFound } from "@/lib/errors";

export interface SnapshotListItem {
  id: string;
  number: number;
  createdAt: string;
  source: string | null;
  format: string | null;
  actor: string | null;
  components: number;
  dependencies: number;
  undeclared: number;
  analysis: string | null;
}

export async function listSnapshots({ environmentId, limit, offset }: { environmentId: string; limit: number; offset: number }): Promise<{ total: number; items: SnapshotListItem[] }> {
  const { Snapshot, AnalysisRun } = db().models;
  const { rows, count } = await Snapshot.findAndCountAll({
    where: { environmentId },
    attributes: ["id", "number", "createdAt", "sourceName", "format", "actorLabel", "componentCount", "dependencyCount", "undeclaredCount"],
    order: [["number", "DESC"]],
    limit,
    offset,
  });
  const runs = await AnalysisRun.findAll({ where: { snapshotId: rows.map((r) => r.id) }, attributes: ["snapshotId", "status"] });
  const status = new Map(runs.map((r) => [r.snapshotId, r.status]));
  return {
    total: count,
    items: rows.map((r) => ({
      id: r.id,
      number: r.number,
      createdAt: r.createdAt.toISOString(),
      source: r.sourceName,
      format: r.format,
      actor: r.actorLabel,
      components: r.componentCount,
      dependencies: r.dependencyCount,
      undeclared: r.undeclaredCount,
      analysis: status.get(r.id) ?? null,
    })),
  };
}

export async function diffBetween({ environmentId, a, b }: { environmentId: string; a: number; b: number }): Promise<SnapshotDiff & { from: number; to: number }> {
  const { Snapshot } = db().models;
  const [sa, sb] = await Promise.all([
    Snapshot.findOne({ where: { environmentId, number: a }, attributes: ["content"] }),
    Snapshot.findOne({ where: { environmentId, number: b }, attributes: ["content"] }),
  ]);
  if (!sa) throw notFound(`Snapshot #${a}`);
  if (!sb) throw notFound(`Snapshot #${b}`);
  return { from: a, to: b, ...diffSnapshots(sa.content, sb.content) };
}

export async function listImports({ environmentId, limit, offset }: { environmentId: string; limit: number; offset: number }) {
  const { rows, count } = await db().models.ImportRecord.findAndCountAll({ where: { environmentId }, order: [["createdAt", "DESC"]], limit, offset });
  return {
    total: count,
    items: rows.map((r) => ({
      id: r.id,
      createdAt: r.createdAt.toISOString(),
      source: r.sourceName,
      format: r.format,
      actor: r.actorLabel,
      changed: r.graphChanged,
      snapshot: r.snapshotNumber,
      summary: r.summary,
      warnings: r.warnings,
    })),
  };
}
