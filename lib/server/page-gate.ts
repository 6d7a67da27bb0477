import "server-only";
import { headers } from "next/headers";
import { notFound } from "next/navigation";
import { pageGate, PATH_HEADER } from "@/lib/page-gates";
import { accessTo } from "./assemblies";
import { AppError } from "./errors";
import { partAccess } from "./parts";
import { requirePageUser, type SessionUser } from "./session";

/**
 * For the shell's layout: the signed-in user, after the page's own role and object checks have been
 * made up front (sign-in redirect, 403 or 404 with their real status; see lib/page-gates.ts).
 */
export async function requireShellUser(): Promise<SessionUser> {
  const path = (await headers()).get(PATH_HEADER) ?? undefined;
  const gate = path ? pageGate(path) : null;
  const user = await requirePageUser(gate?.action, path);
  if (gate?.resource) {
    const id = Number(gate.resource.id);
    if (!Number.isSafeInteger(id) || id <= 0) notFound();
    try {
      if (gate.resource.kind === "assembly") await accessTo(user, id);
      else await partAccess(user, id);
    } catch (e) {
      if (e instanceof AppError && e.code === "not_found") notFound();
      throw e;
    }
  }
  return user;
}
