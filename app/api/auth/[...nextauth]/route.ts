// next-auth's own endpoints: /api/auth/csrf, /api/auth/callback/credentials, /api/auth/session, …
import NextAuth from "next-auth";
import { authOptions } from "@/lib/auth/options";

const handler = NextAuth(authOptions);
export { handler as GET, handler as POST };
