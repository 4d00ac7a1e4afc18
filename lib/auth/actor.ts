// Who is calling: a signed-in user (session cookie) or an API token (Authorization: Bearer ppt_…).
import { getToken } from "next-auth/jwt";
import { NextRequest } from "next/server";
import { authSecret } from "./options";
import { roleHas, type Permission, type Role, type TokenScope } from "./roles";
import { authenticateToken } from "@/lib/data/tokens";
import { getUserById } from "@/lib/data/users";
import { AppError } from "@/lib/errors";

export type Actor =
  | { type: "user"; id: string; email: string; name: string; role: Role; label: string }
  | {
      type: "token";
      id: string;
      name: string;
      scopes: TokenScope[];
      environmentId: string | null;
      sourceName: string | null;
      /** whose rights cap the token's (lib/data/tokens.ts) */
      creator: { id: string; email: string; role: Role };
      label: string;
    };

/** What a token scope allows, in the same terms as roles. */
const SCOPE_PERMISSIONS: Record<TokenScope, readonly Permission[]> = {
  read: ["read"],
  "inventory:write": ["inventory:write"],
};

/** The token's scopes allow it, whatever its creator may do now. */
export function scopeAllows(actor: Extract<Actor, { type: "token" }>, permission: Permission): boolean {
  return actor.scopes.some((scope) => SCOPE_PERMISSIONS[scope].includes(permission));
}

/** A token does at most what its scopes say and at most what its creator may do today. */
export function actorCan(actor: Actor, permission: Permission): boolean {
  if (actor.type === "user") return roleHas(actor.role, permission);
  return scopeAllows(actor, permission) && roleHas(actor.creator.role, permission);
}

function bearer(headers: Headers): string | null {
  const value = headers.get("authorization");
  if (!value) return null;
  const match = /^Bearer\s+(\S+)$/i.exec(value.trim());
  if (!match?.[1]) throw new AppError("unauthorized", "Malformed Authorization header: expected `Bearer ppt_…`");
  return match[1];
}

/** The caller, or null when anonymous. A bad token is an error, never a silent fall-back to the session. */
export async function resolveActor(headers: Headers): Promise<Actor | null> {
  const token = bearer(headers);
  if (token !== null) {
    const row = await authenticateToken({ token });
    if (!row) throw new AppError("unauthorized", "Unknown or revoked API token");
    // Tokens act for the admin who made them: one whose account is gone or deactivated makes none work.
    if (!row.creator || !row.creator.active) {
      throw new AppError("unauthorized", `This API token's creator${row.creator ? ` (${row.creator.email})` : ""} no longer has an active account, so the token no longer works; ask an admin for a new one`);
    }
    return {
      type: "token",
      id: row.id,
      name: row.name,
      scopes: row.scopes,
      environmentId: row.environmentId,
      sourceName: row.sourceName,
      creator: { id: row.creator.id, email: row.creator.email, role: row.creator.role },
      label: `token ${row.name} (${row.prefix}…)`,
    };
  }
  // The session is next-auth's signed JWT cookie, read from the request's own headers (the same
  // way in route handlers, server actions and pages, and in tests that carry a real cookie).
  const jwt = await sessionClaims(headers);
  const id = jwt?.sub;
  if (!id) return null;
  // Re-read the user: a deactivation or role change takes effect on the next request, and a session
  // issued before the account's sessions were ended (sign-out, new password, role change) is over.
  const user = await getUserById({ id });
  if (!user || !user.active) return null;
  if (jwt.sv !== user.sessionVersion) return null;
  return { type: "user", id: user.id, email: user.email, name: user.name, role: user.role, label: user.email };
}

/**
 * Decoding next-auth's cookie derives a key (HKDF) and decrypts a JWE on every request: under
 * concurrent readers that was the costliest step of the session check. The same cookie always
 * decodes to the same claims, so each decoded cookie is kept until its expiry (at most a minute),
 * a few thousand at a time. Kept on globalThis: Next may bundle this module more than once.
 */
type Claims = { sub: string; sv: unknown };
const decoded = ((globalThis as unknown as { __pinchpointSessions?: Map<string, { until: number; claims: Claims }> }).__pinchpointSessions ??= new Map());

/**
 * Only what the cookie says is kept, never whether it is still good: the user (and so the session
 * version a sign-out bumps) is read on every request.
 */
async function sessionClaims(headers: Headers): Promise<Claims | null> {
  const cookie = headers.get("cookie") ?? "";
  if (!cookie.includes("session-token")) return null;
  const now = Date.now();
  const hit = decoded.get(cookie);
  if (hit && hit.until > now) return hit.claims;
  const jwt = await getToken({ req: new NextRequest("http://pinchpoint.invalid/", { headers }), secret: authSecret() });
  if (!jwt?.sub) return null;
  const claims: Claims = { sub: jwt.sub, sv: jwt.sv };
  const exp = typeof jwt.exp === "number" ? jwt.exp * 1000 : now;
  if (decoded.size >= 5000) decoded.clear();
  decoded.set(cookie, { until: Math.min(exp, now + 60_000), claims });
  return claims;
}
