// GET /api/me: the signed-in user's id, name, e-mail and role (never the password hash).
import { NextResponse } from "next/server";
import { errorResponse } from "@/lib/server/errors";
import { requireUser } from "@/lib/server/session";

export async function GET() {
  try {
    return NextResponse.json(await requireUser());
  } catch (e) {
    return errorResponse(e);
  }
}
