// When Pinchpoint sends e-mail: one function per trigger. Each reads what it needs, renders and
// queues (outbox.ts); none sends, and none lets a mail problem fail the caller: errors are logged,
// and inside a caller's transaction the notice runs in a savepoint so its failure rolls back only
// the notice, never the change it announces.
import { QueryTypes, type Transaction } from "sequelize";
import { db } from "@/models";
import { appUrl } from "@/lib/config";
import { enqueueMail } from "./outbox";
import type { TopTenEntry } from "./templates";

async function guarded(label: string, transaction: Transaction | undefined, work: (t: Transaction) => Promise<number>): Promise<number> {
  try {
    // With a parent this is a savepoint (Sequelize nests transactions that way); without one, a
    // transaction of its own, so a notice's several messages are queued together or not at all.
    return await db().sequelize.transaction(transaction ? { transaction } : {}, work);
  } catch (error) {
    console.error(`[mail] ${label}: nothing queued:`, error instanceof Error ? error.message : error);
    return 0;
  }
}

async function environmentOf(environmentId: string, transaction: Transaction) {
  const env = await db().models.Environment.findByPk(environmentId, { transaction });
  if (!env) throw new Error(`no environment ${environmentId}`);
  return { slug: env.slug, name: env.name };
}

/**
 * An owner was assigned: tell the new owner team at its address. `team` null (owner removed)
 * sends nothing. Returns the number of messages queued.
 */
export function noticeOwnerAssigned(
  { environmentId, key, team, actorLabel }: { environmentId: string; key: string; team: string | null; actorLabel: string },
  transaction?: Transaction,
): Promise<number> {
  if (!team) return Promise.resolve(0);
  return guarded("owner assigned", transaction, async (t) => {
    const { models } = db();
    const teamRow = await models.Team.findOne({ where: { slug: team }, transaction: t });
    if (!teamRow?.email) {
      console.warn(`[mail] owner assigned: team ${team} has no e-mail address, nobody told`);
      return 0;
    }
    const component = await models.Component.findOne({ where: { environmentId, key }, transaction: t });
    const id = await enqueueMail(
      {
        to: [teamRow.email],
        template: "ownerAssigned",
        data: {
          environment: await environmentOf(environmentId, t),
          component: { key, name: component?.name ?? key },
          team: { slug: teamRow.slug, name: teamRow.name },
          actorLabel,
        },
      },
      t,
    );
    return id ? 1 : 0;
  });
}

const TOP = 10;

async function topTen(environmentId: string, snapshotId: string, transaction: Transaction): Promise<TopTenEntry[]> {
  const { models } = db();
  // Same order as the pinch-points screen sorted by pinch score: score, then key for ties.
  const rows = await models.ComponentMetric.findAll({
    where: { snapshotId },
    order: [["pinchScore", "DESC"], ["key", "ASC"]],
    limit: TOP,
    transaction,
  });
  if (!rows.length) return [];
  const annotations = await models.ComponentAnnotation.findAll({ where: { environmentId, key: rows.map((r) => r.key) }, transaction });
  const owner = new Map(annotations.map((a) => [a.key, a.ownerTeam]));
  return rows.map((r, i) => ({
    key: r.key,
    name: r.name,
    position: i + 1,
    pinchScore: r.pinchScore,
    blastDown: r.blastDown,
    blastDegraded: r.blastDegraded,
    team: owner.get(r.key) ?? r.team,
  }));
}

