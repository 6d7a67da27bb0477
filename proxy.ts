// Runs before API routes and pages. API: refuses state-changing requests sent from another origin
// (lib/origin-check.ts); next-auth's routes and the payment webhook keep their own checks. Pages:
// passes the path to the shell's layout (lib/page-gates.ts), replacing any such header a client sent.
import { NextResponse, type NextRequest } from "next/server";
import { crossOriginRefusal, originOf, originRuleApplies } from "@/lib/origin-check";
import { PATH_HEADER } from "@/lib/page-gates";

export function proxy(req: NextRequest) {
  const path = req.nextUrl.pathname;
  if (!path.startsWith("/api/")) {
    const headers = new Headers(req.headers);
    headers.set(PATH_HEADER, path);
    return NextResponse.next({ request: { headers } });
  }
  if (!originRuleApplies(path)) return NextResponse.next();
  const allowed = [originOf(process.env.NEXTAUTH_URL), originOf(req.nextUrl.origin)].filter((o): o is string => o !== null);
  const why = crossOriginRefusal(req.method, req.headers, allowed);
  if (why) return NextResponse.json({ error: why, code: "cross_origin" }, { status: 403 });
  return NextResponse.next();
}

// Everything but Next's own files and static assets (names with a dot).
export const config = { matcher: ["/api/:path*", "/((?!_next/|.*\\.).*)"] };
