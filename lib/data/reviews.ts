// Risk reviews: an architect's current decision about a pinch point (accepted, being mitigated,
// resolved), with a rationale and a date to look again. One row per component; each change is
// an audit event with before and after, which is the review's history.
import "server-only";
import { QueryTypes } from "sequelize";
import { db } from "@/models";
import type { ReviewStatus } from "@/lib/review-status";
import type { Actor } from "@/lib/auth/actor";
import { roleHas } from "@/lib/auth/roles";
import type { ReviewInput } from "@/lib/api/schemas/reviews";
import { forbidden, notFound } from "@/lib/errors";
import { recordAudit, lockKey } from "./audit";

/** What a badge beside a component needs. */
export interface ReviewSummary {
  status: ReviewStatus;
  reviewBy: string | null;
  overdue: boolean;
}

export interface ReviewView extends ReviewSummary {
  environment: string;
  key: string;
  /** display name of the component, null when it is no longer declared */
  name: string | null;
  rationale: string;
  reviewer: { id: string; name: string; email: string } | null;
  notifiedAt: string | null;
  createdAt: string;
  updatedAt: string;
}

// "Overdue" is judged by the UTC calendar day, the same day the API validates review-by dates against.
const OVERDUE_SQL = `(r.status <> 'resolved' AND r.review_by < (now() AT TIME ZONE 'UTC')::date)`;

interface Row {
  environment: string;
  key: string;
  name: string | null;
  status: ReviewStatus;
  rationale: string;
  review_by: string | null;
  overdue: boolean;
  reviewer_id: string | null;
  reviewer_name: string | null;
  reviewer_email: string | null;
  notified_at: Date | null;
  created_at: Date;
  updated_at: Date;
}

const SELECT = `SELECT e.slug AS environment, r.key, c.name, r.status, r.rationale, to_char(r.review_by, 'YYYY-MM-DD') AS review_by,
                       ${OVERDUE_SQL} AS overdue, r.reviewer_id, u.name AS reviewer_name, u.email AS reviewer_email,
                       r.notified_at, r.created_at, r.updated_at
                  FROM risk_reviews r
                  JOIN environments e ON e.id = r.environment_id
                  LEFT JOIN components c ON c.environment_id = r.environment_id AND c.key = r.key
                  LEFT JOIN users u ON u.id = r.reviewer_id`;

const toView = (r: Row): ReviewView => ({
  environment: r.environment,
  key: r.key,
  name: r.name,
  status: r.status,
  rationale: r.rationale,
  reviewBy: r.review_by,
  overdue: r.overdue,
  reviewer: r.reviewer_id && r.reviewer_email ? { id: r.reviewer_id, name: r.reviewer_name ?? r.reviewer_email, email: r.reviewer_email } : null,
  notifiedAt: r.notified_at?.toISOString() ?? null,
  createdAt: r.created_at.toISOString(),
  updatedAt: r.updated_at.toISOString(),
});

// Most urgent first: overdue, then the nearest date, resolved last.
const ORDER = `ORDER BY ${OVERDUE_SQL} DESC, (r.status = 'resolved'), r.review_by NULLS LAST, r.key`;

export async function listReviews({ environmentId, overdue = false }: { environmentId: string; overdue?: boolean }): Promise<ReviewView[]> {
  const rows = await db().sequelize.query<Row>(`${SELECT} WHERE r.environment_id = :environmentId ${overdue ? `AND ${OVERDUE_SQL}` : ""} ${ORDER}`, {
    type: QueryTypes.SELECT,
    replacements: { environmentId },
  });
  return rows.map(toView);
}

/** Overdue reviews in every environment (the panel on /teams). */
export async function listOverdueReviews(): Promise<ReviewView[]> {
  const rows = await db().sequelize.query<Row>(`${SELECT} WHERE ${OVERDUE_SQL} ${ORDER}`, { type: QueryTypes.SELECT });
  return rows.map(toView);
}

