// Per-environment settings (lib/inventory/settings.ts): read by anyone, changed by architects and
// admins. A change to what the analysis reads re-queues the newest snapshot's analysis in the same
// transaction, so stored rankings never stay computed under settings nobody has any longer.
import "server-only";
import { db } from "@/models";
import type { Actor } from "@/lib/auth/actor";
import { roleHas } from "@/lib/auth/roles";
import { forbidden, notFound } from "@/lib/errors";
import { analysisSettingsKey } from "@/lib/analysis/input";
import { EnvironmentSettingsSchema, readSettings, type EnvironmentSettings } from "@/lib/inventory/settings";
import { requeueLatestAnalysis } from "./analysis-runs";
import { recordAudit } from "./audit";

export interface SettingsView {
  settings: EnvironmentSettings;
  defaults: EnvironmentSettings;
}

const DEFAULTS = EnvironmentSettingsSchema.parse({});

export async function getEnvironmentSettings({ environmentId }: { environmentId: string }): Promise<SettingsView> {
  const env = await db().models.Environment.findByPk(environmentId, { attributes: ["settings"] });
  if (!env) throw notFound("Environment");
  return { settings: readSettings(env.settings), defaults: DEFAULTS };
}

export async function updateEnvironmentSettings({
  environmentId,
  changes,
  actor,
}: {
  environmentId: string;
  changes: Partial<EnvironmentSettings>;
  actor: Actor;
}): Promise<SettingsView & { requeued: { snapshot: number } | null }> {
  if (actor.type !== "user" || !roleHas(actor.role, "reviews:write")) throw forbidden("Environment settings are changed by architects and admins");
  const { models, sequelize } = db();
  return sequelize.transaction(async (transaction) => {
    const env = await models.Environment.findByPk(environmentId, { transaction, lock: transaction.LOCK.UPDATE });
    if (!env) throw notFound("Environment");
    const before = readSettings(env.settings);
    const after: EnvironmentSettings = { ...before, ...changes };
    await env.update({ settings: after }, { transaction });
    const requeued = analysisSettingsKey(before) === analysisSettingsKey(after) ? null : await requeueLatestAnalysis({ environmentId }, transaction);
    await recordAudit({ actor, action: "settings.update", targetType: "environment", targetId: env.slug, environmentId, before, after: { ...after, requeued } }, transaction);
    return { settings: after, defaults: DEFAULTS, requeued };
  });
}
