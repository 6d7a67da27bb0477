// Runs before every API route: refuses state-changing requests sent from another origin
// (lib/origin-check.ts). next-auth's routes and the payment webhook keep their own checks.
import { NextResponse, type NextRequest } from "next/server";
import { crossOriginRefusal, originOf, originRuleApplies } from "@/lib/origin-check";

export function proxy(req: NextRequest) {
  if (!originRuleApplies(req.nextUrl.pathname)) return NextResponse.next();
  const allowed = [originOf(process.env.NEXTAUTH_URL), originOf(req.nextUrl.origin)].filter((o): o is string => o !== null);
  const why = crossOriginRefusal(req.method, req.headers, allowed);
  if (why) return NextResponse.json({ error: why, code: "cross_origin" }, { status: 403 });
  return NextResponse.next();
}

export const config = { matcher: "/api/:path*" };
