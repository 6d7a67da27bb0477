import type { Role } from "@/db/schema/users";

declare module "next-auth" {
  interface Session {
    user: { id: number; role: Role; name?: string | null; email?: string | null };
  }
}

declare module "next-auth/jwt" {
  interface JWT {
    uid?: number;
    role?: Role;
    /** The account's session version when it signed in (see lib/server/session-version.ts). */
    sv?: number;
  }
}
