// Sign-in rate limit, per account and per address, shared by every app instance through PostgreSQL.
import "server-only";
import { Op } from "sequelize";
import { db } from "@/models";

const SIGN_IN_WINDOW_MS = 15 * 60 * 1000;
/** Failed attempts allowed in the window before further attempts are refused. */
export const SIGN_IN_LIMITS = { account: 5, address: 20 } as const;

const buckets = ({ email, address }: { email: string; address: string }) => ({
  account: `account:${email}`,
  address: `address:${address}`,
});

type Who = { email: string; address: string };

/** Failed attempts in the window, per account and per address. */
async function recentFailures(who: Who): Promise<{ account: number; address: number }> {
  const { SignInAttempt } = db().models;
  const since = new Date(Date.now() - SIGN_IN_WINDOW_MS);
  const b = buckets(who);
  const [account, address] = await Promise.all([
    SignInAttempt.count({ where: { bucket: b.account, createdAt: { [Op.gte]: since } } }),
    SignInAttempt.count({ where: { bucket: b.address, createdAt: { [Op.gte]: since } } }),
  ]);
  return { account, address };
}

export async function isSignInBlocked(who: Who): Promise<boolean> {
  const n = await recentFailures(who);
  return n.account >= SIGN_IN_LIMITS.account || n.address >= SIGN_IN_LIMITS.address;
}

/**
 * Reserve an attempt before the password is checked: record it as failed first, then count with
 * it included. Parallel guesses cannot all pass the check before any is recorded, and no lock or
 * connection is held while bcrypt runs. A right password removes the reservation afterwards.
 */
export async function reserveAttempt(who: Who): Promise<{ status: "allowed" | "limited"; reservation: string[] }> {
  const b = buckets(who);
  const rows = await db().models.SignInAttempt.bulkCreate([{ bucket: b.account }, { bucket: b.address }], { returning: true });
  const n = await recentFailures(who);
  const status = n.account > SIGN_IN_LIMITS.account || n.address > SIGN_IN_LIMITS.address ? "limited" : "allowed";
  return { status, reservation: rows.map((r) => String(r.id)) };
}

/** A right password: the account starts afresh, and this attempt no longer counts for its address. */
export async function signInSucceeded({ email, reservation }: { email: string; reservation: string[] }): Promise<void> {
  const { SignInAttempt } = db().models;
  await SignInAttempt.destroy({ where: { [Op.or]: [{ bucket: `account:${email}` }, { id: reservation }] } });
}
