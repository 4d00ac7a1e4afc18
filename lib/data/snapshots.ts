// Snapshot history and diffs between any two snapshots of an environment, and the import history.
// Both lists grow with every push: paged, sorted and filtered here.
import "server-only";
import { Op, type WhereOptions } from "sequelize";
import { db } from "@/models";
import { orderOf } from "@/lib/api/schemas/common";
import { IMPORT_LIST, SNAPSHOT_LIST, type ImportRow, type SnapshotListItem } from "@/lib/api/schemas/history";
import { diffSnapshots, type SnapshotDiff } from "@/lib/inventory/snapshot";
import { notFound } from "@/lib/errors";
import { containsPattern } from "./list-sql";

export type { SnapshotListItem };

interface ListQuery<S extends string> {
  sort: S;
  order?: "asc" | "desc";
  limit: number;
  offset: number;
  q?: string;
}

const SNAPSHOT_SORTS = { number: "number", components: "componentCount", dependencies: "dependencyCount", undeclared: "undeclaredCount" } as const;

export async function listSnapshots({
  environmentId,
  query,
}: {
  environmentId: string;
  query: ListQuery<keyof typeof SNAPSHOT_SORTS>;
}): Promise<{ total: number; limit: number; offset: number; items: SnapshotListItem[] }> {
  const { Snapshot, AnalysisRun } = db().models;
  const where: WhereOptions = query.q
    ? { environmentId, [Op.or]: [{ sourceName: { [Op.iLike]: containsPattern(query.q) } }, { actorLabel: { [Op.iLike]: containsPattern(query.q) } }] }
    : { environmentId };
  const order = orderOf(SNAPSHOT_LIST, query) === "asc" ? "ASC" : "DESC";
  const { rows, count } = await Snapshot.findAndCountAll({
    where,
    attributes: ["id", "number", "createdAt", "sourceName", "format", "actorLabel", "componentCount", "dependencyCount", "undeclaredCount"],
    order: [[SNAPSHOT_SORTS[query.sort], order], ["number", "DESC"]],
    limit: query.limit,
    offset: query.offset,
  });
  const { limit, offset } = query;
  const runs = await AnalysisRun.findAll({ where: { snapshotId: rows.map((r) => r.id) }, attributes: ["snapshotId", "status"] });
  const status = new Map(runs.map((r) => [r.snapshotId, r.status]));
  return {
    total: count,
    limit,
    offset,
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

const IMPORT_SORTS = { createdAt: "createdAt", source: "sourceName", actor: "actorLabel", format: "format" } as const;

export async function listImports({
  environmentId,
  query,
}: {
  environmentId: string;
  query: ListQuery<keyof typeof IMPORT_SORTS> & { format?: string };
}): Promise<{ total: number; limit: number; offset: number; items: ImportRow[] }> {
  const where: WhereOptions = {
    environmentId,
    ...(query.format ? { format: query.format } : {}),
    ...(query.q ? { [Op.or]: [{ sourceName: { [Op.iLike]: containsPattern(query.q) } }, { actorLabel: { [Op.iLike]: containsPattern(query.q) } }] } : {}),
  };
  const order = orderOf(IMPORT_LIST, query) === "asc" ? "ASC" : "DESC";
  const { rows, count } = await db().models.ImportRecord.findAndCountAll({
    where,
    order: [[IMPORT_SORTS[query.sort], order], ["createdAt", "DESC"], ["id", "ASC"]],
    limit: query.limit,
    offset: query.offset,
  });
  return {
    total: count,
    limit: query.limit,
    offset: query.offset,
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
