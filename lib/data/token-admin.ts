// Creating and revoking tokens on behalf of an admin, audited in the same transaction.
import "server-only";
import { db } from "@/models";
import type { Actor } from "@/lib/auth/actor";
import type { CreateTokenInput } from "@/lib/api/schemas/tokens";
import { AppError, notFound } from "@/lib/errors";
import { recordAudit } from "./audit";
import { findEnvironment } from "./environments";
import { createToken, revokeToken, type TokenInfo } from "./tokens";

export async function createTokenAsAdmin({ input, actor }: { input: CreateTokenInput; actor: Actor }): Promise<{ token: string; info: TokenInfo }> {
  if (actor.type !== "user") throw new AppError("forbidden", "Tokens are created by signed-in admins, not by other tokens");
  let environmentId: string | null = null;
  if (input.environment) {
    const env = await findEnvironment({ slug: input.environment });
    if (!env) throw new AppError("invalid_request", `No environment "${input.environment}" to bind the token to`, [{ path: "environment", message: "no such environment" }]);
    environmentId = env.id;
  }
  return db().sequelize.transaction(async (transaction) => {
    const created = await createToken({ name: input.name, scopes: input.scopes, environmentId, source: input.source ?? null, createdBy: actor.id }, transaction);
    await recordAudit({ actor, action: "token.create", targetType: "token", targetId: created.info.id, environmentId, after: created.info }, transaction);
    return created;
  });
}

export async function revokeTokenAsAdmin({ id, actor }: { id: string; actor: Actor }): Promise<TokenInfo> {
  return db().sequelize.transaction(async (transaction) => {
    const result = await revokeToken({ id }, transaction);
    if (!result) throw notFound("Token");
    await recordAudit({ actor, action: "token.revoke", targetType: "token", targetId: id, before: result.before, after: result.after }, transaction);
    return result.after;
  });
}
