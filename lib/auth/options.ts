// next-auth configuration (Node runtime: it reads PostgreSQL). Sessions are JWTs carrying the role;
// every request re-reads the user on the server, so a role change or deactivation applies at once.
import type { NextAuthOptions } from "next-auth";
import CredentialsProvider from "next-auth/providers/credentials";
import { z } from "zod";
import { isRole } from "./roles";
import { clearFailedSignIns, isSignInBlocked, recordFailedSignIn } from "@/lib/data/sign-in-attempts";
import { normaliseEmail, verifyPassword } from "@/lib/data/users";

const credentialsSchema = z.object({
  email: z.string().trim().min(3).max(320),
  password: z.string().min(1).max(200),
});

/** Messages the sign-in page shows; next-auth passes a thrown error's message through as `error`. */
export const SIGN_IN_ERRORS = {
  wrong: "That e-mail and password do not match an active account.",
  limited: "Too many failed attempts. Wait 15 minutes, or ask an admin to check the account.",
} as const;

function clientAddress(headers: Record<string, unknown> | undefined): string {
  const forwarded = headers?.["x-forwarded-for"];
  const first = typeof forwarded === "string" ? forwarded.split(",")[0]?.trim() : undefined;
  const real = headers?.["x-real-ip"];
  return first || (typeof real === "string" ? real : "") || "local";
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
    CredentialsProvider({
      id: "credentials",
      name: "E-mail and password",
      credentials: {
        email: { label: "E-mail", type: "email" },
        password: { label: "Password", type: "password" },
      },
      async authorize(raw, req) {
        const parsed = credentialsSchema.safeParse(raw);
        if (!parsed.success) throw new Error(SIGN_IN_ERRORS.wrong);
        const email = normaliseEmail(parsed.data.email);
        const who = { email, address: clientAddress(req?.headers) };
        if (await isSignInBlocked(who)) throw new Error(SIGN_IN_ERRORS.limited);
        const user = await verifyPassword({ email, password: parsed.data.password });
        if (!user) {
          await recordFailedSignIn(who);
          throw new Error(SIGN_IN_ERRORS.wrong);
        }
        await clearFailedSignIns({ email });
        return { id: user.id, email: user.email, name: user.name, role: user.role };
      },
    }),
  ],
  callbacks: {
    async jwt({ token, user }) {
      if (user) {
        token.sub = user.id;
        if ("role" in user && isRole(user.role)) token.role = user.role;
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
