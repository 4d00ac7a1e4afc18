// Pinned map positions, per environment. Architects and admins arrange the whole map; a lead
// moves only the components their teams own (others' pins stay as they are).
import "server-only";
import { QueryTypes } from "sequelize";
import { db } from "@/models";
import type { Actor } from "@/lib/auth/actor";
import { roleHas } from "@/lib/auth/roles";
import { forbidden } from "@/lib/errors";
import { recordAudit } from "./audit";
import { teamsLedBy } from "./teams";

export type Positions = Record<string, { x: number; y: number }>;

export async function getPositions({ environmentId }: { environmentId: string }): Promise<Positions> {
  const rows = await db().models.MapPosition.findAll({ where: { environmentId } });
  return Object.fromEntries(rows.map((r) => [r.key, { x: r.x, y: r.y }]));
}

async function keysOwnedBy({ environmentId, teams }: { environmentId: string; teams: string[] }): Promise<Set<string>> {
  if (!teams.length) return new Set();
  const rows = await db().sequelize.query<{ key: string }>(
    `SELECT c.key FROM components c LEFT JOIN component_annotations a ON a.environment_id = c.environment_id AND a.key = c.key
      WHERE c.environment_id = :environmentId AND COALESCE(a.owner_team, c.team) IN (:teams)`,
    { type: QueryTypes.SELECT, replacements: { environmentId, teams } },
  );
  return new Set(rows.map((r) => r.key));
}

const same = (a: { x: number; y: number } | undefined, b: { x: number; y: number } | undefined) => a?.x === b?.x && a?.y === b?.y;

export async function savePositions({ environmentId, positions, actor }: { environmentId: string; positions: Positions; actor: Actor }): Promise<Positions> {
  if (actor.type !== "user") throw forbidden("Map positions are arranged by people, not tokens");
  const { sequelize, models } = db();
  return sequelize.transaction(async (transaction) => {
    // One arrangement at a time per environment.
    await sequelize.query("SELECT pg_advisory_xact_lock(hashtext('pinchpoint-map:' || :environmentId))", { replacements: { environmentId }, transaction });
    const existing = Object.fromEntries(
      (await models.MapPosition.findAll({ where: { environmentId }, transaction })).map((r) => [r.key, { x: r.x, y: r.y }]),
    );
    let next: Positions = positions;
    if (!roleHas(actor.role, "reviews:write")) {
      const own = await keysOwnedBy({ environmentId, teams: await teamsLedBy({ userId: actor.id }) });
      const moved = Object.keys(positions).filter((k) => !own.has(k) && !same(positions[k], existing[k]));
      if (moved.length) throw forbidden(`Only components your teams own can be moved: ${moved.slice(0, 5).join(", ")}${moved.length > 5 ? ", …" : ""}`);
      next = { ...Object.fromEntries(Object.entries(existing).filter(([k]) => !own.has(k))), ...Object.fromEntries(Object.entries(positions).filter(([k]) => own.has(k))) };
    }
    await models.MapPosition.destroy({ where: { environmentId }, transaction });
    await models.MapPosition.bulkCreate(
      Object.entries(next).map(([key, p]) => ({ environmentId, key, x: p.x, y: p.y, updatedBy: actor.id })),
      { transaction },
    );
    await recordAudit({ actor, action: "map.positions", targetType: "environment", targetId: environmentId, environmentId, before: { pinned: Object.keys(existing).length }, after: { pinned: Object.keys(next).length } }, transaction);
    return next;
  });
}
