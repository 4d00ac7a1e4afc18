// Pinch-score weights per environment (DESIGN §3): read by anyone, set by architects and admins.
// Saving re-queues the analysis of the newest snapshot in the same transaction, so the stored
// scores never stay computed with weights nobody has any longer.
import "server-only";
import { db } from "@/models";
import type { Actor } from "@/lib/auth/actor";
import { roleHas } from "@/lib/auth/roles";
import { DEFAULT_PINCH_WEIGHTS, type PinchWeights } from "@/lib/analysis/types";
import { forbidden, notFound } from "@/lib/errors";
import { requeueLatestAnalysis } from "./analysis-runs";
import { recordAudit } from "./audit";

export interface WeightsView {
  weights: PinchWeights;
  /** false while the environment uses the defaults of DESIGN §3 */
  custom: boolean;
  defaults: PinchWeights;
}

export async function getWeights({ environmentId }: { environmentId: string }): Promise<WeightsView> {
  const env = await db().models.Environment.findByPk(environmentId);
  if (!env) throw notFound("Environment");
  return { weights: env.pinchWeights ?? DEFAULT_PINCH_WEIGHTS, custom: env.pinchWeights !== null, defaults: DEFAULT_PINCH_WEIGHTS };
}

export async function setWeights({
  environmentId,
  weights,
  actor,
}: {
  environmentId: string;
  weights: PinchWeights;
  actor: Actor;
}): Promise<WeightsView & { requeued: { snapshot: number } | null }> {
  if (actor.type !== "user" || !roleHas(actor.role, "reviews:write")) throw forbidden("Pinch-score weights are set by architects and admins");
  const { models, sequelize } = db();
  return sequelize.transaction(async (transaction) => {
    const env = await models.Environment.findByPk(environmentId, { transaction, lock: transaction.LOCK.UPDATE });
    if (!env) throw notFound("Environment");
    const before = env.pinchWeights ?? DEFAULT_PINCH_WEIGHTS;
    const after: PinchWeights = { betweenness: weights.betweenness, reach: weights.reach, single: weights.single };
    await env.update({ pinchWeights: after }, { transaction });

    const requeued = await requeueLatestAnalysis({ environmentId }, transaction);
    await recordAudit({ actor, action: "weights.update", targetType: "environment", targetId: env.slug, environmentId, before, after: { ...after, requeued } }, transaction);
    return { weights: after, custom: true, defaults: DEFAULT_PINCH_WEIGHTS, requeued };
  });
}
