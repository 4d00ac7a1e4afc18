// What the e-mail notices read (lib/mail/notices.ts decides who is told what): teams and their
// addresses, architects, the top ten by pinch score, reviews whose date has come, and the weekly
// risk digest's three lists. Each takes the notice's transaction where it has one.
import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { db } from "@/models";

export async function environmentNames({ environmentId }: { environmentId: string }, transaction: Transaction): Promise<{ slug: string; name: string }> {
  const env = await db().models.Environment.findByPk(environmentId, { transaction });
  if (!env) throw new Error(`no environment ${environmentId}`);
  return { slug: env.slug, name: env.name };
}

export async function teamContacts({ slugs }: { slugs: string[] }, transaction: Transaction): Promise<{ slug: string; name: string; email: string | null }[]> {
  if (!slugs.length) return [];
  const teams = await db().models.Team.findAll({ where: { slug: slugs }, order: [["slug", "ASC"]], transaction });
  return teams.map((t) => ({ slug: t.slug, name: t.name, email: t.email }));
}

export async function componentName({ environmentId, key }: { environmentId: string; key: string }, transaction: Transaction): Promise<string | null> {
  const component = await db().models.Component.findOne({ where: { environmentId, key }, attributes: ["name"], transaction });
  return component?.name ?? null;
}

export async function activeArchitects(transaction: Transaction): Promise<{ id: string; email: string }[]> {
  const users = await db().models.User.findAll({ where: { role: "architect", active: true }, order: [["email", "ASC"]], attributes: ["id", "email"], transaction });
  return users.map((u) => ({ id: u.id, email: u.email }));
}

export async function snapshotNumber({ environmentId, snapshotId }: { environmentId: string; snapshotId: string }, transaction: Transaction): Promise<number | null> {
  const snapshot = await db().models.Snapshot.findOne({ where: { id: snapshotId, environmentId }, attributes: ["number"], transaction });
  return snapshot?.number ?? null;
}

/** The snapshot to compare with: the one given if it was analysed, else the latest earlier one that was. */
export async function analysedBaseline(
  { environmentId, snapshotNumber, previousSnapshotId }: { environmentId: string; snapshotNumber: number; previousSnapshotId?: string | null },
  transaction: Transaction,
): Promise<string | null> {
  const { models, sequelize } = db();
  if (previousSnapshotId && (await models.ComponentMetric.count({ where: { snapshotId: previousSnapshotId }, transaction }))) return previousSnapshotId;
  const [row] = await sequelize.query<{ id: string }>(
    `SELECT s.id FROM snapshots s
      WHERE s.environment_id = :environmentId AND s.number < :snapshotNumber
        AND EXISTS (SELECT 1 FROM component_metrics m WHERE m.snapshot_id = s.id)
      ORDER BY s.number DESC LIMIT 1`,
    { type: QueryTypes.SELECT, replacements: { environmentId, snapshotNumber }, transaction },
  );
  return row?.id ?? null;
}

interface TopTenRow {
  key: string;
  name: string;
  /** 1…10, by pinch score */
  position: number;
  pinchScore: number;
  blastDown: number;
  blastDegraded: number;
  /** effective owner team slug (an owner annotation wins over the declared team), null when unowned */
  team: string | null;
}

/** The ten highest pinch scores of a snapshot, in the pinch-points screen's order (score, then key). */
export async function topTenByPinch({ environmentId, snapshotId }: { environmentId: string; snapshotId: string }, transaction: Transaction): Promise<TopTenRow[]> {
  const rows = await db().sequelize.query<{ key: string; name: string; pinch_score: number; blast_down: number; blast_degraded: number; team: string | null }>(
    `SELECT m.key, m.name, m.pinch_score, m.blast_down, m.blast_degraded, COALESCE(a.owner_team, m.team) AS team
       FROM component_metrics m
       LEFT JOIN component_annotations a ON a.environment_id = :environmentId AND a.key = m.key
      WHERE m.snapshot_id = :snapshotId
      ORDER BY m.pinch_score DESC, m.key ASC
      LIMIT 10`,
    { type: QueryTypes.SELECT, replacements: { environmentId, snapshotId }, transaction },
  );
  return rows.map((r, i) => ({ key: r.key, name: r.name, position: i + 1, pinchScore: r.pinch_score, blastDown: r.blast_down, blastDegraded: r.blast_degraded, team: r.team }));
}

