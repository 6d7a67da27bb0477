// GET /api/parts: every part across the member's own and shared assemblies (the My parts table).
import { NextResponse } from "next/server";
import { errorResponse } from "@/lib/server/errors";
import { listMyParts } from "@/lib/server/parts";
import { requireUser } from "@/lib/server/session";

export async function GET() {
  try {
    const user = await requireUser("bench:use");
    return NextResponse.json(await listMyParts(user));
  } catch (e) {
    return errorResponse(e);
  }
}
