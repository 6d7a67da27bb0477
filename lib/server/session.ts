import "server-only";
import { eq } from "drizzle-orm";
import { getServerSession } from "next-auth";
import { forbidden, redirect } from "next/navigation";
import { cache } from "react";
import { db } from "@/db";
import { users, type Role } from "@/db/schema";
import { can, type Action } from "@/lib/permissions";
import { authOptions } from "./auth";
import { AppError } from "./errors";

export interface SessionUser {
  id: number;
  email: string;
  name: string;
  role: Role;
}

/**
 * The signed-in user, re-read from the database on every request: the role comes from the
 * users table, never from anything the client sent, and a deactivated account stops at once.
 */
export const currentUser = cache(async (): Promise<SessionUser | null> => {
  const session = await getServerSession(authOptions);
  const id = session?.user?.id;
  if (!id) return null;
  const [row] = await db()
    .select({ id: users.id, email: users.email, name: users.name, role: users.role, active: users.active })
    .from(users)
    .where(eq(users.id, id))
    .limit(1);
  if (!row || !row.active) return null;
  return { id: row.id, email: row.email, name: row.name, role: row.role };
});

/** For route handlers and server actions: 401 when signed out, 403 when the role may not act. */
export async function requireUser(action?: Action): Promise<SessionUser> {
  const user = await currentUser();
  if (!user) throw new AppError("unauthenticated", "Sign in first.");
  if (action && !can(user.role, action)) throw new AppError("forbidden", "Your role may not do this.");
  return user;
}

/** For pages: signed-out visitors go to sign-in (and come back); a wrong role sees 403. */
export async function requirePageUser(action?: Action, from?: string): Promise<SessionUser> {
  const user = await currentUser();
  if (!user) redirect(from ? `/sign-in?callbackUrl=${encodeURIComponent(from)}` : "/sign-in");
  if (action && !can(user.role, action)) forbidden();
  return user;
}
