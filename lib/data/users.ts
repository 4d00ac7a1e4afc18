// Users: the only module that reads or writes the users table for the app.
import bcrypt from "bcryptjs";
import type { Transaction } from "sequelize";
import { db } from "@/models";
import type { Role } from "@/lib/auth/roles";

export interface AppUser {
  id: string;
  email: string;
  name: string;
  role: Role;
  active: boolean;
  /** sessions carry the version they were issued under; a bump ends them all */
  sessionVersion: number;
}

type UserRow = InstanceType<ReturnType<typeof db>["models"]["User"]>;

export function toAppUser(row: UserRow): AppUser {
  return { id: row.id, email: row.email, name: row.name, role: row.role, active: row.active, sessionVersion: row.sessionVersion };
}

let dummyHash: string | undefined;

export const normaliseEmail = (email: string) => email.trim().toLowerCase();

export async function getUserById({ id }: { id: string }): Promise<AppUser | null> {
  const row = await db().models.User.findByPk(id);
  return row ? toAppUser(row) : null;
}

/**
 * The session check's user lookup, answered from memory for up to USER_CACHE_MS: every request
 * re-reads its user (a deactivation or role change must take effect), and under concurrent readers
 * that one query per request was the largest cost left. Changes made in this process clear the
 * cache at once (`forgetCachedUsers`); another app instance sees them within USER_CACHE_MS.
 * Kept on globalThis: Next may bundle this module more than once.
 */
const USER_CACHE_MS = Number(process.env.PINCHPOINT_USER_CACHE_MS ?? 2000);
const userCache = ((globalThis as unknown as { __pinchpointUsers?: Map<string, { at: number; user: Promise<AppUser | null> }> }).__pinchpointUsers ??= new Map());

export function getUserByIdCached({ id }: { id: string }): Promise<AppUser | null> {
  const now = Date.now();
  const hit = userCache.get(id);
  if (hit && now - hit.at < USER_CACHE_MS) return hit.user;
  const user = getUserById({ id });
  if (userCache.size >= 10_000) userCache.clear();
  userCache.set(id, { at: now, user });
  user.catch(() => userCache.delete(id));
  return user;
}

/** After any change to users: the next session check reads them again. */
export function forgetCachedUsers(): void {
  userCache.clear();
}

/** The user whose password matches, or null (unknown, inactive and wrong all look the same). */
export async function verifyPassword({ email, password }: { email: string; password: string }): Promise<AppUser | null> {
  const row = await db().models.User.findOne({ where: { email: normaliseEmail(email) } });
  // Compare against a throwaway hash when the account is missing so timing does not tell accounts apart.
  const hash = row?.passwordHash ?? (dummyHash ??= await bcrypt.hash("not-a-password", 10));
  const ok = await bcrypt.compare(password, hash);
  if (!row || !ok || !row.active || !row.passwordHash) return null;
  return toAppUser(row);
}

/**
 * End every session of this account at once (sign-out, a new password, a role change,
 * deactivation): cookies issued before carry an older version and are refused on their next request.
 */
export async function endSessions({ userId }: { userId: string }, transaction?: Transaction): Promise<void> {
  await db().models.User.increment("sessionVersion", { by: 1, where: { id: userId }, transaction });
}

export async function hashPassword(password: string): Promise<string> {
  return bcrypt.hash(password, 10);
}
