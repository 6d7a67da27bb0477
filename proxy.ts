// Runs before pages (never API routes: a proxy that matches a route makes Next buffer its request
// body, which would break streamed uploads). Passes the path to the shell's layout
// (lib/page-gates.ts), replacing any such header a client sent.
import { NextResponse, type NextRequest } from "next/server";
import { PATH_HEADER } from "@/lib/page-gates";

export function proxy(req: NextRequest) {
  const headers = new Headers(req.headers);
  headers.set(PATH_HEADER, req.nextUrl.pathname);
  return NextResponse.next({ request: { headers } });
}

// Pages only: not the API, Next's own files or static assets (names with a dot).
export const config = { matcher: ["/((?!api/|_next/|.*\\.).*)"] };
