// Teams as people manage them: the list with counts, one team with its members and components,
// edits (admins; leads for their own team's contact details), membership, and the unowned queue.
// Every write is audited in the same transaction.
import "server-only";
import { QueryTypes, UniqueConstraintError } from "sequelize";
import { db } from "@/models";
import type { Actor } from "@/lib/auth/actor";
import { roleHas } from "@/lib/auth/roles";
import { orderOf } from "@/lib/api/schemas/common";
import {
  LEAD_EDITABLE,
  OWNED_LIST,
  type AddMemberInput,
  type CreateTeamInput,
  type TeamComponent,
  type TeamDetail,
  type TeamMember,
  type TeamOverview,
  type TeamQuery,
  type UnownedComponent,
  type UpdateTeamInput,
} from "@/lib/api/schemas/teams";
import { AppError, forbidden, notFound } from "@/lib/errors";
import type { ComponentKind, Tier } from "@/lib/inventory/types";
import { recordAudit } from "./audit";
import { containsPattern, orderSql } from "./list-sql";
import { teamsLedBy } from "./teams";

/** A component is a team's pinch point when it is in its environment's top this many by pinch score. */
const PINCH_POINT_TOP = 10;

export type { TeamDetail, TeamOverview, UnownedComponent };

// The newest analysed snapshot of each environment, and each component's place by pinch score in it.
const SCORED_CTE = `
  served AS (
    SELECT DISTINCT ON (s.environment_id) s.environment_id, s.id AS snapshot_id
      FROM snapshots s JOIN analysis_runs r ON r.snapshot_id = s.id AND r.status = 'done'
     ORDER BY s.environment_id, s.number DESC),
  scored AS (
    SELECT sv.environment_id, m.key, m.pinch_score, m.rank, m.rank_pinch AS pinch_rank
      FROM served sv JOIN component_metrics m ON m.snapshot_id = sv.snapshot_id)`;

interface ComponentRow {
  environment: string;
  key: string;
  name: string;
  kind: ComponentKind;
  tier: number;
  team: string | null;
  pinch_score: number | null;
  rank: number | null;
  pinch_rank: string | null;
}

const OWNED_SORTS: Record<TeamQuery["sort"], string> = {
  pinchScore: "sc.pinch_score",
  key: "c.key",
  environment: "e.slug",
  tier: "c.tier",
  kind: "c.kind::text",
};

/** Components matching `where`, over every environment, one page of them in the list's order. */
async function ownedComponents(
  where: string[],
  replacements: Record<string, unknown>,
  query: Pick<TeamQuery, "sort" | "order" | "limit" | "offset" | "environment" | "q">,
): Promise<{ total: number; rows: ComponentRow[] }> {
  const all = [...where];
  if (query.environment) all.push("e.slug = :environment");
  if (query.q) all.push("(c.key ILIKE :q OR c.name ILIKE :q)");
  const rows = await db().sequelize.query<ComponentRow & { total: string }>(
    `WITH ${SCORED_CTE}
     SELECT count(*) OVER () AS total, e.slug AS environment, c.key, c.name, c.kind, c.tier, COALESCE(a.owner_team, c.team) AS team,
            sc.pinch_score, sc.rank, sc.pinch_rank
       FROM components c
       JOIN environments e ON e.id = c.environment_id
       LEFT JOIN component_annotations a ON a.environment_id = c.environment_id AND a.key = c.key
       LEFT JOIN scored sc ON sc.environment_id = c.environment_id AND sc.key = c.key
      WHERE ${all.join(" AND ")}
      ORDER BY ${orderSql(OWNED_SORTS[query.sort], orderOf(OWNED_LIST, query), "e.slug, c.key")}
      LIMIT :limit OFFSET :offset`,
    {
      type: QueryTypes.SELECT,
      replacements: { ...replacements, top: PINCH_POINT_TOP, environment: query.environment, q: query.q ? containsPattern(query.q) : undefined, limit: query.limit, offset: query.offset },
    },
  );
  return { total: Number(rows[0]?.total ?? 0), rows };
}

const toComponent = (r: ComponentRow): TeamComponent => {
  const pinchRank = r.pinch_rank === null ? null : Number(r.pinch_rank);
  return {
    environment: r.environment,
    key: r.key,
    name: r.name,
    kind: r.kind,
    tier: r.tier as Tier,
    pinchScore: r.pinch_score,
    rank: r.rank,
    pinchRank,
    pinchPoint: pinchRank !== null && pinchRank <= PINCH_POINT_TOP,
  };
};

