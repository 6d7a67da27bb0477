import "server-only";
import { env } from "@/lib/env";
import { crossOriginRefusal, originOf } from "@/lib/origin-check";
import { AppError } from "./errors";

/** This app's public origin, from NEXTAUTH_URL (links in mail and the sign-in redirect use the same). */
export function appOrigin(): string {
  try {
    return new URL(env().NEXTAUTH_URL ?? "http://localhost:3000").origin;
  } catch {
    return "http://localhost:3000";
  }
}

/**
 * The first line of every state-changing route handler (next-auth's and the signed webhook excepted):
 * refuses, with 403 `cross_origin`, a request another origin's page sent (lib/origin-check.ts).
 * Done in the handlers, not in proxy.ts: a proxy that matches a route makes Next buffer its request
 * body (10 MB at most), which would break streamed uploads and the cut-off of oversized bodies.
 */
export function assertSameOrigin(req: Request): void {
  const allowed = [originOf(appOrigin()), originOf(req.url)].filter((o): o is string => o !== null);
  const why = crossOriginRefusal(req.method, req.headers, allowed);
  if (why) throw new AppError("cross_origin", why);
}
