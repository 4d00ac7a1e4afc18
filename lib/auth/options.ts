// next-auth configuration (Node runtime: it reads PostgreSQL). Sessions are JWTs carrying the role;
// every request re-reads the user on the server, so a role change or deactivation applies at once.
import type { NextAuthOptions } from "next-auth";
import CredentialsProvider from "next-auth/providers/credentials";
import type { OAuthConfig } from "next-auth/providers/oauth";
import { z } from "zod";
import { isRole } from "./roles";
import { SIGN_IN_ERRORS } from "./messages";
import { safeRedirect } from "./callback";
import { forbiddenCharacter } from "@/lib/forbidden-text";
import { isDatabaseUnavailable } from "@/lib/errors";
import { isSignInBlocked, reserveAttempt, signInSucceeded } from "@/lib/data/sign-in-attempts";
import { endSessions, normaliseEmail, verifyPassword } from "@/lib/data/users";
import { userForOidcIdentity } from "@/lib/data/sso-users";

interface OidcProfile {
  sub: string;
  email?: string;
  email_verified?: boolean;
  name?: string;
}

/** The company's OpenID Connect provider, when PINCHPOINT_OIDC_ISSUER names one (npm start runs a stand-in). */
export function oidcProvider(): OAuthConfig<OidcProfile> | null {
  const issuer = process.env.PINCHPOINT_OIDC_ISSUER;
  if (!issuer) return null;
  return {
    id: "oidc",
    name: process.env.PINCHPOINT_OIDC_NAME ?? "company single sign-on",
    type: "oauth",
    wellKnown: `${issuer.replace(/\/$/, "")}/.well-known/openid-configuration`,
    clientId: process.env.PINCHPOINT_OIDC_CLIENT_ID ?? "pinchpoint",
    clientSecret: process.env.PINCHPOINT_OIDC_CLIENT_SECRET ?? "pinchpoint-stand-in-secret",
    authorization: { params: { scope: "openid email profile" } },
    idToken: true,
    checks: ["pkce", "state"],
    profile(profile) {
      return { id: profile.sub, email: profile.email ?? null, name: profile.name ?? profile.email ?? profile.sub };
    },
  };
}

// Text no account can hold (lib/forbidden-text.ts) is a wrong sign-in, not a database error.
const plainText = (s: string) => forbiddenCharacter(s) === null;
const credentialsSchema = z.object({
  email: z.string().trim().min(3).max(320).refine(plainText),
  password: z.string().min(1).max(200).refine(plainText),
});

export { SIGN_IN_ERRORS };

/**
 * The caller's address for the per-address sign-in limit: the one address the launcher
 * (scripts/serve.ts) put in X-Forwarded-For after reading the socket and the trusted proxies'
 * entries (lib/auth/client-address.ts). Whatever else the client sent has been replaced there.
 */
function signInAddress(headers: Record<string, unknown> | undefined): string {
  const forwarded = headers?.["x-forwarded-for"];
  const list = typeof forwarded === "string" ? forwarded.split(",").map((a) => a.trim()).filter(Boolean) : [];
  return list[list.length - 1] ?? "unknown";
}

async function checkCredentials(raw: unknown, headers: Record<string, unknown> | undefined) {
  const parsed = credentialsSchema.safeParse(raw);
  if (!parsed.success) throw new Error(SIGN_IN_ERRORS.wrong);
  const email = normaliseEmail(parsed.data.email);
  const who = { email, address: signInAddress(headers) };
  if (await isSignInBlocked(who)) throw new Error(SIGN_IN_ERRORS.limited);
  const { status, reservation } = await reserveAttempt(who);
  if (status === "limited") throw new Error(SIGN_IN_ERRORS.limited);
  const user = await verifyPassword({ email, password: parsed.data.password });
  if (!user) throw new Error(SIGN_IN_ERRORS.wrong);
  await signInSucceeded({ email, reservation });
  return { id: user.id, email: user.email, name: user.name, role: user.role, sessionVersion: user.sessionVersion };
}

export function authSecret(): string {
  const secret = process.env.NEXTAUTH_SECRET ?? process.env.AUTH_SECRET;
  if (!secret) throw new Error("NEXTAUTH_SECRET is not set (npm start generates one into .data/secret)");
  return secret;
}

export const authOptions: NextAuthOptions = {
  secret: process.env.NEXTAUTH_SECRET ?? process.env.AUTH_SECRET,
  session: { strategy: "jwt", maxAge: 12 * 60 * 60 },
  pages: { signIn: "/signin", error: "/signin" },
  providers: [
    ...(oidcProvider() ? [oidcProvider() as OAuthConfig<OidcProfile>] : []),
    CredentialsProvider({
      id: "credentials",
      name: "E-mail and password",
      credentials: {
        email: { label: "E-mail", type: "email" },
        password: { label: "Password", type: "password" },
      },
      async authorize(raw, req) {
        try {
          return await checkCredentials(raw, req?.headers);
        } catch (error) {
          // next-auth shows a thrown message on the sign-in page: say what is wrong, never the driver's words.
          if (isDatabaseUnavailable(error)) throw new Error(SIGN_IN_ERRORS.unavailable);
          throw error;
        }
      },
    }),
  ],
  events: {
    // Signing out ends the session on the server too: a copy of the cookie stops working at once.
    // The version is per account, so this signs the account out in every browser.
    async signOut({ token }) {
      if (token?.sub) await endSessions({ userId: token.sub }).catch((error: unknown) => console.error("[auth] could not end sessions at sign-out:", error));
    },
  },
  callbacks: {
    async redirect(params) {
      return safeRedirect(params);
    },
    async signIn({ account, profile }) {
      if (account?.provider !== "oidc") return true;
      const p = profile as OidcProfile | undefined;
      const user = await userForOidcIdentity({ subject: account.providerAccountId, email: p?.email ?? null, emailVerified: p?.email_verified === true, name: p?.name ?? null });
      return user ? true : "/signin?error=sso_no_account";
    },
    async jwt({ token, user, account, profile }) {
      if (account?.provider === "oidc") {
        const p = profile as OidcProfile | undefined;
        const linked = await userForOidcIdentity({ subject: account.providerAccountId, email: p?.email ?? null, emailVerified: p?.email_verified === true, name: p?.name ?? null });
        if (linked) {
          token.sub = linked.id;
          token.role = linked.role;
          token.email = linked.email;
          token.name = linked.name;
          token.sv = linked.sessionVersion;
        }
        return token;
      }
      if (user) {
        token.sub = user.id;
        if ("role" in user && isRole(user.role)) token.role = user.role;
        if (typeof user.sessionVersion === "number") token.sv = user.sessionVersion;
      }
      return token;
    },
    async session({ session, token }) {
      if (session.user) {
        session.user.id = token.sub ?? "";
        session.user.role = isRole(token.role) ? token.role : "viewer";
      }
      return session;
    },
  },
};