interface DueReview {
  id: string;
  key: string;
  status: string;
  reviewBy: string;
  rationale: string | null;
  email: string;
  environment: { slug: string; name: string };
  componentName: string | null;
}

/**
 * Reviews whose review-by date has come (on or before `today`, a UTC calendar date) that are not
 * resolved and whose reviewer was not yet told about this date, locked for the notice's
 * transaction (two workers never take the same one).
 */
export async function takeDueReviews({ today }: { today: string }, transaction: Transaction): Promise<DueReview[]> {
  const rows = await db().sequelize.query<{ id: string; key: string; status: string; review_by: string; rationale: string | null; email: string; env_slug: string; env_name: string; component_name: string | null }>(
    `SELECT r.id, r.key, r.status::text AS status, to_char(r.review_by, 'YYYY-MM-DD') AS review_by, r.rationale,
            u.email, e.slug AS env_slug, e.name AS env_name, c.name AS component_name
       FROM risk_reviews r
       JOIN users u ON u.id = r.reviewer_id AND u.active
       JOIN environments e ON e.id = r.environment_id
       LEFT JOIN components c ON c.environment_id = r.environment_id AND c.key = r.key
      WHERE r.review_by IS NOT NULL AND r.review_by <= CAST(:today AS date)
        AND r.status::text <> 'resolved'
        AND (r.notified_at IS NULL OR r.notified_at < r.review_by)
      ORDER BY r.review_by, r.id
      LIMIT 500
        FOR UPDATE OF r SKIP LOCKED`,
    { type: QueryTypes.SELECT, replacements: { today }, transaction },
  );
  return rows.map((r) => ({
    id: r.id,
    key: r.key,
    status: r.status,
    reviewBy: r.review_by,
    rationale: r.rationale,
    email: r.email,
    environment: { slug: r.env_slug, name: r.env_name },
    componentName: r.component_name,
  }));
}

export async function markReviewsNotified({ ids, now }: { ids: string[]; now: Date }, transaction: Transaction): Promise<void> {
  if (!ids.length) return;
  await db().sequelize.query("UPDATE risk_reviews SET notified_at = :now WHERE id IN (:ids)", { replacements: { now, ids }, transaction });
}

/** How far back the weekly digest compares. */
const DIGEST_WINDOW_DAYS = 7;
const MOVERS = 5;
/** Smallest change of pinch score (0–100) worth naming; below it a "mover" is rounding. */
const MOVER_THRESHOLD = 0.1;

interface DigestSection {
  environment: { slug: string; name: string };
  snapshotNumber: number;
  baselineNumber: number | null;
  movers: { key: string; name: string; before: number; after: number; rankBefore: number | null; rankAfter: number | null }[];
  overdueReviews: { key: string; name: string; status: string; reviewBy: string; reviewer: string | null }[];
  newSinglePoints: { key: string; name: string; blastDown: number; team: string | null }[];
}

/**
 * The weekly risk digest, per environment with an analysed snapshot: the newest analysed snapshot
 * against the newest one analysed at least a week before `now` (else the oldest analysed within the
 * week); top movers by pinch score; reviews past their review-by date and not resolved; and
 * components that became single points of failure — one replica or fewer than two zones (the
 * analysis' `single_point`) and taking at least one other component down — where they were not
 * one in the baseline. With nothing to compare with, only the overdue reviews are listed.
 */
