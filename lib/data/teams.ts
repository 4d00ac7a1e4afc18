// Teams and memberships.
import "server-only";
import { roleHas, type Role } from "@/lib/auth/roles";
import { db } from "@/models";

export interface TeamInput {
  slug: string;
  name: string;
  email: string | null;
  oncall: string | null;
  description: string | null;
}

export interface TeamSummary extends TeamInput {
  id: string;
}

/** Create or update teams by slug; returns every team given. */
export async function upsertTeams({ teams }: { teams: TeamInput[] }): Promise<TeamSummary[]> {
  const { Team } = db().models;
  const out: TeamSummary[] = [];
  for (const t of teams) {
    const [row] = await Team.upsert({ slug: t.slug, name: t.name, email: t.email, oncall: t.oncall, description: t.description }, { conflictFields: ["slug"] });
    out.push({ id: row.id, slug: row.slug, name: row.name, email: row.email, oncall: row.oncall, description: row.description });
  }
  return out;
}

export async function listTeams(): Promise<TeamSummary[]> {
  const rows = await db().models.Team.findAll({ order: [["slug", "ASC"]] });
  return rows.map((r) => ({ id: r.id, slug: r.slug, name: r.name, email: r.email, oncall: r.oncall, description: r.description }));
}

export async function addMembership({ userId, teamId, isLead }: { userId: string; teamId: string; isLead: boolean }): Promise<void> {
  await db().models.Membership.upsert({ userId, teamId, isLead }, { conflictFields: ["user_id", "team_id"] as never });
}

/** Slugs of the teams a user leads. */
export async function teamsLedBy({ userId }: { userId: string }): Promise<string[]> {
  const { Membership, Team } = db().models;
  const rows = await Membership.findAll({ where: { userId, isLead: true } });
  if (!rows.length) return [];
  const teams = await Team.findAll({ where: { id: rows.map((r) => r.teamId) } });
  return teams.map((t) => t.slug);
}

/**
 * Who may hand out ownership on a screen, with the same rule annotateComponent applies: leads claim
 * for the teams they lead, architects and admins assign any team.
 */
export async function ownerViewerFor(user: { id: string; role: Role }): Promise<{ ledTeams: string[]; assignAny: boolean; teams: Array<{ slug: string; name: string }> }> {
  const mayClaim = roleHas(user.role, "components:annotate");
  const [teams, led] = await Promise.all([listTeams(), mayClaim ? teamsLedBy({ userId: user.id }) : Promise.resolve([])]);
  return { ledTeams: led, assignAny: roleHas(user.role, "reviews:write"), teams: teams.map((t) => ({ slug: t.slug, name: t.name })) };
}
