// Sign-in rate limit, per account and per address, shared by every app instance through PostgreSQL.
import { Op } from "sequelize";
import { db } from "@/models";

export const SIGN_IN_WINDOW_MS = 15 * 60 * 1000;
/** Failed attempts allowed in the window before further attempts are refused. */
export const SIGN_IN_LIMITS = { account: 5, address: 20 } as const;

const buckets = ({ email, address }: { email: string; address: string }) => ({
  account: `account:${email}`,
  address: `address:${address}`,
});

export async function isSignInBlocked(who: { email: string; address: string }): Promise<boolean> {
  const { SignInAttempt } = db().models;
  const since = new Date(Date.now() - SIGN_IN_WINDOW_MS);
  const b = buckets(who);
  const [account, address] = await Promise.all([
    SignInAttempt.count({ where: { bucket: b.account, createdAt: { [Op.gte]: since } } }),
    SignInAttempt.count({ where: { bucket: b.address, createdAt: { [Op.gte]: since } } }),
  ]);
  return account >= SIGN_IN_LIMITS.account || address >= SIGN_IN_LIMITS.address;
}

export async function recordFailedSignIn(who: { email: string; address: string }): Promise<void> {
  const b = buckets(who);
  await db().models.SignInAttempt.bulkCreate([{ bucket: b.account }, { bucket: b.address }]);
}

/** A good password clears the account's failures (not the address's: one address may try many accounts). */
export async function clearFailedSignIns({ email }: { email: string }): Promise<void> {
  await db().models.SignInAttempt.destroy({ where: { bucket: `account:${email}` } });
}