export async function riskDigestSections({ now }: { now: Date }): Promise<DigestSection[]> {
  const { sequelize } = db();
  const today = now.toISOString().slice(0, 10);
  const since = new Date(now.getTime() - DIGEST_WINDOW_DAYS * 86_400_000);
  const envs = await sequelize.query<{ id: string; slug: string; name: string; current_id: string; current_number: number; base_id: string | null; base_number: number | null }>(
    `SELECT e.id, e.slug, e.name, cur.id AS current_id, cur.number AS current_number, base.id AS base_id, base.number AS base_number
       FROM environments e
       JOIN LATERAL (SELECT s.id, s.number FROM snapshots s JOIN analysis_runs a ON a.snapshot_id = s.id AND a.status = 'done'
                      WHERE s.environment_id = e.id ORDER BY s.number DESC LIMIT 1) cur ON true
       LEFT JOIN LATERAL (
         SELECT id, number FROM (
           (SELECT s.id, s.number, 0 AS pref FROM snapshots s JOIN analysis_runs a ON a.snapshot_id = s.id AND a.status = 'done'
             WHERE s.environment_id = e.id AND s.number < cur.number AND s.created_at <= :since ORDER BY s.number DESC LIMIT 1)
           UNION ALL
           (SELECT s.id, s.number, 1 AS pref FROM snapshots s JOIN analysis_runs a ON a.snapshot_id = s.id AND a.status = 'done'
             WHERE s.environment_id = e.id AND s.number < cur.number ORDER BY s.number ASC LIMIT 1)
         ) candidates ORDER BY pref LIMIT 1) base ON true
      ORDER BY e.slug`,
    { type: QueryTypes.SELECT, replacements: { since } },
  );
  const sections: DigestSection[] = [];
  for (const env of envs) {
    const overdue = await sequelize.query<{ key: string; name: string | null; status: string; review_by: string; reviewer: string | null }>(
      `SELECT r.key, c.name, r.status::text AS status, to_char(r.review_by, 'YYYY-MM-DD') AS review_by, u.email AS reviewer
         FROM risk_reviews r
         LEFT JOIN users u ON u.id = r.reviewer_id
         LEFT JOIN components c ON c.environment_id = r.environment_id AND c.key = r.key
        WHERE r.environment_id = :env AND r.review_by < CAST(:today AS date) AND r.status::text <> 'resolved'
        ORDER BY r.review_by, r.key LIMIT 20`,
      { type: QueryTypes.SELECT, replacements: { env: env.id, today } },
    );
    const movers = env.base_id
      ? await sequelize.query<{ key: string; name: string; before: number; after: number; rank_before: number | null; rank_after: number | null }>(
          `SELECT c.key, c.name, b.pinch_score AS before, c.pinch_score AS after, b.rank_pinch AS rank_before, c.rank_pinch AS rank_after
             FROM component_metrics c JOIN component_metrics b ON b.snapshot_id = :base AND b.key = c.key
            WHERE c.snapshot_id = :cur AND abs(c.pinch_score - b.pinch_score) >= :threshold
            ORDER BY abs(c.pinch_score - b.pinch_score) DESC, c.key LIMIT :limit`,
          { type: QueryTypes.SELECT, replacements: { base: env.base_id, cur: env.current_id, threshold: MOVER_THRESHOLD, limit: MOVERS } },
        )
      : [];
    const single = env.base_id
      ? await sequelize.query<{ key: string; name: string; blast_down: number; team: string | null }>(
          `SELECT c.key, c.name, c.blast_down, COALESCE(a.owner_team, c.team) AS team
             FROM component_metrics c
             LEFT JOIN component_metrics b ON b.snapshot_id = :base AND b.key = c.key
             LEFT JOIN component_annotations a ON a.environment_id = :env AND a.key = c.key
            WHERE c.snapshot_id = :cur AND c.single_point AND c.blast_down > 0 AND c.kind <> 'undeclared'
              AND (b.key IS NULL OR NOT b.single_point OR b.blast_down = 0)
            ORDER BY c.blast_down DESC, c.key LIMIT 10`,
          { type: QueryTypes.SELECT, replacements: { base: env.base_id, cur: env.current_id, env: env.id } },
        )
      : [];
    sections.push({
      environment: { slug: env.slug, name: env.name },
      snapshotNumber: env.current_number,
      baselineNumber: env.base_number,
      movers: movers.map((m) => ({ key: m.key, name: m.name, before: m.before, after: m.after, rankBefore: m.rank_before, rankAfter: m.rank_after })),
      overdueReviews: overdue.map((r) => ({ key: r.key, name: r.name ?? r.key, status: r.status, reviewBy: r.review_by, reviewer: r.reviewer })),
      newSinglePoints: single.map((s) => ({ key: s.key, name: s.name, blastDown: s.blast_down, team: s.team })),
    });
  }
  return sections;
}