/** The snapshot to compare with: the one given if it was analysed, else the latest earlier one that was. */
async function baseline(environmentId: string, snapshotNumber: number, previousSnapshotId: string | null | undefined, transaction: Transaction): Promise<string | null> {
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

/**
 * After an analysis: components that entered the environment's top ten by pinch score since the
 * previous analysed snapshot. Each owning team gets one message listing its newcomers; each
 * architect gets one listing all of them. The first analysed snapshot of an environment sends
 * nothing (everything would be "new"), and a retried analysis does not send twice.
 */
export function noticeTopTenChanges({ environmentId, snapshotId, previousSnapshotId }: { environmentId: string; snapshotId: string; previousSnapshotId?: string | null }): Promise<number> {
  return guarded("top-ten changes", undefined, async (t) => {
    const { models } = db();
    const snapshot = await models.Snapshot.findOne({ where: { id: snapshotId, environmentId }, transaction: t });
    if (!snapshot) throw new Error(`snapshot ${snapshotId} is not in environment ${environmentId}`);
    const previousId = await baseline(environmentId, snapshot.number, previousSnapshotId, t);
    if (!previousId) return 0;
    const [current, previous] = await Promise.all([topTen(environmentId, snapshotId, t), topTen(environmentId, previousId, t)]);
    const before = new Set(previous.map((e) => e.key));
    const newcomers = current.filter((e) => !before.has(e.key));
    if (!newcomers.length) return 0;

    const environment = await environmentOf(environmentId, t);
    let queued = 0;
    const byTeam = new Map<string, TopTenEntry[]>();
    for (const e of newcomers) if (e.team) byTeam.set(e.team, [...(byTeam.get(e.team) ?? []), e]);
    const teams = byTeam.size ? await models.Team.findAll({ where: { slug: [...byTeam.keys()] }, transaction: t }) : [];
    for (const team of teams) {
      const entries = byTeam.get(team.slug) ?? [];
      if (!team.email) {
        console.warn(`[mail] top-ten changes: team ${team.slug} has no e-mail address, not told about ${entries.map((e) => e.key).join(", ")}`);
        continue;
      }
      const id = await enqueueMail(
        {
          to: [team.email],
          template: "newTopTen",
          data: { environment, snapshotNumber: snapshot.number, audience: { kind: "team", teamName: team.name }, entries },
          dedupeKey: `top-ten:${snapshotId}:team:${team.slug}`,
        },
        t,
      );
      if (id) queued++;
    }
    const architects = await models.User.findAll({ where: { role: "architect", active: true }, order: [["email", "ASC"]], transaction: t });
    for (const user of architects) {
      const id = await enqueueMail(
        {
          to: [user.email],
          template: "newTopTen",
          data: { environment, snapshotNumber: snapshot.number, audience: { kind: "architects" }, entries: newcomers },
          dedupeKey: `top-ten:${snapshotId}:user:${user.id}`,
        },
        t,
      );
      if (id) queued++;
    }
    return queued;
  });
}

const REVIEW_COLUMNS = ["id", "environment_id", "key", "status", "review_by", "reviewer_id", "notified_at"] as const;

/** Which columns risk_reviews has, or null while the table does not exist. */
async function reviewColumns(transaction: Transaction): Promise<Set<string> | null> {
  const rows = await db().sequelize.query<{ column_name: string }>(
    `SELECT column_name FROM information_schema.columns WHERE table_schema = current_schema() AND table_name = 'risk_reviews'`,
    { type: QueryTypes.SELECT, transaction },
  );
  return rows.length ? new Set(rows.map((r) => r.column_name)) : null;
}

let warnedReviewShape = false;

/**
 * Reviews whose review-by date has come (today, UTC, or earlier) and that are not resolved: tell
 * the reviewer once per date. `notified_at` records it; a review whose date moves later is told
 * again when the new date comes (notified_at is then before it). Call it periodically.
 */
export function noticeReviewsDue({ now = new Date() }: { now?: Date } = {}): Promise<number> {
  return guarded("reviews due", undefined, async (t) => {
    const columns = await reviewColumns(t);
    if (!columns) return 0;
    const missing = REVIEW_COLUMNS.filter((c) => !columns.has(c));
    if (missing.length) {
      if (!warnedReviewShape) console.warn(`[mail] reviews due: risk_reviews lacks ${missing.join(", ")}; no reminders sent`);
      warnedReviewShape = true;
      return 0;
    }
    const today = now.toISOString().slice(0, 10);
    const rows = await db().sequelize.query<{
      id: string;
      key: string;
      status: string;
      review_by: string;
      rationale: string | null;
      email: string;
      env_slug: string;
      env_name: string;
      component_name: string | null;
    }>(
      `SELECT r.id, r.key, r.status::text AS status, to_char(r.review_by, 'YYYY-MM-DD') AS review_by,
              ${columns.has("rationale") ? "r.rationale::text" : "NULL::text"} AS rationale,
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
      { type: QueryTypes.SELECT, replacements: { today }, transaction: t },
    );
    let queued = 0;
    for (const r of rows) {
      const id = await enqueueMail(
        {
          to: [r.email],
          template: "reviewDue",
          data: {
            environment: { slug: r.env_slug, name: r.env_name },
            component: { key: r.key, name: r.component_name ?? r.key },
            status: r.status,
            reviewBy: r.review_by,
            overdue: r.review_by < today,
            rationale: r.rationale,
          },
          dedupeKey: `review-due:${r.id}:${r.review_by}`,
        },
        t,
      );
      if (id) queued++;
    }
    if (rows.length) {
      await db().sequelize.query(`UPDATE risk_reviews SET notified_at = :now WHERE id IN (:ids)`, {
        replacements: { now, ids: rows.map((r) => r.id) },
        transaction: t,
      });
    }
    return queued;
  });
}

/**
 * An invitation with a one-time link. A relative link ("/invite/…") is made absolute with
 * NEXTAUTH_URL. Pass the transaction that creates the invite so a failed invite sends nothing.
 */
export function noticeInvite(
  { email, link, invitedBy, expiresAt }: { email: string; link: string; invitedBy?: string | null; expiresAt?: Date | null },
  transaction?: Transaction,
): Promise<number> {
  return guarded("invite", transaction, async (t) => {
    const absolute = new URL(link, `${appUrl().replace(/\/+$/, "")}/`).toString();
    const id = await enqueueMail({ to: [email], template: "invite", data: { link: absolute, invitedBy: invitedBy ?? null, expiresAt: expiresAt ?? null } }, t);
    return id ? 1 : 0;
  });
}

