// Small helpers shared by the integration tests.
import { eq } from "drizzle-orm";
import { db } from "@/db";
import { users } from "@/db/schema";
import { AppError } from "@/lib/server/errors";
import type { SessionUser } from "@/lib/server/session";

/** A user of this role (made once by e-mail), as the server's session would give it. */
export async function user(email: string, role: SessionUser["role"]): Promise<SessionUser> {
  await db().insert(users).ignore().values({ email, name: email.split("@")[0]!, role, passwordHash: "x" });
  const [u] = await db().select({ id: users.id, email: users.email, name: users.name, role: users.role }).from(users).where(eq(users.email, email));
  return u!;
}

/** How a server call ended: "ok", or the AppError's code and message (anything else is thrown). */
export async function outcome(p: Promise<unknown>): Promise<{ code: string; message: string }> {
  try {
    await p;
    return { code: "ok", message: "" };
  } catch (e) {
    if (e instanceof AppError) return { code: e.code, message: e.message };
    throw e;
  }
}