/** Every review of an environment by component key, for screens that place a badge beside components. */
export async function reviewsByKey({ environmentId }: { environmentId: string }): Promise<Record<string, ReviewSummary>> {
  const rows = await db().sequelize.query<{ key: string; status: ReviewStatus; review_by: string | null; overdue: boolean }>(
    `SELECT r.key, r.status, to_char(r.review_by, 'YYYY-MM-DD') AS review_by, ${OVERDUE_SQL} AS overdue
       FROM risk_reviews r WHERE r.environment_id = :environmentId`,
    { type: QueryTypes.SELECT, replacements: { environmentId } },
  );
  return Object.fromEntries(rows.map((r) => [r.key, { status: r.status, reviewBy: r.review_by, overdue: r.overdue }]));
}

type Snapshot = { status: ReviewStatus; rationale: string; reviewBy: string | null; reviewer: string | null };

function requireReviewer(actor: Actor): Extract<Actor, { type: "user" }> {
  // Tokens carry no role, and a review names the person who made it.
  if (actor.type !== "user") throw forbidden("Risk reviews are made by people, not tokens");
  if (!roleHas(actor.role, "reviews:write")) throw forbidden("Risk reviews are for architects and admins");
  return actor;
}

export async function putReview({
  environmentId,
  key,
  input,
  actor,
}: {
  environmentId: string;
  key: string;
  input: ReviewInput;
  actor: Actor;
}): Promise<ReviewView> {
  const user = requireReviewer(actor);
  const { models, sequelize } = db();
  const component = await models.Component.findOne({ where: { environmentId, key } });
  if (!component) throw notFound(`Component "${key}"`);
  const reviewBy = input.reviewBy ?? null;
  await sequelize.transaction(async (transaction) => {
    await lockKey({ scope: "review", environmentId, key }, transaction);
    const existing = await models.RiskReview.findOne({ where: { environmentId, key }, transaction, lock: transaction.LOCK.UPDATE });
    const before: Snapshot | null = existing
      ? { status: existing.status, rationale: existing.rationale, reviewBy: existing.reviewBy, reviewer: await reviewerEmail(existing.reviewerId) }
      : null;
    // A new date is a new promise: the reminder for it has not been sent yet.
    const notifiedAt = existing && existing.reviewBy === reviewBy && existing.status === input.status ? existing.notifiedAt : null;
    if (existing) await existing.update({ status: input.status, rationale: input.rationale, reviewBy, reviewerId: user.id, notifiedAt }, { transaction });
    else await models.RiskReview.create({ environmentId, key, status: input.status, rationale: input.rationale, reviewBy, reviewerId: user.id, notifiedAt: null }, { transaction });
    const after: Snapshot = { status: input.status, rationale: input.rationale, reviewBy, reviewer: user.email };
    await recordAudit({ actor, action: existing ? "review.update" : "review.create", targetType: "component", targetId: key, environmentId, before, after }, transaction);
  });
  const [row] = await db().sequelize.query<Row>(`${SELECT} WHERE r.environment_id = :environmentId AND r.key = :key`, {
    type: QueryTypes.SELECT,
    replacements: { environmentId, key },
  });
  if (!row) throw notFound(`Review of "${key}"`);
  return toView(row);
}

export async function clearReview({ environmentId, key, actor }: { environmentId: string; key: string; actor: Actor }): Promise<{ cleared: true }> {
  requireReviewer(actor);
  const { models, sequelize } = db();
  return sequelize.transaction(async (transaction) => {
    await lockKey({ scope: "review", environmentId, key }, transaction);
    const existing = await models.RiskReview.findOne({ where: { environmentId, key }, transaction, lock: transaction.LOCK.UPDATE });
    if (!existing) throw notFound(`Review of "${key}"`);
    const before: Snapshot = { status: existing.status, rationale: existing.rationale, reviewBy: existing.reviewBy, reviewer: await reviewerEmail(existing.reviewerId) };
    await existing.destroy({ transaction });
    await recordAudit({ actor, action: "review.clear", targetType: "component", targetId: key, environmentId, before, after: null }, transaction);
    return { cleared: true as const };
  });
}

async function reviewerEmail(id: string | null): Promise<string | null> {
  if (!id) return null;
  const user = await db().models.User.findByPk(id);
  return user?.email ?? null;
}
