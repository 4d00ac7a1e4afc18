// Environment management on behalf of an admin: create, rename, delete. Each write is audited in
// the same transaction, and each takes the same per-slug advisory lock as a push (lib/data/push.ts),
// so a push can neither recreate an environment half-way through its deletion nor race its creation.
import "server-only";
import { forgetServedState } from "./analysis-results";
import { QueryTypes, UniqueConstraintError, type Transaction } from "sequelize";
import { db } from "@/models";
import type { Actor } from "@/lib/auth/actor";
import type { CreateEnvironmentInput, RenameEnvironmentInput } from "@/lib/api/schemas/environments";
import { AppError, notFound } from "@/lib/errors";
import { defaultEnvironment } from "@/lib/config";
import { recordAudit } from "./audit";
import { getEnvironmentSummaryOrThrow, type EnvironmentSummary } from "./environments";

/** The same lock key as a push's, so the two serialise per slug. */
async function lockSlug(slug: string, transaction: Transaction): Promise<void> {
  await db().sequelize.query("SELECT pg_advisory_xact_lock(hashtext('pinchpoint-env:' || :slug))", { replacements: { slug }, transaction });
}

const taken = (slug: string) => new AppError("conflict", `An environment "${slug}" already exists`, [{ path: "slug", message: "already taken" }]);

export async function createEnvironmentAsAdmin({ input, actor }: { input: CreateEnvironmentInput; actor: Actor }): Promise<EnvironmentSummary> {
  const { sequelize, models } = db();
  try {
    return await sequelize.transaction(async (transaction) => {
      await lockSlug(input.slug, transaction);
      if (await models.Environment.findOne({ where: { slug: input.slug }, transaction })) throw taken(input.slug);
      const row = await models.Environment.create({ slug: input.slug, name: input.name ?? input.slug, pinchWeights: null }, { transaction });
      await recordAudit(
        { actor, action: "environment.create", targetType: "environment", targetId: row.slug, environmentId: row.id, after: { slug: row.slug, name: row.name } },
        transaction,
      );
      return getEnvironmentSummaryOrThrow({ slug: row.slug }, transaction);
    });
  } catch (error) {
    // Belt and braces: the lock covers our writers, the unique index covers everything else.
    if (error instanceof UniqueConstraintError) throw taken(input.slug);
    throw error;
  }
}

export async function renameEnvironmentAsAdmin({ slug, input, actor }: { slug: string; input: RenameEnvironmentInput; actor: Actor }): Promise<EnvironmentSummary> {
  const { sequelize, models } = db();
  return sequelize.transaction(async (transaction) => {
    const row = await models.Environment.findOne({ where: { slug }, transaction, lock: transaction.LOCK.UPDATE });
    if (!row) throw notFound(`Environment "${slug}"`);
    const before = { slug: row.slug, name: row.name };
    // Saving the same name is not a change, so it leaves no audit row.
    if (row.name !== input.name) {
      row.name = input.name;
      await row.save({ transaction });
      await recordAudit(
        { actor, action: "environment.rename", targetType: "environment", targetId: row.slug, environmentId: row.id, before, after: { slug: row.slug, name: row.name } },
        transaction,
      );
    }
    return getEnvironmentSummaryOrThrow({ slug }, transaction);
  });
}

export interface DeletedEnvironment {
  slug: string;
  name: string;
  removed: { components: number; snapshots: number; sources: number; tokens: number };
}

/**
 * Delete an environment and, by the foreign keys' ON DELETE CASCADE, everything of it: components,
 * dependencies, sources, snapshots, analyses, reviews, map positions, import records, and the API
 * tokens bound to it. Audit rows stay (their environment link becomes NULL), so the record of what
 * happened outlives the environment.
 */
export async function deleteEnvironmentAsAdmin({ slug, confirm, actor }: { slug: string; confirm: string; actor: Actor }): Promise<DeletedEnvironment> {
  const { sequelize, models } = db();
  return sequelize.transaction(async (transaction) => {
    transaction.afterCommit(forgetServedState);
    await lockSlug(slug, transaction);
    const row = await models.Environment.findOne({ where: { slug }, transaction, lock: transaction.LOCK.UPDATE });
    if (!row) throw notFound(`Environment "${slug}"`);
    if (confirm !== slug) {
      throw new AppError("invalid_request", `To delete "${slug}", repeat its slug exactly in ?confirm=`, [
        { path: "query.confirm", message: `must be "${slug}"` },
      ]);
    }
    if (slug === defaultEnvironment()) {
      throw new AppError(
        "conflict",
        `"${slug}" is the default environment: the overview at / shows it. Set PINCHPOINT_DEFAULT_ENV to another environment and restart before deleting this one.`,
      );
    }
    const summary = await getEnvironmentSummaryOrThrow({ slug }, transaction);
    const tokens = await sequelize.query<{ id: string; name: string; prefix: string; revoked_at: Date | null }>(
      "SELECT id, name, prefix, revoked_at FROM api_tokens WHERE environment_id = :id ORDER BY created_at",
      { type: QueryTypes.SELECT, replacements: { id: row.id }, transaction },
    );
    await row.destroy({ transaction });
    // Recorded without an environment link: the row it would point at is gone in this transaction.
    await recordAudit(
      {
        actor,
        action: "environment.delete",
        targetType: "environment",
        targetId: slug,
        environmentId: null,
        before: {
          slug: summary.slug,
          name: summary.name,
          createdAt: summary.createdAt,
          components: summary.componentCount,
          snapshots: summary.snapshotCount,
          latestSnapshot: summary.latestSnapshot?.number ?? null,
          sources: summary.sourceCount,
          tokens: tokens.map((t) => ({ id: t.id, name: t.name, prefix: t.prefix, revoked: t.revoked_at !== null })),
        },
        after: null,
      },
      transaction,
    );
    return {
      slug,
      name: summary.name,
      removed: { components: summary.componentCount, snapshots: summary.snapshotCount, sources: summary.sourceCount, tokens: tokens.length },
    };
  });
}
