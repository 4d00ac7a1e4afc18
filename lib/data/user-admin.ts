// Admin user management: list, invite, change role, deactivate / reactivate, and accepting an
// invite. Every write is audited in the same transaction as the change it records.
import "server-only";
import { createHash, randomBytes } from "node:crypto";
import { Op, type Transaction } from "sequelize";
import { db } from "@/models";
import type { Actor } from "@/lib/auth/actor";
import type { Role } from "@/lib/auth/roles";
import type { AcceptInviteInput, InviteUserInput, UpdateUserInput } from "@/lib/api/schemas/users";
import { appUrl } from "@/lib/config";
import { AppError, notFound } from "@/lib/errors";
import { recordAudit } from "./audit";
import { hashPassword } from "./users";
import { noticeInvite } from "@/lib/mail";

/** How long an invite link works (common practice for one-time sign-up links: a few days). */
const INVITE_TTL_HOURS = 72;

export interface AdminUser {
  id: string;
  email: string;
  name: string;
  role: Role;
  active: boolean;
  createdAt: string;
  /** `invited`: no password yet and an open link; `expired`: no password and every link has lapsed */
  status: "active" | "invited" | "invite-expired" | "deactivated";
  inviteExpiresAt: string | null;
}


const hashSecret = (secret: string) => createHash("sha256").update(secret).digest("hex");

type UserRow = InstanceType<ReturnType<typeof db>["models"]["User"]>;

function snapshotOf(row: UserRow) {
  return { email: row.email, name: row.name, role: row.role, active: row.active };
}

function statusOf(row: UserRow, openInviteExpiry: Date | undefined): AdminUser["status"] {
  if (!row.active) return "deactivated";
  if (row.passwordHash || row.oidcSubject) return "active";
  return openInviteExpiry && openInviteExpiry.getTime() > Date.now() ? "invited" : "invite-expired";
}

export async function listUsers(): Promise<AdminUser[]> {
  const { User, Invite } = db().models;
  const [rows, invites] = await Promise.all([
    User.findAll({ order: [["email", "ASC"]] }),
    Invite.findAll({ where: { usedAt: null }, order: [["expiresAt", "ASC"]] }),
  ]);
  // Latest expiry wins: a re-sent invite supersedes the old one for display.
  const expiry = new Map<string, Date>();
  for (const invite of invites) expiry.set(invite.userId, invite.expiresAt);
  return rows.map((row) => {
    const status = statusOf(row, expiry.get(row.id));
    return {
      id: row.id,
      email: row.email,
      name: row.name,
      role: row.role,
      active: row.active,
      createdAt: row.createdAt.toISOString(),
      status,
      inviteExpiresAt: status === "invited" || status === "invite-expired" ? (expiry.get(row.id)?.toISOString() ?? null) : null,
    };
  });
}

async function issueInvite(userId: string, actor: Actor, transaction: Transaction): Promise<{ secret: string; expiresAt: Date }> {
  const secret = randomBytes(32).toString("base64url");
  const expiresAt = new Date(Date.now() + INVITE_TTL_HOURS * 3_600_000);
  await db().models.Invite.create({ userId, secretHash: hashSecret(secret), expiresAt, usedAt: null, createdBy: actor.type === "user" ? actor.id : null }, { transaction });
  return { secret, expiresAt };
}

export interface InviteResult {
  user: AdminUser;
  /** the one-time secret; the link is `/invite/<token>` */
  token: string;
  url: string;
  expiresAt: string;
}

function requireUserActor(actor: Actor): Extract<Actor, { type: "user" }> {
  if (actor.type !== "user") throw new AppError("forbidden", "People are managed by signed-in admins, not by API tokens");
  return actor;
}

export async function inviteUser({ input, actor }: { input: InviteUserInput; actor: Actor }): Promise<InviteResult> {
  const admin = requireUserActor(actor);
  const { sequelize, models } = db();
  const result = await sequelize.transaction(async (transaction) => {
    const existing = await models.User.findOne({ where: { email: input.email }, transaction });
    if (existing) {
      throw new AppError("conflict", `${input.email} already has an account`, [{ path: "email", message: "an account with this e-mail exists; change its role or reactivate it instead" }]);
    }
    const row = await models.User.create({ email: input.email, name: input.name, role: input.role, passwordHash: null, oidcSubject: null }, { transaction });
    const invite = await issueInvite(row.id, admin, transaction);
    await mailInvite(row.email, invite, admin, transaction);
    await recordAudit(
      { actor: admin, action: "user.invite", targetType: "user", targetId: row.id, before: null, after: { ...snapshotOf(row), inviteExpiresAt: invite.expiresAt.toISOString() } },
      transaction,
    );
    return { row, invite };
  });
  return finishInvite(result.row, result.invite);
}

/** A fresh link for someone who has not set a password yet; older open links stop working. */
export async function reissueInvite({ id, actor }: { id: string; actor: Actor }): Promise<InviteResult> {
  const admin = requireUserActor(actor);
  const { sequelize, models } = db();
  const result = await sequelize.transaction(async (transaction) => {
    const row = await models.User.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!row) throw notFound("User");
    if (row.passwordHash || row.oidcSubject) throw new AppError("conflict", `${row.email} has already set up their account; there is nothing to invite them to`);
    if (!row.active) throw new AppError("conflict", `${row.email} is deactivated; reactivate the account first`);
    await models.Invite.update({ usedAt: new Date() }, { where: { userId: row.id, usedAt: null }, transaction });
    const invite = await issueInvite(row.id, admin, transaction);
    await mailInvite(row.email, invite, admin, transaction);
    await recordAudit({ actor: admin, action: "user.invite.reissue", targetType: "user", targetId: row.id, before: null, after: { inviteExpiresAt: invite.expiresAt.toISOString() } }, transaction);
    return { row, invite };
  });
  return finishInvite(result.row, result.invite);
}

