// The audit log: every write, with who, when, what, before and after. Written in the same
// transaction as the change it records, so neither exists without the other.
import "server-only";
import type { Transaction } from "sequelize";
import { db } from "@/models";
import type { Actor } from "@/lib/auth/actor";

export type SystemActor = { type: "system"; label: string };

export async function recordAudit(
  input: {
    actor: Actor | SystemActor;
    action: string;
    targetType: string;
    targetId: string;
    environmentId?: string | null;
    before?: unknown;
    after?: unknown;
  },
  transaction?: Transaction,
): Promise<void> {
  await db().models.AuditEvent.create(
    {
      actorType: input.actor.type,
      actorId: input.actor.type === "system" ? null : input.actor.id,
      actorLabel: input.actor.label,
      action: input.action,
      targetType: input.targetType,
      targetId: input.targetId,
      environmentId: input.environmentId ?? null,
      before: input.before ?? null,
      after: input.after ?? null,
    },
    { transaction },
  );
}

/**
 * Serialise writes to one (environment, key) row that may not exist yet: FOR UPDATE locks nothing
 * when the row is missing, so two first writes would both insert and the second would fail.
 */
export async function lockKey({ scope, environmentId, key }: { scope: string; environmentId: string; key: string }, transaction: Transaction): Promise<void> {
  await db().sequelize.query("SELECT pg_advisory_xact_lock(hashtext(:scope), hashtext(:id))", {
    replacements: { scope: `pinchpoint-${scope}`, id: `${environmentId}/${key}` },
    transaction,
  });
}
