import "server-only";
import { env } from "@/lib/env";

/** This app's public origin, from NEXTAUTH_URL (links in mail and the sign-in redirect use the same). */
export function appOrigin(): string {
  try {
    return new URL(env().NEXTAUTH_URL ?? "http://localhost:3000").origin;
  } catch {
    return "http://localhost:3000";
  }
}