/** Queued in the invite's transaction: a rolled-back invite mails nobody; the admin also sees the link. */
function mailInvite(email: string, invite: { secret: string; expiresAt: Date }, admin: Extract<Actor, { type: "user" }>, transaction: Transaction) {
  return noticeInvite({ email, link: `/invite/${invite.secret}`, invitedBy: admin.email, expiresAt: invite.expiresAt }, transaction);
}

async function finishInvite(row: UserRow, invite: { secret: string; expiresAt: Date }): Promise<InviteResult> {
  const url = new URL(`/invite/${invite.secret}`, appUrl()).toString();
  const user = (await listUsers()).find((u) => u.id === row.id);
  if (!user) throw notFound("User");
  return { user, token: invite.secret, url, expiresAt: invite.expiresAt.toISOString() };
}

export async function updateUser({ id, input, actor }: { id: string; input: UpdateUserInput; actor: Actor }): Promise<AdminUser> {
  const admin = requireUserActor(actor);
  const { sequelize, models } = db();
  await sequelize.transaction(async (transaction) => {
    // Serialise admin changes: lock every active admin first, so two admins demoting each other at
    // once cannot both succeed and leave nobody able to administer the estate.
    const admins = await models.User.findAll({ where: { role: "admin", active: true }, transaction, lock: transaction.LOCK.UPDATE });
    if (!admins.some((a) => a.id === admin.id)) throw new AppError("forbidden", "Your account is no longer an active admin");
    const row = await models.User.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!row) throw notFound("User");
    // An admin never demotes or deactivates themselves either: another admin does it.
    if (row.id === admin.id) {
      if (input.role !== undefined && input.role !== row.role) {
        throw new AppError("conflict", "You cannot change your own role. Ask another admin to do it, so the estate is never left without one.", [{ path: "role", message: "your own role" }]);
      }
      if (input.active === false) {
        throw new AppError("conflict", "You cannot deactivate your own account. Ask another admin to do it.", [{ path: "active", message: "your own account" }]);
      }
    }
    const losesAdmin = row.role === "admin" && row.active && ((input.role !== undefined && input.role !== "admin") || input.active === false);
    if (losesAdmin && admins.filter((a) => a.id !== row.id).length === 0) {
      throw new AppError("conflict", "This is the last active admin; make someone else an admin first.");
    }
    const before = snapshotOf(row);
    if (input.role !== undefined) row.role = input.role;
    if (input.active !== undefined) row.active = input.active;
    if (!row.changed()) return;
    // A new role or a deactivation applies to sessions already open, not only to the next sign-in.
    row.sessionVersion = row.sessionVersion + 1;
    await row.save({ transaction });
    const after = snapshotOf(row);
    const action = input.role !== undefined && input.role !== before.role ? "user.role" : after.active ? "user.reactivate" : "user.deactivate";
    await recordAudit({ actor: admin, action, targetType: "user", targetId: row.id, before, after }, transaction);
  });
  const user = (await listUsers()).find((u) => u.id === id);
  if (!user) throw notFound("User");
  return user;
}

export interface InviteLookup {
  email: string;
  name: string;
  expiresAt: string;
}

async function openInvite(token: string, transaction?: Transaction) {
  const { models } = db();
  const invite = await models.Invite.findOne({
    where: { secretHash: hashSecret(token), usedAt: null, expiresAt: { [Op.gt]: new Date() } },
    transaction,
    ...(transaction ? { lock: transaction.LOCK.UPDATE } : {}),
  });
  if (!invite) return null;
  const user = await models.User.findByPk(invite.userId, { transaction });
  if (!user || !user.active || user.passwordHash) return null;
  return { invite, user };
}

/** For the invite page: who the link is for, or null when it is unknown, used or expired (indistinguishable on purpose). */
export async function findOpenInvite({ token }: { token: string }): Promise<InviteLookup | null> {
  const found = await openInvite(token);
  return found ? { email: found.user.email, name: found.user.name, expiresAt: found.invite.expiresAt.toISOString() } : null;
}

export async function acceptInvite({ token, input }: { token: string; input: AcceptInviteInput }): Promise<{ email: string }> {
  const passwordHash = await hashPassword(input.password);
  return db().sequelize.transaction(async (transaction) => {
    // The row lock makes a double submit of the same link set the password once, not twice.
    const found = await openInvite(token, transaction);
    if (!found) throw new AppError("not_found", "This invite link is not valid any more: it was used, replaced or has expired. Ask an admin for a new one.");
    const { invite, user } = found;
    invite.usedAt = new Date();
    await invite.save({ transaction });
    user.passwordHash = passwordHash;
    // A password set is a fresh start: any session opened before it ends.
    user.sessionVersion = user.sessionVersion + 1;
    await user.save({ transaction });
    await recordAudit(
      { actor: { type: "system", label: `invite accepted by ${user.email}` }, action: "user.invite.accept", targetType: "user", targetId: user.id, before: { password: false }, after: { password: true } },
      transaction,
    );
    return { email: user.email };
  });
}