export async function listTeamOverview(): Promise<{ items: TeamOverview[]; unownedCount: number }> {
  const rows = await db().sequelize.query<{
    slug: string;
    name: string;
    email: string | null;
    oncall: string | null;
    description: string | null;
    member_count: string;
    lead_count: string;
    component_count: string;
    pinch_point_count: string;
  }>(
    `WITH ${SCORED_CTE},
     owned AS (
       SELECT COALESCE(a.owner_team, c.team) AS team, sc.pinch_rank
         FROM components c
         LEFT JOIN component_annotations a ON a.environment_id = c.environment_id AND a.key = c.key
         LEFT JOIN scored sc ON sc.environment_id = c.environment_id AND sc.key = c.key)
     SELECT t.slug, t.name, t.email, t.oncall, t.description,
            (SELECT count(*) FROM memberships m WHERE m.team_id = t.id) AS member_count,
            (SELECT count(*) FROM memberships m WHERE m.team_id = t.id AND m.is_lead) AS lead_count,
            (SELECT count(*) FROM owned o WHERE o.team = t.slug) AS component_count,
            (SELECT count(*) FROM owned o WHERE o.team = t.slug AND o.pinch_rank <= :top) AS pinch_point_count
       FROM teams t
      ORDER BY t.slug`,
    { type: QueryTypes.SELECT, replacements: { top: PINCH_POINT_TOP } },
  );
  const [unowned] = await db().sequelize.query<{ n: string }>(
    `SELECT count(*) AS n FROM components c
       LEFT JOIN component_annotations a ON a.environment_id = c.environment_id AND a.key = c.key
      WHERE COALESCE(a.owner_team, c.team) IS NULL AND c.kind <> 'undeclared'`,
    { type: QueryTypes.SELECT },
  );
  return {
    items: rows.map((r) => ({
      slug: r.slug,
      name: r.name,
      email: r.email,
      oncall: r.oncall,
      description: r.description,
      memberCount: Number(r.member_count),
      leadCount: Number(r.lead_count),
      componentCount: Number(r.component_count),
      pinchPointCount: Number(r.pinch_point_count),
    })),
    unownedCount: Number(unowned?.n ?? 0),
  };
}

/** A team with its people, its pinch points, and one page of its components (they grow with the estate). */
export async function getTeamDetail({ slug, query }: { slug: string; query: TeamQuery }): Promise<TeamDetail> {
  const { models } = db();
  const team = await models.Team.findOne({ where: { slug } });
  if (!team) throw notFound(`Team "${slug}"`);
  const members = await db().sequelize.query<{ user_id: string; name: string; email: string; role: string; is_lead: boolean }>(
    `SELECT u.id AS user_id, u.name, u.email, u.role, m.is_lead
       FROM memberships m JOIN users u ON u.id = m.user_id
      WHERE m.team_id = :teamId
      ORDER BY m.is_lead DESC, u.name`,
    { type: QueryTypes.SELECT, replacements: { teamId: team.id } },
  );
  const owned = ["COALESCE(a.owner_team, c.team) = :slug"];
  const [page, top] = await Promise.all([
    ownedComponents(owned, { slug }, query),
    // At most PINCH_POINT_TOP per environment, so the list stays short whatever the team owns.
    ownedComponents([...owned, "sc.pinch_rank <= :top"], { slug }, { sort: "pinchScore", limit: 1000, offset: 0 }),
  ]);
  const members_: TeamMember[] = members.map((m) => ({ userId: m.user_id, name: m.name, email: m.email, role: m.role, isLead: m.is_lead }));
  return {
    id: team.id,
    slug: team.slug,
    name: team.name,
    email: team.email,
    oncall: team.oncall,
    description: team.description,
    members: members_,
    pinchPoints: top.rows.map(toComponent),
    components: { total: page.total, limit: query.limit, offset: query.offset, items: page.rows.map(toComponent) },
  };
}

/** Components nobody owns, in every environment (or one), one page of them, most pinching first by default. */
export async function listUnowned(query: TeamQuery): Promise<{ total: number; limit: number; offset: number; items: UnownedComponent[] }> {
  const { total, rows } = await ownedComponents(["COALESCE(a.owner_team, c.team) IS NULL", "c.kind <> 'undeclared'"], {}, query);
  return { total, limit: query.limit, offset: query.offset, items: rows.map(toComponent) };
}

type TeamRecord = { slug: string; name: string; email: string | null; oncall: string | null; description: string | null };
const teamRecord = (t: TeamRecord): TeamRecord => ({ slug: t.slug, name: t.name, email: t.email, oncall: t.oncall, description: t.description });

function requireUserActor(actor: Actor): Extract<Actor, { type: "user" }> {
  if (actor.type !== "user") throw forbidden("Teams are managed by people, not tokens");
  return actor;
}

