// next-auth type augmentation, in one place: the session and JWT carry the user's id and role.
import type { Role } from "@/lib/auth/roles";

declare module "next-auth" {
  interface Session {
    user: { id: string; role: Role; name?: string | null; email?: string | null; image?: string | null };
  }
  interface User {
    role?: Role;
    sessionVersion?: number;
  }
}

declare module "next-auth/jwt" {
  interface JWT {
    role?: Role;
    /** users.session_version when the session was issued */
    sv?: number;
  }
}
