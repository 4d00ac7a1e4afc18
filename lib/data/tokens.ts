// API tokens: `ppt_` + 40 random characters, shown once, stored as a sha256 hash.
import "server-only";
import { createHash, randomBytes } from "node:crypto";
import type { Transaction } from "sequelize";
import { db } from "@/models";
import type { Role, TokenScope } from "@/lib/auth/roles";

const TOKEN_PREFIX = "ppt_";

export interface TokenInfo {
  id: string;
  name: string;
  prefix: string;
  scopes: TokenScope[];
  environment: string | null;
  source: string | null;
  createdBy: string | null;
  /** the creator's e-mail, what the admin screen shows (null when the account is gone) */
  createdByEmail: string | null;
  createdAt: string;
  lastUsedAt: string | null;
  revokedAt: string | null;
}

const hashToken = (token: string) => createHash("sha256").update(token).digest("hex");

function newSecret(): string {
  // base64url of 30 random bytes: 40 characters, 240 bits.
  return TOKEN_PREFIX + randomBytes(30).toString("base64url");
}

type TokenRow = InstanceType<ReturnType<typeof db>["models"]["ApiToken"]>;

async function toTokenInfo(row: TokenRow, envSlugs?: Map<string, string>, emails?: Map<string, string>): Promise<TokenInfo> {
  let environment: string | null = null;
  let createdByEmail: string | null = null;
  if (row.createdBy) createdByEmail = emails ? (emails.get(row.createdBy) ?? null) : ((await db().models.User.findByPk(row.createdBy))?.email ?? null);
  if (row.environmentId) {
    environment =
      envSlugs?.get(row.environmentId) ?? (await db().models.Environment.findByPk(row.environmentId))?.slug ?? null;
  }
  return {
    id: row.id,
    name: row.name,
    prefix: row.prefix,
    scopes: row.scopes,
    environment,
    source: row.sourceName,
    createdBy: row.createdBy,
    createdByEmail,
    createdAt: row.createdAt.toISOString(),
    lastUsedAt: row.lastUsedAt?.toISOString() ?? null,
    revokedAt: row.revokedAt?.toISOString() ?? null,
  };
}

export async function createToken(
  input: {
    name: string;
    scopes: TokenScope[];
    environmentId: string | null;
    source: string | null;
    createdBy: string;
  },
  transaction?: Transaction,
): Promise<{ token: string; info: TokenInfo }> {
  const token = newSecret();
  const row = await db().models.ApiToken.create({
    name: input.name,
    prefix: token.slice(0, 12),
    secretHash: hashToken(token),
    scopes: [...new Set(input.scopes)],
    environmentId: input.environmentId,
    sourceName: input.source,
    createdBy: input.createdBy,
    lastUsedAt: null,
    revokedAt: null,
  }, { transaction });
  return { token, info: await toTokenInfo(row) };
}

export async function listTokens(): Promise<TokenInfo[]> {
  const { ApiToken, Environment, User } = db().models;
  const [rows, envs, users] = await Promise.all([ApiToken.findAll({ order: [["createdAt", "DESC"]] }), Environment.findAll(), User.findAll({ attributes: ["id", "email"] })]);
  const slugs = new Map(envs.map((e) => [e.id, e.slug]));
  const emails = new Map(users.map((u) => [u.id, u.email]));
  return Promise.all(rows.map((row) => toTokenInfo(row, slugs, emails)));
}

/** Revoke; returns the token as it was before, or null when no such token exists. */
export async function revokeToken({ id }: { id: string }, transaction?: Transaction): Promise<{ before: TokenInfo; after: TokenInfo } | null> {
  const row = await db().models.ApiToken.findByPk(id, { transaction, lock: transaction ? transaction.LOCK.UPDATE : undefined });
  if (!row) return null;
  const before = await toTokenInfo(row);
  if (!row.revokedAt) {
    row.revokedAt = new Date();
    await row.save({ transaction });
  }
  return { before, after: await toTokenInfo(row) };
}

export interface TokenActorRow {
  id: string;
  name: string;
  prefix: string;
  scopes: TokenScope[];
  environmentId: string | null;
  sourceName: string | null;
  /** the admin who created it, as they are now: a token never does more than its creator could */
  creator: { id: string; email: string; role: Role; active: boolean } | null;
}

/** The live token for this secret, touching its last-used time; null when unknown or revoked. */
export async function authenticateToken({ token }: { token: string }): Promise<TokenActorRow | null> {
  if (!token.startsWith(TOKEN_PREFIX)) return null;
  const row = await db().models.ApiToken.findOne({ where: { secretHash: hashToken(token) } });
  if (!row || row.revokedAt) return null;
  const creator = row.createdBy ? await db().models.User.findByPk(row.createdBy) : null;
  // Last-used is informational: write it at most once a minute to keep pushes cheap.
  if (!row.lastUsedAt || Date.now() - row.lastUsedAt.getTime() > 60_000) {
    await row.update({ lastUsedAt: new Date() });
  }
  return {
    id: row.id,
    name: row.name,
    prefix: row.prefix,
    scopes: row.scopes,
    environmentId: row.environmentId,
    sourceName: row.sourceName,
    creator: creator ? { id: creator.id, email: creator.email, role: creator.role, active: creator.active } : null,
  };
}