export async function createTeam({ input, actor }: { input: CreateTeamInput; actor: Actor }): Promise<TeamRecord> {
  const user = requireUserActor(actor);
  if (!roleHas(user.role, "admin")) throw forbidden("Only admins create teams");
  const { models, sequelize } = db();
  try {
    return await sequelize.transaction(async (transaction) => {
      const row = await models.Team.create(
        { slug: input.slug, name: input.name, email: input.email ?? null, oncall: input.oncall ?? null, description: input.description ?? null },
        { transaction },
      );
      const after = teamRecord(row);
      await recordAudit({ actor, action: "team.create", targetType: "team", targetId: row.slug, after }, transaction);
      return after;
    });
  } catch (error) {
    if (error instanceof UniqueConstraintError) throw new AppError("conflict", `A team "${input.slug}" already exists`);
    throw error;
  }
}

export async function updateTeam({ slug, input, actor }: { slug: string; input: UpdateTeamInput; actor: Actor }): Promise<TeamRecord> {
  const user = requireUserActor(actor);
  const { models, sequelize } = db();
  const team = await models.Team.findOne({ where: { slug } });
  if (!team) throw notFound(`Team "${slug}"`);
  if (!roleHas(user.role, "admin")) {
    const led = await teamsLedBy({ userId: user.id });
    if (!led.includes(slug)) throw forbidden(`Only a lead of "${slug}" or an admin may edit this team`);
    const adminOnly = Object.entries(input).filter(([field, value]) => value !== undefined && !(LEAD_EDITABLE as readonly string[]).includes(field));
    if (adminOnly.length) throw forbidden(`A lead may change the e-mail, on-call contact and description; ${adminOnly.map(([f]) => f).join(", ")} is for admins`);
  }
  return sequelize.transaction(async (transaction) => {
    await team.reload({ transaction, lock: transaction.LOCK.UPDATE });
    const before = teamRecord(team);
    const changes: Partial<TeamRecord> = {};
    if (input.name !== undefined) changes.name = input.name;
    if (input.email !== undefined) changes.email = input.email;
    if (input.oncall !== undefined) changes.oncall = input.oncall;
    if (input.description !== undefined) changes.description = input.description;
    await team.update(changes, { transaction });
    const after = teamRecord(team);
    await recordAudit({ actor, action: "team.update", targetType: "team", targetId: slug, before, after }, transaction);
    return after;
  });
}

export async function addTeamMember({ slug, input, actor }: { slug: string; input: AddMemberInput; actor: Actor }): Promise<TeamMember> {
  const user = requireUserActor(actor);
  if (!roleHas(user.role, "admin")) throw forbidden("Only admins change who is in a team");
  const { models, sequelize } = db();
  const team = await models.Team.findOne({ where: { slug } });
  if (!team) throw notFound(`Team "${slug}"`);
  const member = await models.User.findOne({ where: { email: input.email } });
  if (!member) throw new AppError("invalid_request", `No user with the e-mail ${input.email}`, [{ path: "email", message: "no such user" }]);
  return sequelize.transaction(async (transaction) => {
    const existing = await models.Membership.findOne({ where: { userId: member.id, teamId: team.id }, transaction, lock: transaction.LOCK.UPDATE });
    const before = existing ? { email: member.email, lead: existing.isLead } : null;
    if (existing) await existing.update({ isLead: input.lead }, { transaction });
    else await models.Membership.create({ userId: member.id, teamId: team.id, isLead: input.lead }, { transaction });
    const after = { email: member.email, lead: input.lead };
    await recordAudit({ actor, action: existing ? "team.member.update" : "team.member.add", targetType: "team", targetId: slug, before, after }, transaction);
    return { userId: member.id, name: member.name, email: member.email, role: member.role, isLead: input.lead };
  });
}

export async function removeTeamMember({ slug, userId, actor }: { slug: string; userId: string; actor: Actor }): Promise<{ removed: true }> {
  const user = requireUserActor(actor);
  if (!roleHas(user.role, "admin")) throw forbidden("Only admins change who is in a team");
  const { models, sequelize } = db();
  const team = await models.Team.findOne({ where: { slug } });
  if (!team) throw notFound(`Team "${slug}"`);
  return sequelize.transaction(async (transaction) => {
    const existing = await models.Membership.findOne({ where: { userId, teamId: team.id }, transaction, lock: transaction.LOCK.UPDATE });
    if (!existing) throw notFound("Membership");
    const member = await models.User.findByPk(userId, { transaction });
    await existing.destroy({ transaction });
    await recordAudit(
      { actor, action: "team.member.remove", targetType: "team", targetId: slug, before: { email: member?.email ?? userId, lead: existing.isLead }, after: null },
      transaction,
    );
    return { removed: true as const };
  });
}
