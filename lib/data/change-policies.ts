// Change policies per environment (lib/impact/policies.ts): read by anyone, set by architects and
// admins, every change audited in its transaction. They decide what the impact of a push reports
// as failing and which failures refuse a push.
import "server-only";
import type { Transaction } from "sequelize";
import { db } from "@/models";
import type { Actor } from "@/lib/auth/actor";
import { roleHas } from "@/lib/auth/roles";
import { forbidden, notFound } from "@/lib/errors";
import { DEFAULT_POLICIES, readPolicies, type PolicySet } from "@/lib/impact/policies";
import { recordAudit } from "./audit";

export interface PoliciesView {
  policies: PolicySet;
  defaults: PolicySet;
  /** false while the environment uses the defaults */
  custom: boolean;
  updatedAt: string | null;
}

export async function readEnvironmentPolicies({ environmentId }: { environmentId: string }, transaction?: Transaction): Promise<PolicySet> {
  const row = await db().models.ChangePolicy.findByPk(environmentId, { transaction });
  return readPolicies(row?.policies ?? DEFAULT_POLICIES);
}

export async function getPolicies({ environmentId }: { environmentId: string }): Promise<PoliciesView> {
  const row = await db().models.ChangePolicy.findByPk(environmentId);
  return { policies: readPolicies(row?.policies ?? DEFAULT_POLICIES), defaults: DEFAULT_POLICIES, custom: row !== null, updatedAt: row?.updatedAt.toISOString() ?? null };
}

export async function setPolicies({ environmentId, policies, actor }: { environmentId: string; policies: PolicySet; actor: Actor }): Promise<PoliciesView> {
  // Tokens carry no role, and a policy names the person who set it.
  if (actor.type !== "user" || !roleHas(actor.role, "reviews:write")) throw forbidden("Change policies are set by architects and admins");
  const { models, sequelize } = db();
  return sequelize.transaction(async (transaction) => {
    const env = await models.Environment.findByPk(environmentId, { transaction, lock: transaction.LOCK.UPDATE });
    if (!env) throw notFound("Environment");
    const existing = await models.ChangePolicy.findByPk(environmentId, { transaction, lock: transaction.LOCK.UPDATE });
    const before = readPolicies(existing?.policies ?? DEFAULT_POLICIES);
    if (existing) await existing.update({ policies, updatedBy: actor.id }, { transaction });
    else await models.ChangePolicy.create({ environmentId, policies, updatedBy: actor.id }, { transaction });
    await recordAudit({ actor, action: "policies.update", targetType: "environment", targetId: env.slug, environmentId, before, after: policies }, transaction);
    const row = await models.ChangePolicy.findByPk(environmentId, { transaction });
    return { policies, defaults: DEFAULT_POLICIES, custom: true, updatedAt: row?.updatedAt.toISOString() ?? null };
  });
}
