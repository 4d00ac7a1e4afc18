// Reading the audit log: filtered by action, actor, environment, target and date range, newest first.
import "server-only";
import { QueryTypes } from "sequelize";
import { db } from "@/models";
import { orderOf } from "@/lib/api/schemas/common";
import { AUDIT_LIST, type AuditEntry, type AuditPage, type AuditQuery } from "@/lib/api/schemas/reviews";
import { containsPattern, orderSql } from "./list-sql";

export type { AuditPage };

const SORTS: Record<AuditQuery["sort"], string> = { at: "ae.created_at", action: "ae.action", actor: "ae.actor_label" };

export async function listAuditEvents(query: AuditQuery): Promise<AuditPage> {
  const where: string[] = [];
  const replacements: Record<string, unknown> = { limit: query.limit, offset: query.offset };
  if (query.action) {
    // "review" matches review.create, review.update and review.clear; a full name matches itself.
    where.push("(ae.action = :action OR ae.action LIKE :actionPrefix)");
    replacements.action = query.action;
    replacements.actionPrefix = `${query.action.replace(/[\\%_]/g, (c) => `\\${c}`)}.%`;
  }
  if (query.actor) {
    where.push("ae.actor_label ILIKE :actor");
    replacements.actor = containsPattern(query.actor);
  }
  if (query.environment) {
    where.push("e.slug = :environment");
    replacements.environment = query.environment;
  }
  if (query.target) {
    where.push("(ae.target_id ILIKE :target OR ae.target_type = :targetExact)");
    replacements.target = containsPattern(query.target);
    replacements.targetExact = query.target;
  }
  // Dates are whole UTC days, both ends included.
  if (query.from) {
    where.push("ae.created_at >= (CAST(:from AS date) + time '00:00') AT TIME ZONE 'UTC'");
    replacements.from = query.from;
  }
  if (query.to) {
    where.push("ae.created_at < ((CAST(:to AS date) + 1) + time '00:00') AT TIME ZONE 'UTC'");
    replacements.to = query.to;
  }
  const rows = await db().sequelize.query<{
    id: string;
    created_at: Date;
    actor_type: AuditEntry["actorType"];
    actor_label: string;
    action: string;
    target_type: string;
    target_id: string;
    environment: string | null;
    before: unknown;
    after: unknown;
    total: string;
  }>(
    `SELECT ae.id, ae.created_at, ae.actor_type, ae.actor_label, ae.action, ae.target_type, ae.target_id,
            e.slug AS environment, ae.before, ae.after, count(*) OVER () AS total
       FROM audit_events ae
       LEFT JOIN environments e ON e.id = ae.environment_id
      ${where.length ? `WHERE ${where.join(" AND ")}` : ""}
      ORDER BY ${orderSql(SORTS[query.sort], orderOf(AUDIT_LIST, query), "ae.created_at DESC, ae.id")}
      LIMIT :limit OFFSET :offset`,
    { type: QueryTypes.SELECT, replacements },
  );
  let total = Number(rows[0]?.total ?? 0);
  if (!rows.length && query.offset > 0) {
    // Past the end: the window count is empty, so count separately to keep the pager honest.
    const [c] = await db().sequelize.query<{ n: string }>(
      `SELECT count(*) AS n FROM audit_events ae LEFT JOIN environments e ON e.id = ae.environment_id ${where.length ? `WHERE ${where.join(" AND ")}` : ""}`,
      { type: QueryTypes.SELECT, replacements },
    );
    total = Number(c?.n ?? 0);
  }
  const actions = await db().sequelize.query<{ action: string }>("SELECT DISTINCT action FROM audit_events ORDER BY action", { type: QueryTypes.SELECT });
  return {
    total,
    limit: query.limit,
    offset: query.offset,
    items: rows.map((r) => ({
      id: r.id,
      at: r.created_at.toISOString(),
      actorType: r.actor_type,
      actorLabel: r.actor_label,
      action: r.action,
      targetType: r.target_type,
      targetId: r.target_id,
      environment: r.environment,
      before: r.before,
      after: r.after,
    })),
    actions: actions.map((a) => a.action),
  };
}
