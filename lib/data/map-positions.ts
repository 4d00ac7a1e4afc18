// Pinned map positions, per environment, replaced as a whole set by whoever arranges the map.
import { db } from "@/models";
import type { Actor } from "@/lib/auth/actor";
import { recordAudit } from "./audit";

export type Positions = Record<string, { x: number; y: number }>;

export async function getPositions({ environmentId }: { environmentId: string }): Promise<Positions> {
  const rows = await db().models.MapPosition.findAll({ where: { environmentId } });
  return Object.fromEntries(rows.map((r) => [r.key, { x: r.x, y: r.y }]));
}

export async function savePositions({ environmentId, positions, actor }: { environmentId: string; positions: Positions; actor: Actor }): Promise<Positions> {
  const { sequelize, models } = db();
  return sequelize.transaction(async (transaction) => {
    const before = await models.MapPosition.count({ where: { environmentId }, transaction });
    await models.MapPosition.destroy({ where: { environmentId }, transaction });
    await models.MapPosition.bulkCreate(
      Object.entries(positions).map(([key, p]) => ({ environmentId, key, x: p.x, y: p.y, updatedBy: actor.type === "user" ? actor.id : null })),
      { transaction },
    );
    await recordAudit({ actor, action: "map.positions", targetType: "environment", targetId: environmentId, environmentId, before: { pinned: before }, after: { pinned: Object.keys(positions).length } }, transaction);
    return positions;
  });
}
