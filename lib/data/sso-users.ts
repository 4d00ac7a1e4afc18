// Accounts for single sign-on: link an OpenID Connect identity to a user, creating a viewer on
// first sign-in (admins change roles afterwards). Linking by e-mail only when the provider
// says the address is verified.
import "server-only";
import { db } from "@/models";
import { normaliseEmail, toAppUser, type AppUser } from "./users";
import { recordAudit } from "./audit";

export async function userForOidcIdentity({ subject, email, emailVerified, name }: { subject: string; email: string | null; emailVerified: boolean; name: string | null }): Promise<AppUser | null> {
  const { User } = db().models;
  const linked = await User.findOne({ where: { oidcSubject: subject } });
  if (linked) return linked.active ? toAppUser(linked) : null;
  if (!email) return null;
  const address = normaliseEmail(email);
  const existing = await User.findOne({ where: { email: address } });
  if (existing) {
    if (!emailVerified || !existing.active) return null;
    await db().sequelize.transaction(async (transaction) => {
      await existing.update({ oidcSubject: subject }, { transaction });
      await recordAudit({ actor: { type: "system", label: "single sign-on" }, action: "user.sso.link", targetType: "user", targetId: existing.id, before: { oidcSubject: null }, after: { oidcSubject: subject, email: address } }, transaction);
    });
    return toAppUser(existing);
  }
  return db().sequelize.transaction(async (transaction) => {
    const created = await User.create({ email: address, name: name ?? address, role: "viewer", passwordHash: null, oidcSubject: subject }, { transaction });
    await recordAudit({ actor: { type: "system", label: "single sign-on" }, action: "user.create", targetType: "user", targetId: created.id, after: { email: address, role: "viewer", via: "oidc" } }, transaction);
    return toAppUser(created);
  });
}
