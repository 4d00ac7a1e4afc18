// Who may replace a source. A push replaces everything its source declared (DESIGN §1), so pushing
// an empty file empties the source. The rule: a source whose components name teams belongs to those
// teams; it may be replaced by a member (lead or not) of one of them, by an architect or an admin.
// A new source, or one whose components name no team, is open to anyone who may push. An API token
// is judged as its creator is today (lib/auth/actor.ts: a token never does more than its creator).
import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { db } from "@/models";
import type { Actor } from "@/lib/auth/actor";
import { roleHas, type Role } from "@/lib/auth/roles";
import { forbidden } from "@/lib/errors";
import type { SnapshotContent } from "@/lib/inventory/snapshot";
import type { SystemActor } from "./audit";

/** The teams a source's current components name, sorted. */
function owningTeams(content: SnapshotContent, source: string): string[] {
  const teams = new Set<string>();
  for (const c of content.components) if (c.source === source && c.team) teams.add(c.team);
  return [...teams].sort();
}

async function teamsOf(userId: string, transaction?: Transaction): Promise<string[]> {
  const rows = await db().sequelize.query<{ slug: string }>(
    "SELECT t.slug FROM memberships m JOIN teams t ON t.id = m.team_id WHERE m.user_id = :userId",
    { type: QueryTypes.SELECT, replacements: { userId }, transaction },
  );
  return rows.map((r) => r.slug);
}

export async function checkMayReplaceSource(
  { actor, source, current }: { actor: Actor | SystemActor; source: string; current: SnapshotContent },
  transaction?: Transaction,
): Promise<void> {
  if (actor.type === "system") return;
  const owners = owningTeams(current, source);
  if (owners.length === 0) return;
  const who: { id: string; role: Role; label: string } =
    actor.type === "user" ? { id: actor.id, role: actor.role, label: actor.email } : { id: actor.creator.id, role: actor.creator.role, label: `${actor.label}, created by ${actor.creator.email}` };
  // Architects and admins look after the whole estate.
  if (roleHas(who.role, "reviews:write")) return;
  const mine = await teamsOf(who.id, transaction);
  if (owners.some((t) => mine.includes(t))) return;
  throw forbidden(
    `Source "${source}" declares components of ${owners.map((t) => `"${t}"`).join(", ")}; a push replaces all of it, so only members of ${owners.length > 1 ? "those teams" : "that team"}, architects and admins may push it (${who.label} is not a member)`,
  );
}
