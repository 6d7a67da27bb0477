import type { Action } from "@/lib/permissions";

/**
 * What a page under the signed-in shell needs, by its path: the role action its page checks, and for
 * pages of one member's object, which object. The shell's layout checks this before anything is
 * streamed, so a refused page answers with a real 403 or 404 status (the page checks again itself,
 * for client-side navigations, where the layout is not rendered again). Keep in step with each
 * page's own `requirePageUser` call (tests/unit/security/page-status.test.ts reads them).
 */
export interface PageGate {
  action?: Action;
  resource?: { kind: "assembly" | "part"; id: string };
}

const exact: Record<string, Action> = {
  "/bench": "bench:use",
  "/bench/parts": "bench:use",
  "/floor": "floor:view",
  "/materials": "materials:view",
  "/account": "account:messages",
  "/ledger": "ledger:own",
  "/printers": "printers:view",
  "/printers/quote": "quotes:request",
  "/insights": "insights:view",
  "/workshop": "workshop:edit",
  "/workshop/hours": "hours:edit",
  "/workshop/mailbox": "mail:admin",
  "/workshop/billing": "ledger:admin",
  "/workshop/people": "people:manage",
};

export const PATH_HEADER = "x-platewright-path";

export function pageGate(pathname: string): PageGate | null {
  const path = pathname.length > 1 ? pathname.replace(/\/+$/, "") : pathname;
  if (exact[path]) return { action: exact[path] };
  let m = /^\/bench\/assemblies\/([^/]+)$/.exec(path);
  if (m) return { resource: { kind: "assembly", id: m[1]! } };
  m = /^\/bench\/parts\/([^/]+)$/.exec(path);
  if (m) return { resource: { kind: "part", id: m[1]! } };
  if (/^\/plates\/[^/]+$/.test(path)) return { action: "plates:view" };
  return null;
}
